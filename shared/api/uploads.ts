import { z } from 'zod'
import type { Detection, ParsedRow, RowProblem, TableMapping, DetectHints } from '../ingest/types.ts'
import { isTimeFormat, TIME_SCALES } from '../ingest/time.ts'
import { isVelocityUnit } from '../ingest/units.ts'
import { userRefSchema } from './common.ts'
import { siteSchema } from './stars.ts'

/** Any velocity unit the ingest unit parser reads ('m/s', 'km/s', 'cm/s', 'm s-1' …). */
const velocityUnit = z.string().max(40).refine(isVelocityUnit, { message: "must be a velocity unit such as 'm/s' or 'km/s'" })
/** 'jd', 'bjd', 'mjd', 'days' or 'jd-N' (JD − N, any N written in a header or chosen). */
const timeFormat = z.string().refine(isTimeFormat, { message: "must be 'jd', 'bjd', 'mjd', 'days' or 'jd-N' (e.g. 'jd-2457000')" }) as unknown as z.ZodType<TableMapping['timeFormat']>
const timeScale = z.enum(TIME_SCALES as unknown as ['bjd_tdb', ...string[]]) as unknown as z.ZodType<NonNullable<TableMapping['timeScale']>>
const delimiter = z.enum([',', '\t', ';', 'whitespace', 'fixed'])
const dateSplit = z.object({ before: z.number(), instrument: z.string().min(1), source: z.string().optional() })
const columnRef = z.union([z.string(), z.number().int()])
const question = z.object({
  field: z.enum(['timeFormat', 'timeScale', 'flag']),
  message: z.string(),
  choices: z.array(z.object({ value: z.string(), label: z.string() })),
})

/** The confirmed mapping of one file (the shape of shared/ingest's TableMapping). */
export const tableMappingSchema = z.object({
  delimiter,
  hasHeader: z.boolean(),
  skipRows: z.number().int().min(0).optional(),
  firstLine: z.number().int().min(1).optional(),
  decimalComma: z.boolean().optional(),
  columns: z.array(z.object({
    index: z.number().int().min(0),
    name: z.string(),
    role: z.enum(['time', 'rv', 'error', 'instrument', 'indicator', 'flag', 'ignore']),
    indicator: z.string().optional(),
    unit: velocityUnit.optional(),
    start: z.number().int().min(0).optional(),
    end: z.number().int().min(1).optional(),
    keep: z.array(z.string()).optional(),
  })),
  unit: velocityUnit,
  timeFormat,
  timeScale: timeScale.optional(),
  questions: z.array(question).optional(),
  defaultError: z.number().optional(),
  instrument: z.string().optional(),
  splitDates: z.array(dateSplit).optional(),
}) satisfies z.ZodType<TableMapping>

/** What the user already knows about one file (shared/ingest's DetectHints). */
export const detectHintsSchema = z.object({
  delimiter: delimiter.optional(),
  hasHeader: z.boolean().optional(),
  time: columnRef.optional(),
  rv: columnRef.optional(),
  error: columnRef.nullable().optional(),
  instrument: columnRef.nullable().optional(),
  unit: velocityUnit.optional(),
  timeFormat: timeFormat.optional(),
  timeScale: timeScale.optional(),
  defaultError: z.number().optional(),
  instrumentName: z.string().optional(),
  splitDates: z.array(dateSplit).optional(),
}) satisfies z.ZodType<Omit<DetectHints, 'fileName' | 'layout'>>

/** Multipart field `hints` of a preview (JSON text): hints per file name. */
export const previewHintsSchema = z.record(z.string(), detectHintsSchema)
/** Multipart field `mappings` of a commit, or of a preview that reads with the user's mapping as it stands. */
export const commitMappingsSchema = z.record(z.string(), tableMappingSchema)

/**
 * Multipart field `options` of a commit (JSON text). `overlap`: what to do with rows whose
 * (time, instrument) is already stored for the star — 'cancel' (default: refuse, listing them),
 * 'skip' them, or 'keep' both. `skipProblemRows`: store the good rows and record every skipped
 * row with its reason. `site`: the observatory, for times at the observatory (JD_UTC/TT/TDB) or
 * HJD to be converted to BJD_TDB (default: the star's default observatory).
 */
export const commitOptionsSchema = z.object({
  overlap: z.enum(['cancel', 'skip', 'keep']).default('cancel'),
  skipProblemRows: z.boolean().default(false),
  site: siteSchema.optional(),
}).strict()
export type CommitOptions = z.input<typeof commitOptionsSchema>

/** Rows of a file whose (time, instrument) is already stored for the star. */
export interface OverlapReport {
  count: number
  /** The first few: line in this file, time (full JD), instrument, and the earlier file. */
  examples: Array<{ line: number; time: number; instrument: string; earlierFile: string }>
}

/** An earlier upload of the same bytes to this star. */
export interface EarlierUpload { fileName: string; uploadedAt: string; uploadedBy: string | null; datasetIds: number[] }

export interface FilePreview {
  fileName: string
  size: number
  detection: Detection
  /** The mapping the rows were read with: the user's when one was sent, else the detected one. */
  mapping: TableMapping
  /** The first 50 parsed rows (times in full JD, velocities and errors in m/s). */
  rows: ParsedRow[]
  /** The first 200 problems. */
  problems: RowProblem[]
  problemCount: number
  /** Doubtful rows that will be stored (an error above the velocity spread), the first 200. */
  warnings: RowProblem[]
  warningCount: number
  /** Rows a flag column marks (stored excluded, with the reason). */
  flaggedCount: number
  instruments: Array<{ name: string; count: number }>
  /** Data rows read from the file (good + bad). */
  rowCount: number
  /**
   * Why the mapping cannot be committed as it is (e.g. 'missing_error': no error column, give a
   * defaultError; 'needs_answer': a question is open), else null. Rows are still read while
   * only a question is open (with its default answer); otherwise they are empty.
   */
  mappingError: { code: string; message: string; field?: string } | null
  /** Set when the same bytes were already uploaded for this star (a commit will be refused). */
  duplicateOf: EarlierUpload | null
  /** Rows already stored for the star (same time and instrument); the commit asks skip / keep / cancel. */
  overlap: OverlapReport | null
  /** Sentences about the whole file: absolute next to relative velocities under one instrument name, time conversion needed. */
  notices: string[]
}
export interface PreviewResponse { files: FilePreview[]; /** CDS ReadMe files sent along: used for the .dat files they describe, not stored as tables. */ descriptions: string[] }

export interface CommitResponse {
  datasets: Array<{ id: number; instrument: string; fileName: string; count: number; excluded: number }>
  measurementsCreated: number
  /** Rows left out (skip problem rows, overlaps skipped), per file. */
  skipped: Array<{ fileName: string; count: number }>
  notices: string[]
}

/** A row problem of a refused commit, with the file it came from. */
export interface CommitProblem extends RowProblem { fileName: string }

export const datasetSchema = z.object({
  id: z.number().int(), instrument: z.string(), fileName: z.string(), unit: z.string(), timeFormat: z.string(),
  /** The time system of the stored times: scale ('bjd_tdb', 'jd_utc', …, 'unknown') and the N of the 'JD − N' written. */
  timeScale: z.string(), timeOffset: z.number(),
  /** Units as written per column ({ rv, error, indicators }); stored values are m/s. */
  units: z.record(z.string(), z.unknown()),
  /** The conversion to BJD_TDB made at upload, or null. */
  timeConversion: z.record(z.string(), z.unknown()).nullable(),
  /** Rows of the file left out at commit, with the reason. */
  skippedRows: z.number().int(),
  count: z.number().int(), uploadedBy: userRefSchema.nullable(), createdAt: z.string(),
})
export type DatasetSummary = z.infer<typeof datasetSchema>
export const datasetListResponseSchema = z.array(datasetSchema)

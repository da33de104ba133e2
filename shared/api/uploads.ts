import { z } from 'zod'
import type { Detection, ParsedRow, RowProblem, TableMapping, DetectHints } from '../ingest/types.ts'
import { userRefSchema } from './common.ts'

const velocityUnit = z.enum(['m/s', 'km/s'])
const timeFormat = z.enum(['jd', 'bjd', 'mjd', 'jd-2400000', 'jd-2450000', 'days'])
const delimiter = z.enum([',', '\t', ';', 'whitespace'])
const dateSplit = z.object({ before: z.number(), instrument: z.string().min(1), source: z.string().optional() })
const columnRef = z.union([z.string(), z.number().int()])

/** The confirmed mapping of one file (the shape of shared/ingest's TableMapping). */
export const tableMappingSchema = z.object({
  delimiter,
  hasHeader: z.boolean(),
  skipRows: z.number().int().min(0).optional(),
  decimalComma: z.boolean().optional(),
  columns: z.array(z.object({
    index: z.number().int().min(0),
    name: z.string(),
    role: z.enum(['time', 'rv', 'error', 'instrument', 'indicator', 'ignore']),
    indicator: z.string().optional(),
    unit: velocityUnit.optional(),
  })),
  unit: velocityUnit,
  timeFormat,
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
  defaultError: z.number().optional(),
  instrumentName: z.string().optional(),
  splitDates: z.array(dateSplit).optional(),
}) satisfies z.ZodType<DetectHints>

/** Multipart field `hints` of a preview (JSON text): hints per file name. */
export const previewHintsSchema = z.record(z.string(), detectHintsSchema)
/** Multipart field `mappings` of a commit (JSON text): the confirmed mapping per file name. */
export const commitMappingsSchema = z.record(z.string(), tableMappingSchema)

export interface FilePreview {
  fileName: string
  size: number
  detection: Detection
  /** The first 50 parsed rows (times in full JD, velocities and errors in m/s). */
  rows: ParsedRow[]
  /** The first 200 problems. */
  problems: RowProblem[]
  problemCount: number
  instruments: Array<{ name: string; count: number }>
  /** Data rows read from the file (good + bad). */
  rowCount: number
  /**
   * Why the detected mapping cannot be used as it is (e.g. code 'missing_error': no error column,
   * give a defaultError), else null. Rows, problems and instruments are empty while it is set.
   */
  mappingError: { code: string; message: string; field?: string } | null
}
export interface PreviewResponse { files: FilePreview[] }

export interface CommitResponse {
  datasets: Array<{ id: number; instrument: string; fileName: string; count: number }>
  measurementsCreated: number
}

/** A row problem of a refused commit, with the file it came from. */
export interface CommitProblem extends RowProblem { fileName: string }

export const datasetSchema = z.object({
  id: z.number().int(), instrument: z.string(), fileName: z.string(), unit: z.string(), timeFormat: z.string(),
  count: z.number().int(), uploadedBy: userRefSchema.nullable(), createdAt: z.string(),
})
export type DatasetSummary = z.infer<typeof datasetSchema>
export const datasetListResponseSchema = z.array(datasetSchema)

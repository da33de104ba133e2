// Upload work that runs in the compute pool's worker threads (registered in server/compute/tasks.ts):
// decoding, detection and parsing of uploaded bytes, and the time conversion to BJD_TDB, so a
// large or hostile file never blocks the event loop. Inputs and outputs are structured-clonable;
// whole-file refusals come back as data ({ ok: false, error }) so the server can answer 4xx.
import {
  IngestError, decodeTableBytes, detectTable, parseForPreview, parseTable, readByteDescriptions,
  type DetectHints, type Detection, type ParsedRow, type RowProblem, type TableMapping,
} from '../../shared/ingest/index.ts'
import { ttToTdb, toBjdTdb, utcToTt, type Site, type Target } from '../../shared/time/index.ts'
import type { FilePreview } from '../../shared/api/uploads.ts'

export type TaskError = { code: string; message: string; field?: string }
type Failed = { ok: false; error: TaskError }

function failed(e: unknown): Failed {
  if (e instanceof IngestError) return { ok: false, error: e.toJSON() }
  if (e instanceof RangeError) return { ok: false, error: { code: 'bad_conversion', message: e.message } }
  throw e
}

/** Of the ReadMe files sent along, the byte-by-byte description of `fileName`, if any. */
function layoutFor(fileName: string, descriptions: Uint8Array[], maxBytes: number): DetectHints['layout'] {
  for (const bytes of descriptions) {
    const found = readByteDescriptions(decodeTableBytes(bytes, maxBytes).split(/\r\n|\n|\r/))
    for (const [name, d] of found) if (name === fileName || name.replace(/\.gz$/, '') === fileName) return d.specs
  }
  return undefined
}

/** Whether a file is a CDS ReadMe (a description of other files, not a table). */
export function isDescription(fileName: string, bytes: Uint8Array): boolean {
  if (!/^readme/i.test(fileName.replace(/^.*[\\/]/, ''))) return false
  const head = new TextDecoder('latin1').decode(bytes.subarray(0, 200_000))
  return /Byte-by-byte Description of file:/i.test(head)
}

export interface PreviewInput {
  bytes: Uint8Array; fileName: string; maxBytes: number; hints: DetectHints
  /** The user's mapping as it stands: rows are read with it as is (no re-detection of the mapping). */
  mapping?: TableMapping
  descriptions: Uint8Array[]
}

/** The preview fields the wizard shows (`FilePreview` of shared/api/uploads.ts), plus columns for the server's checks. */
export interface PreviewOutput extends Pick<FilePreview,
  'detection' | 'mapping' | 'rows' | 'problems' | 'problemCount' | 'warnings' | 'warningCount' | 'flaggedCount' | 'instruments' | 'rowCount' | 'mappingError'> {
  ok: true
  /** Every good row's line, full time and instrument, for the overlap check against stored data. */
  lines: Int32Array
  times: Float64Array
  instrumentOf: Int32Array
  instrumentNames: string[]
  /** Median velocity (m/s) per instrument, for the absolute-next-to-relative check. */
  medians: Record<string, number>
}

const PREVIEW_ROWS = 50
const PREVIEW_PROBLEMS = 200

function columnsOf(rows: ParsedRow[]): { lines: Int32Array; times: Float64Array; instrumentOf: Int32Array; instrumentNames: string[]; medians: Record<string, number> } {
  const names: string[] = []
  const index = new Map<string, number>()
  const lines = new Int32Array(rows.length)
  const times = new Float64Array(rows.length)
  const instrumentOf = new Int32Array(rows.length)
  const rvs: number[][] = []
  rows.forEach((r, k) => {
    let i = index.get(r.instrument)
    if (i === undefined) { i = names.length; names.push(r.instrument); index.set(r.instrument, i); rvs.push([]) }
    lines[k] = r.line
    times[k] = r.time
    instrumentOf[k] = i
    rvs[i]!.push(r.rv)
  })
  const medians: Record<string, number> = {}
  names.forEach((n, i) => {
    const s = Float64Array.from(rvs[i]!).sort()
    medians[n] = s.length % 2 ? s[s.length >> 1]! : (s[s.length / 2 - 1]! + s[s.length / 2]!) / 2
  })
  return { lines, times, instrumentOf, instrumentNames: names, medians }
}

/** Decode, detect (for the notes and raw rows) and read one file for the wizard. */
export function uploadPreviewTask(inp: PreviewInput): PreviewOutput | Failed {
  try {
    const text = decodeTableBytes(inp.bytes, inp.maxBytes)
    const layout = layoutFor(inp.fileName, inp.descriptions, inp.maxBytes)
    const hints: DetectHints = { ...inp.hints, fileName: inp.fileName, ...(layout ? { layout } : {}) }
    let detection: Detection
    try { detection = detectTable(text, hints) } catch (e) {
      if (!inp.mapping || !(e instanceof IngestError) || e.code === 'too_large' || e.code === 'binary' || e.code === 'unsupported_format') throw e
      // The user's mapping may read what detection could not: show its rows with what is known.
      detection = { mapping: inp.mapping, headerNames: null, headerFromComment: false, headerLine: null, columnCount: inp.mapping.columns.length,
        rowCount: 0, commentLines: 0, preview: [], notes: [e.message], format: 'delimited' }
    }
    const mapping = inp.mapping ?? detection.mapping
    const { result, mappingError } = parseForPreview(text, mapping, { maxProblems: PREVIEW_PROBLEMS })
    const rows = result?.rows ?? []
    return {
      ok: true, detection, mapping, rows: rows.slice(0, PREVIEW_ROWS), problems: result?.problems ?? [], problemCount: result?.problemCount ?? 0,
      warnings: (result?.warnings ?? []).slice(0, PREVIEW_PROBLEMS), warningCount: result?.warningCount ?? 0,
      flaggedCount: rows.filter((r) => r.excludedReason).length, instruments: result?.instruments ?? [],
      rowCount: result?.rowsRead ?? detection.rowCount, mappingError, ...columnsOf(rows),
    }
  } catch (e) { return failed(e) }
}

/** How times are brought to BJD_TDB at commit: the scale they are in, the star and the observatory. */
export interface Conversion { from: 'jd_utc' | 'jd_tt' | 'jd_tdb' | 'hjd_utc' | 'bjd_utc'; target: Target; site: Site }

export interface ParseInput { bytes: Uint8Array; fileName: string; maxBytes: number; mapping: TableMapping; conversion?: Conversion }

export interface ParseOutput {
  ok: true
  rowsRead: number
  problems: RowProblem[]
  problemCount: number
  warningCount: number
  line: Int32Array
  time: Float64Array
  rv: Float64Array
  error: Float64Array
  instrumentOf: Int32Array
  instrumentNames: string[]
  /** Indicators as JSON text per row (null when none). */
  indicators: Array<string | null>
  excludedReason: Array<string | null>
}

/**
 * Times → BJD_TDB (full JD) from the scale they were written in. At the observatory and HJD via
 * shared/time's toBjdTdb (Eastman, Siverd & Gaudi 2010); BJD_UTC is barycentric already and only
 * changes clock: TT = UTC + leap seconds + 32.184 s, then TDB (their §4).
 */
export function convertTimes(t: Float64Array, c: Conversion): Float64Array {
  if (c.from === 'bjd_utc') return t.map((x) => ttToTdb(utcToTt(x)))
  // JD_TDB at the observatory is read as TT: TDB − TT stays below 2 ms (Eastman et al. 2010 §2.3).
  const scale = c.from === 'jd_utc' ? 'utc' : c.from === 'hjd_utc' ? 'hjd-utc' : 'tt'
  return toBjdTdb(t, scale, c.target, c.site)
}

/** Decode and read every row of one file with its confirmed mapping; times converted when asked. */
export function uploadParseTask(inp: ParseInput): ParseOutput | Failed {
  try {
    const text = decodeTableBytes(inp.bytes, inp.maxBytes)
    const r = parseTable(text, inp.mapping, { maxProblems: Number.MAX_SAFE_INTEGER })
    const n = r.rows.length
    const out: ParseOutput = {
      ok: true, rowsRead: r.rowsRead, problems: r.problems, problemCount: r.problemCount, warningCount: r.warningCount,
      line: new Int32Array(n), time: new Float64Array(n), rv: new Float64Array(n), error: new Float64Array(n),
      instrumentOf: new Int32Array(n), instrumentNames: [], indicators: new Array(n), excludedReason: new Array(n),
    }
    const index = new Map<string, number>()
    r.rows.forEach((row, k) => {
      let i = index.get(row.instrument)
      if (i === undefined) { i = out.instrumentNames.length; out.instrumentNames.push(row.instrument); index.set(row.instrument, i) }
      out.line[k] = row.line
      out.time[k] = row.time
      out.rv[k] = row.rv
      out.error[k] = row.error
      out.instrumentOf[k] = i
      let any = false
      for (const _ in row.indicators) { any = true; break }
      out.indicators[k] = any ? JSON.stringify(row.indicators) : null
      out.excludedReason[k] = row.excludedReason ?? null
    })
    if (inp.conversion && n > 0) out.time = convertTimes(out.time, inp.conversion)
    return out
  } catch (e) { return failed(e) }
}

export const UPLOAD_TASKS = {
  uploadPreview: uploadPreviewTask,
  uploadParse: uploadParseTask,
}

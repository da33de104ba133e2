import type { ArchiveLayout, FixedField } from '../formats/layout.ts'
import type { NameReading } from '../names.ts'
import type {
  ColumnMapping, ColumnRole, Delimiter, DetectHints, Question, TableFormat, TimeFormat, TimeScale, VelocityUnit,
} from '../types.ts'

/** Statistics of one column over the sampled data rows. */
export interface ColumnStats {
  numeric: number
  missing: number
  text: number
  values: number[]
  distinct: Map<string, number>
}

/**
 * The state detection builds up, one rule at a time (see rules/index.ts for the order). Each
 * rule reads what earlier rules set and fills its own fields; nothing else is shared.
 */
export interface DetectContext {
  hints: DetectHints
  text: string
  notes: string[]
  questions: Question[]
  /** Lines of the text (index i is line i + 1). */
  lines: string[]
  /** What an archive format's own description says (ECSV, IPAC, MRT, a CDS ReadMe), if any. */
  layout: ArchiveLayout | null
  format: TableFormat
  /** Indices of the body's data lines (not blank, not comment, from the layout's first line). */
  dataIdx: number[]
  commentLines: number
  delimiter: Delimiter
  /** Column positions when the delimiter is 'fixed'. */
  fields: FixedField[] | null
  /** Splits one line into cells with the chosen delimiter or positions. */
  split: (line: string) => string[]
  /** Sampled data lines (indices into `lines`) and their cells. */
  sampleIdx: number[]
  sample: string[][]
  decimalComma: boolean
  num: (cell: string) => number
  hasHeader: boolean
  skipRows: number
  /** Index into `sample` of the first data row (after the header and skipped rows). */
  firstData: number
  dataSample: string[][]
  columnCount: number
  headerNames: string[] | null
  headerFromComment: boolean
  headerLine: number | null
  /** Unit and description text per column (units row, archive metadata), read with the names. */
  unitsText: string[]
  names: string[]
  stats: ColumnStats[]
  isNumeric: boolean[]
  readings: NameReading[]
  roles: Array<ColumnRole | null>
  indicatorKeys: Array<string | undefined>
  /** Per-column velocity unit as written (rv, error, velocity-like indicators). */
  units: Array<VelocityUnit | undefined>
  /** For flag columns: the values that mean a good row. */
  keep: Array<string[] | undefined>
  unit: VelocityUnit
  timeFormat: TimeFormat
  timeScale: TimeScale
  columns: ColumnMapping[]
}

/** A step of detection: reads and fills the context, or throws IngestError for a whole-file problem. */
export type Rule = (ctx: DetectContext) => void

export const ROLE_NAMES: Record<string, string> = { time: 'time', rv: 'velocity', error: 'error', instrument: 'instrument' }

export function median(values: number[]): number {
  if (values.length === 0) return NaN
  const s = Float64Array.from(values).sort()
  const m = s.length >> 1
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2
}

export function mode(values: number[]): { value: number; share: number } {
  const counts = new Map<number, number>()
  for (const v of values) counts.set(v, (counts.get(v) ?? 0) + 1)
  let best = 0
  let bestCount = 0
  for (const [v, c] of counts) if (c > bestCount || (c === bestCount && v > best)) { best = v; bestCount = c }
  return { value: best, share: values.length ? bestCount / values.length : 0 }
}

/** Index of the column that has `role`, or −1. */
export function taken(ctx: DetectContext, role: ColumnRole): number {
  return ctx.roles.indexOf(role)
}

import type { Delimiter, TableFormat, TimeScale } from '../types.ts'

/** A column at fixed character positions: 0-based [start, end). */
export interface FixedField { start: number; end: number }

/**
 * What an archive format's own description says about a table: where the body starts, how
 * cells are separated, names, units and descriptions per column, the time scale. Detection
 * trusts it over guessing; anything absent is detected as for plain text.
 */
export interface ArchiveLayout {
  format: TableFormat
  /** 0-based index of the first line of the body (the header row when `hasHeader`). */
  firstLine: number
  hasHeader: boolean
  delimiter?: Delimiter
  fields?: FixedField[]
  names?: string[]
  units?: Array<string | undefined>
  descriptions?: Array<string | undefined>
  timeScale?: TimeScale
  /** Where the time scale was read (for the note). */
  timeScaleFrom?: string
  notes: string[]
}

/** Slice a line into trimmed cells at fixed positions. */
export function sliceFixed(line: string, fields: readonly FixedField[]): string[] {
  const out = new Array<string>(fields.length)
  for (let k = 0; k < fields.length; k++) out[k] = line.slice(fields[k]!.start, fields[k]!.end).trim()
  return out
}

/** A scale name from metadata ('tdb', 'UTC', 'TT') in the context of its column's words. */
export function scaleFromMeta(value: string, barycentric: boolean): TimeScale | undefined {
  const v = value.trim().toLowerCase()
  if (v === 'tdb') return barycentric ? 'bjd_tdb' : 'jd_tdb'
  if (v === 'utc') return barycentric ? 'bjd_utc' : 'jd_utc'
  if (v === 'tt' || v === 'tdt') return 'jd_tt'
  return undefined
}

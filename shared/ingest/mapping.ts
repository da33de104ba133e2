import { IngestError } from './errors.ts'
import { TIME_SCALES, isTimeFormat } from './time.ts'
import type { ColumnMapping, DateSplit, Delimiter, TableMapping, TimeFormat } from './types.ts'
import { unitScale } from './units.ts'

export const DELIMITERS: readonly Delimiter[] = [',', '\t', ';', 'whitespace', 'fixed']
/** The usual velocity units; any other that the unit parser reads as a velocity is accepted too. */
export const VELOCITY_UNITS: readonly string[] = ['m/s', 'km/s', 'cm/s']
/** The usual time formats; 'jd-N' for any other N is accepted too. */
export const TIME_FORMATS: readonly TimeFormat[] = ['jd', 'bjd', 'mjd', 'jd-2400000', 'jd-2450000', 'jd-2457000', 'days']
export const COLUMN_ROLES = ['time', 'rv', 'error', 'instrument', 'indicator', 'flag', 'ignore'] as const

/** How a column's cells become m/s: a decimal power of ten, then a factor (1 for the usual units). */
export interface Scale { pow10: number; factor: number }

/** The columns a mapping reads, found once. */
export interface ResolvedMapping {
  time: ColumnMapping
  rv: ColumnMapping
  error: ColumnMapping | null
  instrument: ColumnMapping | null
  indicators: Array<{ column: ColumnMapping; key: string; scale: Scale }>
  flags: Array<{ column: ColumnMapping; keep: Set<string> }>
  /** Cells a row needs to reach every used column. */
  needed: number
  rvScale: Scale
  errorScale: Scale
  /** Scale of the table's unit (for defaultError). */
  tableScale: Scale
}

function bad(message: string, field: string): never {
  throw new IngestError('bad_mapping', message, field)
}

function scaleOf(unit: unknown, what: string, field: string): Scale {
  const s = typeof unit === 'string' ? unitScale(unit) : null
  if (!s) bad(`${what} must be a velocity unit such as 'm/s' or 'km/s' (got ${JSON.stringify(unit)})`, field)
  return s
}

/**
 * Check a mapping (from detection, or corrected by a user) before reading rows with it.
 * Throws IngestError: 'no_time_column' / 'no_velocity_column' when those roles are missing,
 * 'missing_error' when there is neither an error column nor a positive defaultError,
 * 'needs_answer' while `questions` is not empty, 'bad_mapping' (with `field`) for anything else malformed.
 */
export function validateMapping(mapping: TableMapping): ResolvedMapping {
  if (mapping === null || typeof mapping !== 'object') bad('mapping must be an object', 'mapping')
  if (!DELIMITERS.includes(mapping.delimiter)) bad(`delimiter must be one of ',', tab, ';', 'whitespace', 'fixed' (got ${JSON.stringify(mapping.delimiter)})`, 'delimiter')
  if (typeof mapping.hasHeader !== 'boolean') bad('hasHeader must be true or false', 'hasHeader')
  if (mapping.skipRows !== undefined && !(Number.isInteger(mapping.skipRows) && mapping.skipRows >= 0)) bad('skipRows must be a whole number ≥ 0', 'skipRows')
  if (mapping.firstLine !== undefined && !(Number.isInteger(mapping.firstLine) && mapping.firstLine >= 1)) bad('firstLine must be a line number ≥ 1', 'firstLine')
  const tableScale = scaleOf(mapping.unit, 'unit', 'unit')
  if (!isTimeFormat(mapping.timeFormat)) bad(`timeFormat must be 'jd', 'bjd', 'mjd', 'days' or 'jd-N' (got ${JSON.stringify(mapping.timeFormat)})`, 'timeFormat')
  if (mapping.timeScale !== undefined && !TIME_SCALES.includes(mapping.timeScale)) bad(`timeScale must be one of ${TIME_SCALES.join(', ')}`, 'timeScale')
  if (!Array.isArray(mapping.columns) || mapping.columns.length === 0) bad('columns must list the table\'s columns', 'columns')
  const seen = new Set<number>()
  const byRole = new Map<string, ColumnMapping[]>()
  for (const c of mapping.columns) {
    if (!c || !Number.isInteger(c.index) || c.index < 0) bad('each column needs a whole-number index ≥ 0', 'columns')
    if (seen.has(c.index)) bad(`column index ${c.index} is listed twice`, 'columns')
    seen.add(c.index)
    if (!(COLUMN_ROLES as readonly string[]).includes(c.role)) bad(`column '${c.name}' has an unknown role ${JSON.stringify(c.role)}`, 'columns')
    if (c.unit !== undefined) scaleOf(c.unit, `column '${c.name}' unit`, 'columns')
    if (mapping.delimiter === 'fixed' && c.role !== 'ignore') {
      if (!(Number.isInteger(c.start) && Number.isInteger(c.end) && c.start! >= 0 && c.end! > c.start!)) {
        bad(`column '${c.name}' needs character positions start < end in a fixed-width table`, 'columns')
      }
    }
    if (c.role === 'flag' && !(Array.isArray(c.keep) && c.keep.every((k) => typeof k === 'string'))) bad(`flag column '${c.name}' needs the list of values that mean a good row (keep)`, 'columns')
    const list = byRole.get(c.role) ?? []
    list.push(c)
    byRole.set(c.role, list)
  }
  for (const role of ['time', 'rv', 'error', 'instrument']) {
    const list = byRole.get(role) ?? []
    if (list.length > 1) bad(`only one column can be the ${role} column (found ${list.map(c => `'${c.name}'`).join(', ')})`, 'columns')
  }
  const time = byRole.get('time')?.[0]
  if (!time) throw new IngestError('no_time_column', 'No column is marked as the time column. Choose which column holds the observation times.', 'columns')
  const rv = byRole.get('rv')?.[0]
  if (!rv) throw new IngestError('no_velocity_column', 'No column is marked as the velocity column. Choose which column holds the radial velocities.', 'columns')
  const error = byRole.get('error')?.[0] ?? null
  if (mapping.defaultError !== undefined) {
    if (typeof mapping.defaultError !== 'number' || !Number.isFinite(mapping.defaultError) || mapping.defaultError <= 0) {
      bad(`defaultError must be a positive number in ${mapping.unit} (got ${String(mapping.defaultError)})`, 'defaultError')
    }
  } else if (!error) {
    throw new IngestError('missing_error',
      'The table has no error column. Mark the column that holds the velocity uncertainties, or give one error (in the table\'s unit) for all rows.',
      'defaultError')
  }
  if (mapping.instrument !== undefined && (typeof mapping.instrument !== 'string' || mapping.instrument.trim() === '')) {
    bad('instrument must be a non-empty name', 'instrument')
  }
  if (mapping.splitDates !== undefined) validateSplits(mapping.splitDates)
  if (mapping.questions !== undefined && !Array.isArray(mapping.questions)) bad('questions must be a list', 'questions')
  if (mapping.questions?.length) {
    const q = mapping.questions[0]!
    throw new IngestError('needs_answer', `${q.message} Choose one of: ${q.choices.map((c) => c.label).join('; ')}.`, q.field)
  }
  const rvScale = rv.unit !== undefined ? scaleOf(rv.unit, 'unit', 'columns') : tableScale
  const errorScale = error?.unit !== undefined ? scaleOf(error.unit, 'unit', 'columns') : rvScale
  const indicators = (byRole.get('indicator') ?? []).map(column => {
    const key = (column.indicator ?? column.name).trim()
    if (key === '') bad(`indicator column ${column.index + 1} needs a name`, 'columns')
    return { column, key, scale: column.unit !== undefined ? scaleOf(column.unit, 'unit', 'columns') : { pow10: 0, factor: 1 } }
  })
  const keys = new Set<string>()
  for (const i of indicators) {
    if (keys.has(i.key)) bad(`two indicator columns are both named '${i.key}'`, 'columns')
    keys.add(i.key)
  }
  const flags = (byRole.get('flag') ?? []).map((column) => ({ column, keep: new Set((column.keep ?? []).map((k) => k.trim().toLowerCase())) }))
  const used = [time, rv, error, byRole.get('instrument')?.[0], ...indicators.map(i => i.column), ...flags.map((f) => f.column)]
  const needed = Math.max(...used.map(c => (c ? c.index + 1 : 0)))
  return { time, rv, error, instrument: byRole.get('instrument')?.[0] ?? null, indicators, flags, needed, rvScale, errorScale, tableScale }
}

function validateSplits(splits: DateSplit[]): void {
  if (!Array.isArray(splits)) bad('splitDates must be a list of { before, instrument }', 'splitDates')
  for (const s of splits) {
    if (!s || typeof s.before !== 'number' || !Number.isFinite(s.before)) bad('each split needs a date `before` as a full Julian day', 'splitDates')
    if (typeof s.instrument !== 'string' || s.instrument.trim() === '') bad('each split needs the instrument name for the rows before its date', 'splitDates')
    if (s.source !== undefined && (typeof s.source !== 'string' || s.source.trim() === '')) bad('a split\'s source must be an instrument name', 'splitDates')
  }
}

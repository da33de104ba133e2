import { IngestError } from './errors.ts'
import type { ColumnMapping, DateSplit, Delimiter, TableMapping, TimeFormat, VelocityUnit } from './types.ts'

export const DELIMITERS: readonly Delimiter[] = [',', '\t', ';', 'whitespace']
export const VELOCITY_UNITS: readonly VelocityUnit[] = ['m/s', 'km/s']
export const TIME_FORMATS: readonly TimeFormat[] = ['jd', 'bjd', 'mjd', 'jd-2400000', 'jd-2450000', 'days']
export const COLUMN_ROLES = ['time', 'rv', 'error', 'instrument', 'indicator', 'ignore'] as const

/** The columns a mapping reads, found once. */
export interface ResolvedMapping {
  time: ColumnMapping
  rv: ColumnMapping
  error: ColumnMapping | null
  instrument: ColumnMapping | null
  indicators: Array<{ column: ColumnMapping; key: string; pow10: number }>
  /** Cells a row needs to reach every used column. */
  needed: number
  scale: number
}

function bad(message: string, field: string): never {
  throw new IngestError('bad_mapping', message, field)
}

/**
 * Check a mapping (from detection, or corrected by a user) before reading rows with it.
 * Throws IngestError: 'no_time_column' / 'no_velocity_column' when those roles are missing,
 * 'missing_error' when there is neither an error column nor a positive defaultError,
 * 'bad_mapping' (with `field`) for anything else malformed.
 */
export function validateMapping(mapping: TableMapping): ResolvedMapping {
  if (mapping === null || typeof mapping !== 'object') bad('mapping must be an object', 'mapping')
  if (!DELIMITERS.includes(mapping.delimiter)) bad(`delimiter must be one of ',', tab, ';', 'whitespace' (got ${JSON.stringify(mapping.delimiter)})`, 'delimiter')
  if (typeof mapping.hasHeader !== 'boolean') bad('hasHeader must be true or false', 'hasHeader')
  if (mapping.skipRows !== undefined && !(Number.isInteger(mapping.skipRows) && mapping.skipRows >= 0)) bad('skipRows must be a whole number ≥ 0', 'skipRows')
  if (!VELOCITY_UNITS.includes(mapping.unit)) bad(`unit must be 'm/s' or 'km/s' (got ${JSON.stringify(mapping.unit)})`, 'unit')
  if (!TIME_FORMATS.includes(mapping.timeFormat)) bad(`timeFormat must be one of ${TIME_FORMATS.join(', ')} (got ${JSON.stringify(mapping.timeFormat)})`, 'timeFormat')
  if (!Array.isArray(mapping.columns) || mapping.columns.length === 0) bad('columns must list the table\'s columns', 'columns')
  const seen = new Set<number>()
  const byRole = new Map<string, ColumnMapping[]>()
  for (const c of mapping.columns) {
    if (!c || !Number.isInteger(c.index) || c.index < 0) bad('each column needs a whole-number index ≥ 0', 'columns')
    if (seen.has(c.index)) bad(`column index ${c.index} is listed twice`, 'columns')
    seen.add(c.index)
    if (!(COLUMN_ROLES as readonly string[]).includes(c.role)) bad(`column '${c.name}' has an unknown role ${JSON.stringify(c.role)}`, 'columns')
    if (c.unit !== undefined && !VELOCITY_UNITS.includes(c.unit)) bad(`column '${c.name}' unit must be 'm/s' or 'km/s'`, 'columns')
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
  const scale = mapping.unit === 'km/s' ? 1000 : 1
  const indicators = (byRole.get('indicator') ?? []).map(column => {
    const key = (column.indicator ?? column.name).trim()
    if (key === '') bad(`indicator column ${column.index + 1} needs a name`, 'columns')
    return { column, key, pow10: column.unit === 'km/s' ? 3 : 0 }
  })
  const keys = new Set<string>()
  for (const i of indicators) {
    if (keys.has(i.key)) bad(`two indicator columns are both named '${i.key}'`, 'columns')
    keys.add(i.key)
  }
  const used = [time, rv, error, byRole.get('instrument')?.[0], ...indicators.map(i => i.column)]
  const needed = Math.max(...used.map(c => (c ? c.index + 1 : 0)))
  return { time, rv, error, instrument: byRole.get('instrument')?.[0] ?? null, indicators, needed, scale }
}

function validateSplits(splits: DateSplit[]): void {
  if (!Array.isArray(splits)) bad('splitDates must be a list of { before, instrument }', 'splitDates')
  for (const s of splits) {
    if (!s || typeof s.before !== 'number' || !Number.isFinite(s.before)) bad('each split needs a date `before` as a full Julian day', 'splitDates')
    if (typeof s.instrument !== 'string' || s.instrument.trim() === '') bad('each split needs the instrument name for the rows before its date', 'splitDates')
    if (s.source !== undefined && (typeof s.source !== 'string' || s.source.trim() === '')) bad('a split\'s source must be an instrument name', 'splitDates')
  }
}

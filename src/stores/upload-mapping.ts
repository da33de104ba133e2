import type { ColumnMapping, ColumnRole, DetectHints, TableMapping } from '@/api/types.ts'

/** Roles a table may give to one column only. */
export const SINGLE_ROLES: ColumnRole[] = ['time', 'rv', 'error', 'instrument']

const ref1 = (columns: ColumnMapping[], role: ColumnRole) => {
  const column = columns.find((c) => c.role === role)
  return column ? column.index + 1 : undefined
}

/**
 * Turns the mapping the user corrected into hints for a new preview: the chosen columns by their
 * 1-based position, "no such column" as null, and every setting the user can change.
 */
export function mappingToHints(mapping: TableMapping): DetectHints {
  const hints: DetectHints = {
    delimiter: mapping.delimiter,
    hasHeader: mapping.hasHeader,
    time: ref1(mapping.columns, 'time'),
    rv: ref1(mapping.columns, 'rv'),
    error: ref1(mapping.columns, 'error') ?? null,
    instrument: ref1(mapping.columns, 'instrument') ?? null,
    unit: mapping.unit,
    timeFormat: mapping.timeFormat,
  }
  if (hints.time === undefined) delete hints.time
  if (hints.rv === undefined) delete hints.rv
  if (mapping.defaultError !== undefined) hints.defaultError = mapping.defaultError
  if (mapping.instrument) hints.instrumentName = mapping.instrument
  if (mapping.splitDates?.length) hints.splitDates = mapping.splitDates
  return hints
}

/**
 * Gives `role` to one column; a single-use role taken from another column leaves that one ignored,
 * so the mapping never names two time (or rv, error, instrument) columns.
 */
export function assignRole(mapping: TableMapping, index: number, role: ColumnRole): TableMapping {
  const columns = mapping.columns.map((c) => {
    if (c.index === index) {
      const next: ColumnMapping = { ...c, role }
      if (role === 'indicator' && !next.indicator) next.indicator = c.name
      if (role !== 'indicator') delete next.indicator
      return next
    }
    if (SINGLE_ROLES.includes(role) && c.role === role) return { ...c, role: 'ignore' as const }
    return c
  })
  const next: TableMapping = { ...mapping, columns }
  if (columns.some((c) => c.role === 'error')) delete next.defaultError
  if (columns.some((c) => c.role === 'instrument')) delete next.instrument
  return next
}

/** After a new preview, keeps the user's indicator/ignore choices on columns the hints cannot carry. */
export function keepSideRoles(fresh: TableMapping, edited: TableMapping | undefined): TableMapping {
  if (!edited) return fresh
  const columns = fresh.columns.map((c) => {
    const before = edited.columns.find((e) => e.index === c.index)
    if (!before || SINGLE_ROLES.includes(c.role) || SINGLE_ROLES.includes(before.role)) return c
    return { ...c, role: before.role, indicator: before.indicator, unit: before.unit }
  })
  return { ...fresh, columns }
}

/** What is still missing before a file can be saved, in words for the screen. */
export function mappingGaps(mapping: TableMapping): string[] {
  const gaps: string[] = []
  const has = (role: ColumnRole) => mapping.columns.some((c) => c.role === role)
  if (!has('time')) gaps.push('Choose the time column.')
  if (!has('rv')) gaps.push('Choose the velocity column.')
  if (!has('error') && !(mapping.defaultError !== undefined && mapping.defaultError > 0)) {
    gaps.push('Choose the error column, or give one error for all rows.')
  }
  return gaps
}

import type { ColumnMapping, ColumnRole, Question, TableMapping } from '@/api/types.ts'

/** Roles a table may give to one column only. */
export const SINGLE_ROLES: ColumnRole[] = ['time', 'rv', 'error', 'instrument']

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
      if (role === 'flag' && !next.keep) next.keep = []
      if (role !== 'flag') delete next.keep
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

/** Sets one column's fields (unit, keep, indicator name …). */
export function patchColumn(mapping: TableMapping, index: number, patch: Partial<ColumnMapping>): TableMapping {
  return {
    ...mapping,
    columns: mapping.columns.map((c) => {
      if (c.index !== index) return c
      const next: ColumnMapping = { ...c, ...patch }
      for (const k of Object.keys(patch) as Array<keyof ColumnMapping>) if (patch[k] === undefined) delete next[k]
      return next
    }),
  }
}

/**
 * Answers an open question: sets the mapping field it names (timeFormat, timeScale) to the chosen
 * value and removes the question; a flag question is answered by editing the flag column's kept values.
 */
export function answer(mapping: TableMapping, question: Question, value: string): TableMapping {
  const rest = (mapping.questions ?? []).filter((q) => q !== question && q.message !== question.message)
  const next: TableMapping = { ...mapping, questions: rest }
  if (question.field === 'timeFormat') next.timeFormat = value as TableMapping['timeFormat']
  if (question.field === 'timeScale') next.timeScale = value as TableMapping['timeScale']
  if (!rest.length) delete next.questions
  return next
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
  for (const q of mapping.questions ?? []) gaps.push(`Answer: ${q.message}`)
  return gaps
}

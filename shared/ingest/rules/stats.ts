import { IngestError } from '../errors.ts'
import { isMissing } from '../text.ts'
import type { ColumnStats, Rule } from './context.ts'

/** Count numbers, text and gaps per column over the sampled data rows. */
export const columnStats: Rule = (ctx) => {
  const { columnCount, dataSample, num } = ctx
  const stats: ColumnStats[] = Array.from({ length: columnCount }, () => ({ numeric: 0, missing: 0, text: 0, values: [], distinct: new Map() }))
  for (const row of dataSample) {
    for (let j = 0; j < columnCount; j++) {
      const c = row[j]
      const s = stats[j]!
      if (c === undefined || isMissing(c)) { s.missing++; continue }
      const v = num(c)
      if (Number.isNaN(v)) {
        s.text++
        if (s.distinct.size < 1000) s.distinct.set(c, (s.distinct.get(c) ?? 0) + 1)
      } else { s.numeric++; s.values.push(v) }
    }
  }
  ctx.stats = stats
  ctx.isNumeric = stats.map((s) => s.numeric > 0 && s.numeric >= 0.5 * (s.numeric + s.text))
  if (!ctx.isNumeric.some(Boolean)) {
    throw new IngestError('no_numeric_columns', 'No column holds numbers. A velocity table needs numeric time, velocity and error columns (check the delimiter and the decimal separator).')
  }
}

/**
 * Whitespace-separated with several unnamed text columns at the end: one name with spaces
 * ("HARPS N"), so they are one column (parseTable joins the extra fields of the last column).
 */
export const joinedName: Rule = (ctx) => {
  if (ctx.delimiter !== 'whitespace') return
  const { stats, isNumeric } = ctx
  let first = ctx.columnCount
  while (first > 0 && !isNumeric[first - 1] && stats[first - 1]!.text > 0) first--
  const named = ctx.headerNames ? ctx.headerNames.filter((n) => !/^column \d+$/.test(n)).length : 0
  if (ctx.columnCount - first < 2 || named > first + 1) return
  ctx.notes.push(`columns ${first + 1}–${ctx.columnCount} are words of one name (e.g. '${[...stats[first]!.distinct.keys()][0]} …'), read as one column`)
  ctx.columnCount = first + 1
  ctx.names.length = ctx.columnCount
  stats.length = ctx.columnCount
  isNumeric.length = ctx.columnCount
  ctx.unitsText.length = ctx.columnCount
  if (ctx.headerNames) ctx.headerNames = ctx.names.slice()
  const joined = stats[first]!
  joined.distinct = new Map()
  joined.text = 0
  for (const row of ctx.dataSample) {
    if (row.length <= first) continue
    const c = row.slice(first).join(' ')
    joined.text++
    if (joined.distinct.size < 1000) joined.distinct.set(c, (joined.distinct.get(c) ?? 0) + 1)
  }
}

import { IngestError } from '../errors.ts'
import { MAX_ROWS, PREVIEW_ROWS } from '../limits.ts'
import { indicatorKey } from '../names.ts'
import type { ColumnMapping, Detection, TableMapping } from '../types.ts'
import { instrumentFromFileName } from './instrument.ts'
import type { DetectContext, Rule } from './context.ts'

const VELOCITY_LIKE = /^(?:bisector_span|fwhm)(?:_err)?$/

/** The mapping's columns: roles, indicator keys (made unique: 'x', 'x_2', …), units, positions. */
export const columns: Rule = (ctx) => {
  const used = new Set<string>()
  const unique = (key: string): string => {
    let k = key
    for (let n = 2; used.has(k); n++) k = `${key}_${n}`
    used.add(k)
    return k
  }
  ctx.columns = ctx.names.map((name, j) => {
    const role = ctx.roles[j] ?? (ctx.isNumeric[j] ? 'indicator' : 'ignore')
    const col: ColumnMapping = { index: j, name, role }
    if (ctx.fields) { col.start = ctx.fields[j]!.start; col.end = ctx.fields[j]!.end }
    if ((role === 'rv' || role === 'error') && ctx.units[j] && ctx.units[j] !== ctx.unit) col.unit = ctx.units[j]
    if (role === 'flag') col.keep = ctx.keep[j] ?? []
    if (role === 'indicator') {
      const key = unique(ctx.indicatorKeys[j] ?? (ctx.headerNames ? indicatorKey(name) : `column_${j + 1}`))
      col.indicator = key
      if (VELOCITY_LIKE.test(key)) col.unit = ctx.units[j] ?? ctx.unit
      if (ctx.readings[j]?.role !== 'indicator') {
        ctx.notes.push(`'${name}' is kept as indicator '${key}'${ctx.headerNames ? '' : ' (an unnamed numeric column)'}; mark it 'ignore' to drop it`)
      } else ctx.notes.push(`'${name}' is the activity indicator '${key}'${col.unit ? ` (in ${col.unit})` : ''}`)
    }
    return col
  })
  if (ctx.fields && ctx.columnCount < ctx.fields.length) {
    // Joined trailing words: the last column runs to the end of the line.
    ctx.columns[ctx.columns.length - 1]!.end = Number.MAX_SAFE_INTEGER
  }
}

/** The finished detection: row limit, mapping and preview rows. */
export function finish(ctx: DetectContext): Detection {
  const { hints } = ctx
  const rowCount = ctx.dataIdx.length - ctx.firstData
  if (rowCount > MAX_ROWS) {
    throw new IngestError('too_many_rows', `The table has ${rowCount} rows; the limit is ${MAX_ROWS}. Split it into smaller files.`)
  }
  const mapping: TableMapping = { delimiter: ctx.delimiter, hasHeader: ctx.hasHeader, columns: ctx.columns, unit: ctx.unit, timeFormat: ctx.timeFormat }
  if (ctx.timeScale !== 'unknown' || hints.timeScale) mapping.timeScale = ctx.timeScale
  if (ctx.layout && ctx.layout.firstLine > 0) mapping.firstLine = ctx.layout.firstLine + 1
  if (ctx.skipRows > 0) mapping.skipRows = ctx.skipRows
  if (ctx.decimalComma) mapping.decimalComma = true
  if (hints.defaultError !== undefined) mapping.defaultError = hints.defaultError
  if (!ctx.columns.some((c) => c.role === 'instrument')) {
    if (hints.instrumentName !== undefined) mapping.instrument = hints.instrumentName
    else if (hints.fileName) mapping.instrument = instrumentFromFileName(hints.fileName)
  } else if (hints.instrumentName !== undefined) mapping.instrument = hints.instrumentName
  if (hints.splitDates !== undefined) mapping.splitDates = hints.splitDates
  if (ctx.questions.length > 0) mapping.questions = ctx.questions
  const preview = ctx.dataIdx.slice(ctx.firstData, ctx.firstData + PREVIEW_ROWS).map((i) => ({ line: i + 1, cells: ctx.split(ctx.lines[i]!) }))
  return {
    mapping, headerNames: ctx.headerNames, headerFromComment: ctx.headerFromComment, headerLine: ctx.headerLine,
    columnCount: ctx.columnCount, rowCount, commentLines: ctx.commentLines, preview, notes: ctx.notes, format: ctx.format,
  }
}

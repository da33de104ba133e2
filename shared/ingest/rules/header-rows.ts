import { IngestError } from '../errors.ts'
import { readName } from '../names.ts'
import { isMissing } from '../text.ts'
import { isVelocityUnit } from '../units.ts'
import { mode, type DetectContext, type Rule } from './context.ts'

/** In a whitespace-split header, fold unit tokens ("[m/s]", "(km/s)", "m/s") into the name before them. */
export function mergeUnitTokens(tokens: string[]): string[] {
  const out: string[] = []
  for (const t of tokens) {
    const isUnit = /^[[(].*[\])]$/.test(t) || /^[[(]/.test(t) || /^(?:d|days?)$/i.test(t) || (/\//.test(t) && isVelocityUnit(t))
    if (isUnit && out.length > 0) out[out.length - 1] += ` ${t}`
    else if (out.length > 0 && /^[[(][^\])]*$/.test(out[out.length - 1]!.split(' ').pop()!)) out[out.length - 1] += ` ${t}`
    else out.push(t)
  }
  return out
}

/** Which columns hold numbers in the body of the sample (rows after the first few). */
function bodyNumeric(ctx: DetectContext): boolean[] {
  const { sample, num } = ctx
  const body = sample.length > 1 ? sample.slice(Math.min(4, sample.length - 1)) : sample
  const width = mode(body.map((r) => r.length)).value
  const out: boolean[] = []
  for (let j = 0; j < width; j++) {
    let n = 0
    let t = 0
    for (const r of body) {
      const c = r[j]
      if (c === undefined || isMissing(c)) continue
      if (Number.isNaN(num(c))) t++
      else n++
    }
    out.push(n > 0 && n >= 0.5 * (n + t))
  }
  return out
}

/**
 * A leading row is a header, title or units row when it has text where the body has numbers, or
 * only text — but never when it holds numbers in at least three of the body's numeric columns
 * (or in all of them, when there are fewer): such a row is data, whatever else it holds.
 */
function preambleTest(ctx: DetectContext): (row: string[]) => boolean {
  const numericCols = bodyNumeric(ctx)
  const needed = Math.min(3, numericCols.filter(Boolean).length)
  return (row) => {
    let text = 0
    let numeric = 0
    let numericInNumeric = 0
    let textInNumeric = false
    for (let j = 0; j < row.length; j++) {
      const c = row[j]!
      if (isMissing(c)) continue
      if (Number.isNaN(ctx.num(c))) { text++; if (numericCols[j]) textInNumeric = true }
      else { numeric++; if (numericCols[j]) numericInNumeric++ }
    }
    if (needed > 0 && numericInNumeric >= needed) return false
    if (textInNumeric) return true
    return numeric === 0 && text > 0 && numericCols.some(Boolean)
  }
}

/** Header, title and units rows at the top of the body; the header is the one with the most known names. */
export const headerRows: Rule = (ctx) => {
  const { sample, sampleIdx, hints, layout } = ctx
  const isPreamble = preambleTest(ctx)
  ctx.hasHeader = hints.hasHeader ?? layout?.hasHeader ?? (sample.length > 1 && isPreamble(sample[0]!))
  if (layout && !layout.hasHeader && hints.hasHeader === undefined) ctx.hasHeader = false
  if (ctx.hasHeader) while (ctx.skipRows < 3 && 1 + ctx.skipRows < sample.length - 1 && isPreamble(sample[1 + ctx.skipRows]!)) ctx.skipRows++
  ctx.firstData = ctx.hasHeader ? 1 + ctx.skipRows : 0
  ctx.dataSample = sample.slice(ctx.firstData)
  ctx.columnCount = mode(ctx.dataSample.map((r) => r.length)).value
  if (ctx.dataSample.length === 0 || ctx.columnCount === 0) throw new IngestError('empty', 'The file has a header but no data rows. Upload a table with one row per measurement.')
  ctx.unitsText = Array.from({ length: ctx.columnCount }, () => '')
  if (layout?.names && !ctx.hasHeader) {
    ctx.headerNames = layout.names.slice(0, ctx.columnCount)
    layout.units?.forEach((u, j) => { if (u && j < ctx.columnCount) ctx.unitsText[j] += ` [${u}]` })
  }
  if (layout?.descriptions) layout.descriptions.forEach((d, j) => { if (d && j < ctx.columnCount) ctx.unitsText[j] += ` ${d}` })
  if (layout?.units && ctx.hasHeader) layout.units.forEach((u, j) => { if (u && j < ctx.columnCount) ctx.unitsText[j] += ` [${u}]` })
  if (!ctx.hasHeader) return
  let best = 0
  let bestScore = -1
  for (let k = 0; k <= ctx.skipRows; k++) {
    const score = sample[k]!.filter((c) => readName(c).role !== null).length
    if (score > bestScore) { best = k; bestScore = score }
  }
  let names = sample[best]!
  if (ctx.delimiter === 'whitespace' && names.length > ctx.columnCount) names = mergeUnitTokens(names)
  ctx.headerNames = names
  ctx.headerLine = sampleIdx[best]! + 1
  ctx.notes.push(hints.hasHeader ? 'header row, as given' : `line ${ctx.headerLine} is a header row (${layout?.hasHeader ? 'as the format says' : 'text above numeric columns'})`)
  for (let k = 0; k <= ctx.skipRows; k++) {
    if (k === best) continue
    const row = sample[k]!
    row.forEach((c, j) => { if (j < ctx.columnCount) ctx.unitsText[j] += ` ${c}` })
    if (row.every((c) => /^-+$|^\d*[NS]$/.test(c))) {
      ctx.format = 'rdb'
      ctx.notes.push(`line ${sampleIdx[k]! + 1} is the dashed line of a tab-separated .rdb table; skipped`)
    } else ctx.notes.push(`line ${sampleIdx[k]! + 1} is skipped (text where the data have numbers, fewer than three numbers; read for units)`)
  }
}

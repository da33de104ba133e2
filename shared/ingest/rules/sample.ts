import { looksDecimalComma, parseNumber } from '../text.ts'
import type { Rule } from './context.ts'

/** Rows looked at for column statistics: the first ones, then an even stride through the rest. */
const STAT_HEAD = 2000
const STAT_STRIDED = 3000

/** Sample rows for the column statistics and split them. */
export const sample: Rule = (ctx) => {
  const { dataIdx } = ctx
  const idx = dataIdx.slice(0, STAT_HEAD)
  if (dataIdx.length > STAT_HEAD) {
    const step = (dataIdx.length - STAT_HEAD) / STAT_STRIDED
    for (let k = 0; k < STAT_STRIDED; k++) {
      const j = STAT_HEAD + Math.floor(k * step)
      if (j < dataIdx.length) idx.push(dataIdx[j]!)
    }
  }
  ctx.sampleIdx = idx
  ctx.sample = idx.map((i) => ctx.split(ctx.lines[i]!))
}

/** Decimal comma: cells like 12,5 and none with a decimal point (never with comma delimiters). */
export const decimalComma: Rule = (ctx) => {
  if (ctx.delimiter !== ',') {
    let comma = 0
    let point = 0
    for (const row of ctx.sample.slice(0, 500)) for (const c of row) {
      if (looksDecimalComma(c)) comma++
      else if (/^[+-]?\d*\.\d+/.test(c)) point++
    }
    if (comma > 0 && point === 0) { ctx.decimalComma = true; ctx.notes.push('numbers use a decimal comma') }
  }
  const dc = ctx.decimalComma
  ctx.num = (c) => parseNumber(c, dc)
}

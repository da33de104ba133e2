import { findFixedFields } from '../formats/fixed.ts'
import { sliceFixed } from '../formats/layout.ts'
import { parseNumber, splitCells } from '../text.ts'
import type { Delimiter } from '../types.ts'
import { mode, type Rule } from './context.ts'

/** Rows looked at to choose the delimiter. */
const DELIMITER_SAMPLE = 200

export const DELIMITER_NAMES: Record<Delimiter, string> = { ',': 'comma', '\t': 'tab', ';': 'semicolon', whitespace: 'whitespace', fixed: 'fixed-width' }

/**
 * Choose the delimiter whose split gives the same number (≥ 2) of fields on at least 80% of the
 * sampled lines after the first and the most numeric cells per line; ties go to tab, then semicolon, comma, whitespace.
 */
function chooseDelimiter(lines: string[]): { delimiter: Delimiter; why: string; share: number } {
  let best: { d: Delimiter; numeric: number; fields: number; share: number } | null = null
  for (const d of ['\t', ';', ',', 'whitespace'] as Delimiter[]) {
    const counts: number[] = []
    let numeric = 0
    for (const l of lines) {
      const cells = splitCells(l, d)
      counts.push(cells.length)
      for (const c of cells) if (!Number.isNaN(parseNumber(c, d !== ','))) numeric++
    }
    // The first line may be a header with its own field count: judge consistency on the rest.
    const m = mode(counts.length >= 3 ? counts.slice(1) : counts)
    if (m.value < 2 || m.share < 0.8) continue
    const perLine = numeric / lines.length
    if (!best || perLine > best.numeric + 1e-9) best = { d, numeric: perLine, fields: m.value, share: m.share }
  }
  if (!best) return { delimiter: 'whitespace', why: 'no delimiter splits the lines into two or more consistent fields; reading as whitespace-separated', share: 0 }
  return { delimiter: best.d, why: `${DELIMITER_NAMES[best.d]}-separated: ${best.fields} fields per line`, share: best.share }
}

/**
 * A whitespace table whose lines do not all split into the same number of fields (an empty cell,
 * a name with a space) is read by column positions when the blank character positions give at
 * least three columns: each cell is then read where it stands.
 */
function tryFixed(lines: string[]): ReturnType<typeof findFixedFields> {
  // The first line may be the header: its names must not be cut either, so it counts for the ink.
  const body = lines.length >= 3 ? lines.slice(1) : lines
  const fields = findFixedFields(lines)
  if (!fields || fields.length < 3) return null
  const counts = body.map((l) => splitCells(l, 'whitespace').length)
  const varied = counts.some((c) => c !== counts[0])
  return varied ? fields : null
}

export const delimiter: Rule = (ctx) => {
  const sample = ctx.dataIdx.slice(0, DELIMITER_SAMPLE).map((i) => ctx.lines[i]!)
  const layout = ctx.layout
  if (ctx.hints.delimiter && ctx.hints.delimiter !== 'fixed') {
    ctx.delimiter = ctx.hints.delimiter
    ctx.notes.push(`delimiter ${DELIMITER_NAMES[ctx.delimiter]}, as given`)
  } else if (layout?.delimiter === 'fixed' && layout.fields) {
    ctx.delimiter = 'fixed'
    ctx.fields = layout.fields
  } else if (layout?.delimiter) {
    ctx.delimiter = layout.delimiter
  } else {
    const c = chooseDelimiter(sample)
    const fixed = c.delimiter === 'whitespace' && c.share < 1 ? tryFixed(sample) : null
    if (fixed) {
      ctx.delimiter = 'fixed'
      ctx.fields = fixed
      ctx.format = 'fixed-width'
      ctx.notes.push(`fixed-width: ${fixed.length} columns by character position (lines do not all split into the same number of fields, but the columns line up)`)
    } else {
      ctx.delimiter = c.delimiter
      ctx.notes.push(c.why)
    }
  }
  if (ctx.delimiter === 'fixed' && ctx.fields) {
    const fields = ctx.fields
    ctx.split = (line) => sliceFixed(line, fields)
  } else {
    const d = ctx.delimiter
    ctx.split = (line) => splitCells(line, d)
  }
}

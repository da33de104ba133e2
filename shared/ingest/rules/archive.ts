import { layoutFromSpecs, readMrt } from '../formats/byte-by-byte.ts'
import { readEcsv } from '../formats/ecsv.ts'
import { readIpac } from '../formats/ipac.ts'
import type { Rule } from './context.ts'

/** Archive formats describe themselves: ECSV, IPAC, an AAS MRT, or a CDS file whose ReadMe came along. */
export const archive: Rule = (ctx) => {
  if (ctx.hints.layout?.length) {
    ctx.layout = layoutFromSpecs(ctx.hints.layout, 'cds', 0)
    ctx.layout.notes.push(`CDS table: ${ctx.hints.layout.length} columns at the byte positions its ReadMe gives`)
  } else {
    ctx.layout = readEcsv(ctx.lines) ?? readIpac(ctx.lines) ?? readMrt(ctx.lines)
  }
  if (ctx.layout) {
    ctx.format = ctx.layout.format
    ctx.notes.push(...ctx.layout.notes)
  }
}

import { IngestError } from '../errors.ts'
import { commentPrefix, isBlank } from '../text.ts'
import type { Rule } from './context.ts'

/** The data lines: not blank, not a comment, from the first line of the body on. */
export const bodyLines: Rule = (ctx) => {
  const { lines } = ctx
  const from = ctx.layout?.firstLine ?? 0
  for (let i = from; i < lines.length; i++) {
    const l = lines[i]!
    if (isBlank(l)) continue
    if (commentPrefix(l) !== null) { ctx.commentLines++; continue }
    ctx.dataIdx.push(i)
  }
  if (ctx.dataIdx.length === 0) {
    throw new IngestError('empty', ctx.commentLines > 0
      ? 'The file has only comment lines and no data rows. Upload a table with one row per measurement.'
      : 'The file is empty. Upload a table with one row per measurement.')
  }
  if (ctx.dataIdx.length === 1 && !/\d/.test(lines[ctx.dataIdx[0]!]!)) {
    throw new IngestError('empty', 'The file has a header line but no data rows. Upload a table with one row per measurement.')
  }
}

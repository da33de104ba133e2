import { readName } from '../names.ts'
import { commentBody, commentPrefix, isBlank, parseNumber, splitCells } from '../text.ts'
import { mergeUnitTokens } from './header-rows.ts'
import type { Rule } from './context.ts'

function isNameLike(token: string): boolean {
  return /^[A-Za-z_σαΔδ]/.test(token) && !/^\S+:$/.test(token) && Number.isNaN(parseNumber(token))
}

/**
 * With no header row, the last comment line just before the data is the header when all its
 * tokens look like names and there is one per column with a time/velocity/error name among them
 * (or fewer names than columns, when at least two are time/velocity/error names).
 */
export const commentHeader: Rule = (ctx) => {
  if (ctx.hasHeader || ctx.headerNames || ctx.hints.hasHeader !== undefined) return
  const { lines, columnCount } = ctx
  const d = ctx.delimiter === 'fixed' ? 'whitespace' : ctx.delimiter
  for (let i = ctx.dataIdx[0]! - 1; i >= (ctx.layout?.firstLine ?? 0); i--) {
    const l = lines[i]!
    if (isBlank(l)) continue
    if (commentPrefix(l) === null) break
    const body = commentBody(l)
    let tokens = splitCells(body, d)
    if (tokens.length <= 1 && d !== 'whitespace') tokens = splitCells(body, 'whitespace')
    if (tokens.length > columnCount) tokens = mergeUnitTokens(tokens)
    const named = tokens.every(isNameLike)
    const roles = tokens.map((t) => readName(t).role).filter((r) => r === 'time' || r === 'rv' || r === 'error').length
    if (named && ((tokens.length === columnCount && roles >= 1) || (tokens.length >= 2 && tokens.length < columnCount && roles >= 2))) {
      ctx.headerNames = tokens
      ctx.headerFromComment = true
      ctx.headerLine = i + 1
      ctx.notes.push(`the comment on line ${i + 1} names the columns, so it is read as the header`)
    }
    break
  }
}

/** One name per column: the header's, else `column N`. */
export const columnNames: Rule = (ctx) => {
  const { columnCount } = ctx
  if (ctx.headerNames && ctx.headerNames.length > columnCount) {
    ctx.notes.push(`the header has ${ctx.headerNames.length} names but rows have ${columnCount} fields; extra names ignored`)
  }
  ctx.names = Array.from({ length: columnCount }, (_, j) => ctx.headerNames?.[j]?.trim() || `column ${j + 1}`)
  if (ctx.headerNames) ctx.headerNames = ctx.names.slice()
}

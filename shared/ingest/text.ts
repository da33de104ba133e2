import Papa from 'papaparse'
import { COMMENT_PREFIXES } from './limits.ts'
import type { Delimiter } from './types.ts'

/** Split text into lines on \n, \r\n or \r. Index i is line i + 1. */
export function splitLines(text: string): string[] {
  const lines = text.includes('\r') ? text.split(/\r\n|\n|\r/) : text.split('\n')
  if (lines.length > 0 && lines[lines.length - 1] === '') lines.pop()
  return lines
}

/** Index of the first character that is not a space or tab (line.length when none). */
function firstInk(line: string): number {
  let i = 0
  while (i < line.length) {
    const c = line.charCodeAt(i)
    if (c !== 32 && c !== 9 && c !== 11 && c !== 12 && c !== 13 && c !== 0xa0 && c !== 0xfeff) break
    i++
  }
  return i
}

export function isBlank(line: string): boolean {
  return firstInk(line) === line.length
}

/** The comment prefix of a line ('#', '!', '%'), or null. */
export function commentPrefix(line: string): string | null {
  const c = line[firstInk(line)]
  return c !== undefined && (COMMENT_PREFIXES as readonly string[]).includes(c) ? c : null
}

/** Text of a comment line without its prefix characters. */
export function commentBody(line: string): string {
  return line.trimStart().replace(/^[#!%]+/, '').trim()
}

/** Drop a trailing `# remark` that follows whitespace (only on lines without quotes). */
function stripInlineComment(line: string): string {
  const i = line.indexOf('#')
  if (i <= 0 || line.includes('"')) return line
  const m = /\s#/.exec(line)
  return m ? line.slice(0, m.index) : line
}

function unquote(cell: string): string {
  const c = cell.trim()
  if (c.length >= 2 && ((c[0] === '"' && c[c.length - 1] === '"') || (c[0] === "'" && c[c.length - 1] === "'"))) {
    return c.slice(1, -1).trim()
  }
  return c
}

/** Split on runs of spaces/tabs (a hand loop: several times faster than a regex split). */
function splitWhitespace(l: string): string[] {
  const out: string[] = []
  const n = l.length
  let i = 0
  while (i < n) {
    let c = l.charCodeAt(i)
    while (i < n && (c === 32 || c === 9 || c === 12 || c === 11)) c = l.charCodeAt(++i)
    if (i >= n) break
    const start = i
    while (i < n && c !== 32 && c !== 9 && c !== 12 && c !== 11) c = l.charCodeAt(++i)
    out.push(l.slice(start, i))
  }
  return out
}

/** Split one line into trimmed, unquoted cells. Quoted fields in delimited lines are read by papaparse. */
export function splitCells(line: string, delimiter: Delimiter): string[] {
  const l = stripInlineComment(line)
  if (delimiter === 'whitespace') {
    if (l.includes('"')) return splitQuotedWhitespace(l.trim())
    return splitWhitespace(l)
  }
  if (l.includes('"')) {
    const r = Papa.parse<string[]>(l, { delimiter, quoteChar: '"', header: false })
    const row = r.data[0] ?? []
    return row.map(unquote)
  }
  const parts = l.split(delimiter)
  for (let i = 0; i < parts.length; i++) parts[i] = unquote(parts[i]!)
  return parts
}

function splitQuotedWhitespace(t: string): string[] {
  const out: string[] = []
  const re = /"([^"]*)"|(\S+)/g
  let m: RegExpExecArray | null
  while ((m = re.exec(t)) !== null) out.push(m[1] !== undefined ? m[1].trim() : m[2]!)
  return out
}

const MAX_NUMBER_CHARS = 64
const NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/
const NUMBER_D = /^[+-]?(?:\d+\.?\d*|\.\d+)[dD][+-]?\d+$/
const DECIMAL_COMMA = /^[+-]?\d*,\d+(?:[eE][+-]?\d+)?$/

/**
 * Parse a number strictly (no '', '0x..', 'Infinity'); NaN when the cell is not a plain number.
 * `pow10` scales by a power of ten in decimal (so '46.30911' with pow10 3 gives exactly 46309.11,
 * not 46309.10999…).
 */
export function parseNumber(cell: string, decimalComma = false, pow10 = 0): number {
  // Longer cells are never plain numbers; the cap also keeps the regexes linear on hostile input.
  if (cell.length > MAX_NUMBER_CHARS) return NaN
  let s: string
  if (NUMBER.test(cell)) s = cell
  else if (decimalComma && DECIMAL_COMMA.test(cell)) s = cell.replace(',', '.')
  else if (NUMBER_D.test(cell)) s = cell.replace(/[dD]/, 'e')
  else return NaN
  if (pow10 === 0) return Number(s)
  const e = s.search(/[eE]/)
  if (e < 0) return Number(`${s}e${pow10}`)
  return Number(`${s.slice(0, e)}e${Number(s.slice(e + 1)) + pow10}`)
}

export function looksDecimalComma(cell: string): boolean {
  return cell.length <= MAX_NUMBER_CHARS && DECIMAL_COMMA.test(cell)
}

const MISSING = new Set(['', 'nan', '-nan', '+nan', 'na', 'n/a', 'null', 'none', '-', '--', '---', '?', 'inf', '-inf', 'infinity'])

/** Cells that mean "no value" (empty, NaN, NA, null, -, …): a gap, not text. */
export function isMissing(cell: string): boolean {
  return cell.length <= 9 && MISSING.has(cell.toLowerCase())
}

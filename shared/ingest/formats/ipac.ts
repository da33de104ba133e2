import { readTimeWords } from '../time-words.ts'
import { scaleFromMeta, type ArchiveLayout, type FixedField } from './layout.ts'

/**
 * IPAC table (`.tbl`, the infrared science archive's text table format): `\keyword = value` and `\ comment`
 * lines, then up to four `|`-separated header lines (names, types, units, null values), then the
 * body, fixed-width under the `|` positions. `\TIMESYS` names the time scale.
 */
export function readIpac(lines: string[]): ArchiveLayout | null {
  let i = 0
  const keywords: Record<string, string> = {}
  while (i < lines.length && (/^\\/.test(lines[i]!) || lines[i]!.trim() === '')) {
    const kw = /^\\\s*([A-Za-z_][\w-]*)\s*=\s*'?([^']*)'?\s*$/.exec(lines[i]!)
    if (kw) keywords[kw[1]!.toUpperCase()] = kw[2]!.trim()
    i++
  }
  if (!/^\s*\|/.test(lines[i] ?? '')) return null
  const head: string[] = []
  while (i < lines.length && /^\s*\|/.test(lines[i]!) && head.length < 4) head.push(lines[i++]!)
  const pipes: number[] = []
  for (let k = 0; k < head[0]!.length; k++) if (head[0]![k] === '|') pipes.push(k)
  if (pipes.length < 3) return null
  const fields: FixedField[] = []
  for (let k = 0; k + 1 < pipes.length; k++) fields.push({ start: pipes[k]!, end: k + 2 < pipes.length ? pipes[k + 1]! : Number.MAX_SAFE_INTEGER })
  const cellsOf = (l: string | undefined) => fields.map((f) => (l ?? '').slice(f.start + 1, f.end).replace(/\|/g, '').trim())
  const names = cellsOf(head[0])
  const units = head[2] ? cellsOf(head[2]).map((u) => (u === '' || /^(?:-+|null)$/i.test(u) ? undefined : u)) : names.map(() => undefined)
  const layout: ArchiveLayout = {
    format: 'ipac', firstLine: i, hasHeader: false, delimiter: 'fixed', fields, names, units, notes: [],
  }
  const sys = keywords.TIMESYS ?? keywords.TIME_SCALE ?? keywords.TIMESCALE
  if (sys) {
    const bary = /bary/i.test(keywords.TIMEREF ?? '') || readTimeWords(names.join(' ')).scale === 'bjd_tdb'
    const s = scaleFromMeta(sys, bary)
    if (s) { layout.timeScale = s; layout.timeScaleFrom = `the IPAC keyword TIMESYS = '${sys}'` }
  }
  layout.notes.push(`IPAC table: ${names.length} columns at the '|' positions of its header${head[2] ? ', units from its third header line' : ''}`)
  return layout
}

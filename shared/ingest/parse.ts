import { assertText } from './decode.ts'
import { IngestError } from './errors.ts'
import { MAX_FILE_BYTES, MAX_PROBLEMS, MAX_ROWS, DEFAULT_INSTRUMENT } from './limits.ts'
import { validateMapping, type Scale } from './mapping.ts'
import { columnImplausibility, rowImplausibility } from './plausibility.ts'
import { commentPrefix, isBlank, isMissing, parseNumber, splitCells, splitLines } from './text.ts'
import { timeOffset } from './time.ts'
import type { ColumnMapping, DateSplit, ParseOptions, ParseResult, ParsedRow, RowProblem, TableMapping } from './types.ts'

function show(cell: string): string {
  return cell.length > 40 ? `'${cell.slice(0, 37)}…'` : `'${cell}'`
}

/** Instrument name of a row after the date splits (earliest boundary the row precedes wins). */
function splitter(splits: DateSplit[] | undefined): ((name: string, time: number) => string) | null {
  if (!splits || splits.length === 0) return null
  const sorted = splits.map(s => ({ ...s, instrument: s.instrument.trim(), source: s.source?.trim() })).sort((a, b) => a.before - b.before)
  return (name, time) => {
    for (const s of sorted) if ((s.source === undefined || s.source === name) && time < s.before) return s.instrument
    return name
  }
}

/** A line's cells at the columns' fixed positions (unused columns empty). */
function fixedSplitter(columns: ColumnMapping[], width: number): (line: string) => string[] {
  const used = columns.filter((c) => c.role !== 'ignore' && c.start !== undefined && c.end !== undefined)
  return (line) => {
    const cells = new Array<string>(width).fill('')
    for (const c of used) cells[c.index] = line.slice(c.start, c.end).trim()
    return cells
  }
}

/**
 * Read every data row of a table with a mapping (from detectTable, possibly corrected).
 * Times become full Julian days, velocities and errors m/s (each column in its own unit). Rows
 * with a problem (a missing or non-numeric cell, an error ≤ 0, too few or too many fields, a
 * duplicate of an earlier row with the same time, velocity and instrument, a value outside the
 * physical ranges of plausibility.ts, a ~1000× unit jump) are left out of `rows` and listed in
 * `problems` with their line number and column; doubtful rows are kept and listed in `warnings`.
 * A flag column's other values set `excludedReason`. Throws IngestError for a bad mapping (see validateMapping),
 * binary text, or more than MAX_ROWS data rows.
 */
export function parseTable(text: string, mapping: TableMapping, opts: ParseOptions = {}): ParseResult {
  if (typeof text !== 'string') throw new TypeError('text must be a string')
  const maxRows = opts.maxRows ?? Infinity
  const maxProblems = opts.maxProblems ?? MAX_PROBLEMS
  if (!(maxRows > 0)) throw new RangeError('maxRows must be positive')
  if (!(maxProblems >= 0)) throw new RangeError('maxProblems must be ≥ 0')
  const m = validateMapping(mapping)
  if (text.length > MAX_FILE_BYTES) {
    throw new IngestError('too_large', `The table is over the ${(MAX_FILE_BYTES / 1048576).toFixed(0)} MB limit. Split it into smaller files.`)
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1)
  assertText(text)

  const { delimiter } = mapping
  const decimalComma = mapping.decimalComma === true
  const width = Math.max(...mapping.columns.map(c => c.index)) + 1
  const offset = timeOffset(mapping.timeFormat)
  const defaultError = parseNumber(String(mapping.defaultError ?? NaN), false, m.tableScale.pow10) * m.tableScale.factor
  const fixed = delimiter === 'fixed' ? fixedSplitter(mapping.columns, width) : null
  const baseInstrument = (mapping.instrument ?? DEFAULT_INSTRUMENT).trim()
  const split = splitter(mapping.splitDates)
  const joinTail = delimiter === 'whitespace' && m.instrument !== null && m.instrument.index === width - 1
  let toSkip = (mapping.hasHeader ? 1 : 0) + (mapping.skipRows ?? 0)

  const rows: ParsedRow[] = []
  // Every problem is kept until the end, so duplicates (found last) sort into line order.
  const all: RowProblem[] = []
  const counts = new Map<string, number>()
  const warnings: RowProblem[] = []
  const add = (p: RowProblem): void => { all.push(p) }
  const readNumber = (cells: string[], col: { index: number; name: string }, what: string, scale: Scale, line: number): number => {
    const c = cells[col.index] ?? ''
    if (c === '') { add({ line, column: col.name, message: `missing ${what}` }); return NaN }
    const v = parseNumber(c, decimalComma, scale.pow10)
    if (Number.isNaN(v)) add({ line, column: col.name, message: `${what} ${show(c)} is not a number` })
    return scale.factor === 1 ? v : v * scale.factor
  }
  const noScale: Scale = { pow10: 0, factor: 1 }
  let rowsRead = 0
  let truncated = false
  const lines = splitLines(text)

  for (let i = (mapping.firstLine ?? 1) - 1; i < lines.length; i++) {
    const line = lines[i]!
    if (isBlank(line) || commentPrefix(line) !== null) continue
    if (toSkip > 0) { toSkip--; continue }
    if (rowsRead >= maxRows) { truncated = true; break }
    rowsRead++
    if (rowsRead > MAX_ROWS) {
      throw new IngestError('too_many_rows', `The table has more than ${MAX_ROWS} rows. Split it into smaller files.`)
    }
    const lineNo = i + 1
    let cells = fixed ? fixed(line) : splitCells(line, delimiter)
    // Whitespace-separated with the instrument last: a name with spaces ("HARPS N") is one name.
    if (joinTail && cells.length > width) cells = [...cells.slice(0, width - 1), cells.slice(width - 1).join(' ')]
    if (cells.length < m.needed) {
      add({ line: lineNo, message: `too few fields: found ${cells.length}, expected ${width}` })
      continue
    }
    if (cells.length > width) {
      add({ line: lineNo, message: `too many fields: found ${cells.length}, expected ${width} (a stray delimiter, or a name with a space?)` })
      continue
    }
    const before = all.length
    const t = readNumber(cells, m.time, 'time', noScale, lineNo)
    const rv = readNumber(cells, m.rv, 'velocity', m.rvScale, lineNo)
    let err = defaultError
    if (m.error) {
      err = readNumber(cells, m.error, 'error', m.errorScale, lineNo)
      if (!Number.isNaN(err) && !(err > 0)) add({ line: lineNo, column: m.error.name, message: `error must be positive (found ${cells[m.error.index]})` })
    }
    let instrument = baseInstrument
    if (m.instrument) {
      instrument = cells[m.instrument.index] ?? ''
      if (instrument === '') add({ line: lineNo, column: m.instrument.name, message: 'missing instrument name' })
    }
    const indicators: Record<string, number> = {}
    for (const ind of m.indicators) {
      const c = cells[ind.column.index]
      if (c === undefined) continue
      const v = parseNumber(c, decimalComma, ind.scale.pow10) * ind.scale.factor
      if (!Number.isNaN(v)) indicators[ind.key] = v
      else if (!isMissing(c)) add({ line: lineNo, column: ind.column.name, message: `${ind.key} ${show(c)} is not a number` })
    }
    if (all.length !== before) continue
    const time = t + offset
    const implausible = rowImplausibility(t, time, rv, err, mapping.timeFormat)
    if (implausible !== null) { add({ line: lineNo, message: implausible }); continue }
    if (split) instrument = split(instrument, time)
    const row: ParsedRow = { line: lineNo, time, rv, error: err, instrument, indicators }
    let reason = ''
    for (const f of m.flags) {
      const c = (cells[f.column.index] ?? '').trim()
      if (c !== '' && !f.keep.has(c.toLowerCase())) reason += `${reason ? '; ' : ''}${f.column.name}: ${c}`
    }
    if (reason) row.excludedReason = reason
    rows.push(row)
  }

  // Duplicates: rows in time order (files are usually in time order already; a sort beats a hash
  // map of 100 000 float keys several times over), then equal velocity and instrument within
  // each run of equal times.
  const n = rows.length
  const order = new Uint32Array(n)
  for (let k = 0; k < n; k++) order[k] = k
  let sorted = true
  for (let k = 1; k < n && sorted; k++) sorted = rows[k - 1]!.time <= rows[k]!.time
  if (!sorted) order.sort((a, b) => rows[a]!.time - rows[b]!.time || a - b)
  const duplicate = new Uint8Array(n)
  let dupCount = 0
  for (let start = 0; start < n;) {
    let end = start + 1
    const t0 = rows[order[start]!]!.time
    while (end < n && rows[order[end]!]!.time === t0) end++
    if (end - start > 1) {
      // Within a run the first row of each (velocity, instrument) is kept; later ones are duplicates.
      const firsts = new Map<string, ParsedRow>()
      for (let x = start; x < end; x++) {
        const row = rows[order[x]!]!
        const key = `${row.rv}\u0001${row.instrument}`
        const first = firsts.get(key)
        if (first === undefined) { firsts.set(key, row); continue }
        duplicate[order[x]!] = 1
        dupCount++
        add({ line: row.line, message: `duplicate of line ${first.line} (same time, velocity and instrument)` })
      }
    }
    start = end
  }
  let kept = dupCount === 0 ? rows : rows.filter((_, k) => !duplicate[k])
  const jumps = columnImplausibility(kept, all, warnings, { rv: m.rv.name, error: m.error?.name ?? null })
  if (jumps.size > 0) kept = kept.filter((_, k) => !jumps.has(k))
  if (dupCount > 0 || jumps.size > 0) all.sort((a, b) => a.line - b.line)
  warnings.sort((a, b) => a.line - b.line)
  for (const r of kept) counts.set(r.instrument, (counts.get(r.instrument) ?? 0) + 1)
  const instruments = [...counts].map(([name, count]) => ({ name, count }))
  return {
    rows: kept, problems: all.slice(0, maxProblems), problemCount: all.length, warnings: warnings.slice(0, maxProblems),
    warningCount: warnings.length, instruments, rowsRead, truncated,
  }
}

/**
 * One line per problem ("line 12, column 'rv': velocity 'abc' is not a number"), at most `max`
 * of them, then "… and N more". For CLI output and error replies.
 */
export function formatProblems(problems: RowProblem[], max = 10, total = problems.length): string {
  const shown = problems.slice(0, max).map(p => `line ${p.line}${p.column ? `, column '${p.column}'` : ''}: ${p.message}`)
  if (total > shown.length) shown.push(`… and ${total - shown.length} more`)
  return shown.join('\n')
}

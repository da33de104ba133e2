import { assertText } from './decode.ts'
import { IngestError } from './errors.ts'
import { MAX_FILE_BYTES, MAX_PROBLEMS, MAX_ROWS, DEFAULT_INSTRUMENT } from './limits.ts'
import { validateMapping } from './mapping.ts'
import { commentPrefix, isBlank, isMissing, parseNumber, splitCells, splitLines } from './text.ts'
import { TIME_OFFSETS } from './time.ts'
import type { DateSplit, ParseOptions, ParseResult, ParsedRow, RowProblem, TableMapping } from './types.ts'

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

/**
 * Read every data row of a table with a mapping (from detectTable, possibly corrected).
 * Times become full Julian days, velocities and errors m/s. Rows with a problem (a missing or
 * non-numeric cell, an error ≤ 0, too few or too many fields, a duplicate of an earlier row with
 * the same time, velocity and instrument) are left out of `rows` and listed in `problems`
 * with their line number and column. Throws IngestError for a bad mapping (see validateMapping),
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
  const offset = TIME_OFFSETS[mapping.timeFormat]
  const scale = m.scale
  const pow10 = scale === 1000 ? 3 : 0
  const defaultError = (mapping.defaultError ?? NaN) * scale
  const baseInstrument = (mapping.instrument ?? DEFAULT_INSTRUMENT).trim()
  const split = splitter(mapping.splitDates)
  const joinTail = delimiter === 'whitespace' && m.instrument !== null && m.instrument.index === width - 1
  let toSkip = (mapping.hasHeader ? 1 : 0) + (mapping.skipRows ?? 0)

  const rows: ParsedRow[] = []
  // Every problem is kept until the end, so duplicates (found last) sort into line order.
  const all: RowProblem[] = []
  const counts = new Map<string, number>()
  const add = (p: RowProblem): void => { all.push(p) }
  const readNumber = (cells: string[], col: { index: number; name: string }, what: string, pow: number, line: number): number => {
    const c = cells[col.index] ?? ''
    if (c === '') { add({ line, column: col.name, message: `missing ${what}` }); return NaN }
    const v = parseNumber(c, decimalComma, pow)
    if (Number.isNaN(v)) add({ line, column: col.name, message: `${what} ${show(c)} is not a number` })
    return v
  }
  let rowsRead = 0
  let truncated = false
  const lines = splitLines(text)

  for (let i = 0; i < lines.length; i++) {
    const line = lines[i]!
    if (isBlank(line) || commentPrefix(line) !== null) continue
    if (toSkip > 0) { toSkip--; continue }
    if (rowsRead >= maxRows) { truncated = true; break }
    rowsRead++
    if (rowsRead > MAX_ROWS) {
      throw new IngestError('too_many_rows', `The table has more than ${MAX_ROWS} rows. Split it into smaller files.`)
    }
    const lineNo = i + 1
    let cells = splitCells(line, delimiter)
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
    const t = readNumber(cells, m.time, 'time', 0, lineNo)
    const rv = readNumber(cells, m.rv, 'velocity', pow10, lineNo)
    let err = defaultError
    if (m.error) {
      err = readNumber(cells, m.error, 'error', pow10, lineNo)
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
      const v = parseNumber(c, decimalComma, ind.pow10)
      if (!Number.isNaN(v)) indicators[ind.key] = v
      else if (!isMissing(c)) add({ line: lineNo, column: ind.column.name, message: `${ind.key} ${show(c)} is not a number` })
    }
    if (all.length !== before) continue
    const time = t + offset
    if (split) instrument = split(instrument, time)
    rows.push({ line: lineNo, time, rv, error: err, instrument, indicators })
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
  const kept = dupCount === 0 ? rows : rows.filter((_, k) => !duplicate[k])
  if (dupCount > 0) all.sort((a, b) => a.line - b.line)
  for (const r of kept) counts.set(r.instrument, (counts.get(r.instrument) ?? 0) + 1)
  const instruments = [...counts].map(([name, count]) => ({ name, count }))
  return { rows: kept, problems: all.slice(0, maxProblems), problemCount: all.length, instruments, rowsRead, truncated }
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

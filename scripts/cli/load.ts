// Reading the table for the command line: the same ingest code as the upload (shared/ingest).
import { readFileSync } from 'node:fs'
import {
  decodeTableBytes, detectTable, parseTable, formatProblems, IngestError,
  type DetectHints, type TimeFormat, type VelocityUnit,
} from '../../shared/ingest/index.ts'
import { toRvData, baseline, type RvData, type IndicatorColumn } from '../../shared/rv/index.ts'
import { UsageError, str, type Parsed } from './args.ts'
import type { CliIo } from './format.ts'

const UNITS = ['m/s', 'km/s']
const TIME_FORMAT = /^(jd|bjd|mjd|days|jd-\d+(\.\d+)?)$/

export interface InputInfo { file: string; rows: number; instruments: string[]; unit: string; timeFormat: string; baselineDays: number }
/** `indicators`: the table's activity-indicator columns, one value per row of `data` (NaN where empty). */
export interface Loaded { data: RvData; input: InputInfo; indicators: IndicatorColumn[] }

function columnRef(flag: string, s: string | undefined): string | number | undefined {
  if (s === undefined) return undefined
  if (!/^\d+$/.test(s)) return s
  const n = Number(s)
  if (n < 1) throw new UsageError(`--${flag} is a 1-based column index or a header name, got '${s}'`)
  return n
}

/** Reads FILE (or standard input for '-'), detects and parses it; bad input is a UsageError. */
export function load(p: Parsed, io: CliIo, readStdin: () => Buffer = () => readFileSync(0)): Loaded {
  const hints: DetectHints = {}
  const tc = columnRef('time-col', str(p, 'time-col')), rc = columnRef('rv-col', str(p, 'rv-col'))
  const ec = columnRef('err-col', str(p, 'err-col')), ic = columnRef('instrument-col', str(p, 'instrument-col'))
  if (tc !== undefined) hints.time = tc
  if (rc !== undefined) hints.rv = rc
  if (ec !== undefined) hints.error = ec
  if (ic !== undefined) hints.instrument = ic
  const unit = str(p, 'unit')
  if (unit !== undefined) {
    if (!UNITS.includes(unit)) throw new UsageError(`--unit must be m/s or km/s, got '${unit}'`)
    hints.unit = unit as VelocityUnit
  }
  const tf = str(p, 'time-format')
  if (tf !== undefined) {
    if (!TIME_FORMAT.test(tf)) throw new UsageError(`--time-format must be jd, bjd, mjd, days or jd-N, got '${tf}'`)
    hints.timeFormat = tf as TimeFormat
  }
  const only = str(p, 'instruments')?.split(',').map((s) => s.trim()).filter(Boolean)
  let bytes: Buffer
  const name = p.file === '-' ? 'standard input' : p.file
  try { bytes = p.file === '-' ? readStdin() : readFileSync(p.file) } catch (e) {
    throw new UsageError(`cannot read ${name}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}; check the path`)
  }
  try {
    const text = decodeTableBytes(bytes)
    const detection = detectTable(text, hints)
    const q = detection.mapping.questions?.find((x) => x.field === 'timeFormat')
    if (q) {
      // the times could be read two ways (e.g. MJD or JD − 2400000, half a day apart): name the option that decides
      throw new UsageError(`${name}: ${q.message} Say which with --time-format ${q.choices.map((c) => c.value).join(' or ')} (${q.choices.map((c) => `${c.value}: ${c.label}`).join('; ')}).`)
    }
    const parsed = parseTable(text, detection.mapping)
    if (parsed.problemCount > 0) {
      const first = formatProblems(parsed.problems, 1).split('\n')[0]
      io.err(`warning: ${parsed.problemCount} row(s) left out (first: ${first})`)
    }
    let rows = parsed.rows
    if (only) {
      const known = [...new Set(rows.map((r) => r.instrument))]
      const unknown = only.filter((n) => !known.includes(n))
      if (unknown.length) throw new UsageError(`--instruments: ${unknown.join(', ')} not in ${name} (it has ${known.join(', ')})`)
      rows = rows.filter((r) => only.includes(r.instrument))
    }
    // time order, as the server stores and reads a star's measurements: the same rows in the same
    // order give the same instrument numbering and the same sums, so CLI and API answers agree
    rows = rows.map((r, i) => ({ r, i })).sort((a, b) => a.r.time - b.r.time || a.i - b.i).map((x) => x.r)
    if (rows.length < 3) throw new UsageError(`${name}: only ${rows.length} usable row(s); need at least 3 with time, velocity and a positive error`)
    const { data } = toRvData({
      time: rows.map((r) => r.time), rv: rows.map((r) => r.rv), error: rows.map((r) => r.error), instrument: rows.map((r) => r.instrument),
    })
    const keys = [...new Set(rows.flatMap((r) => Object.keys(r.indicators)))]
    const indicators = keys.map((name) => ({ name, value: Float64Array.from(rows, (r) => r.indicators[name] ?? NaN) }))
    return {
      data, indicators,
      input: {
        file: name, rows: data.t.length, instruments: data.instrumentNames, unit: detection.mapping.unit,
        timeFormat: detection.mapping.timeFormat, baselineDays: baseline(data.t),
      },
    }
  } catch (e) {
    if (e instanceof IngestError) {
      const field = e.field ? ` (${e.field})` : ''
      throw new UsageError(`${name}: ${e.message}${field}; name the columns with --time-col/--rv-col/--err-col or fix the file`)
    }
    throw e
  }
}

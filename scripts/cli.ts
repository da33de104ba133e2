/**
 * Starsway command line: periodogram and orbit fit of one velocity table.
 *
 *   npx tsx scripts/cli.ts periodogram FILE [input options] [--min-period D] [--max-period D]
 *           [--oversample K | --frequencies M] [--peaks K] [--json]
 *   npx tsx scripts/cli.ts fit FILE [input options] [--planets N|auto] [--trend auto|none|linear|quadratic]
 *           [--mstar MSUN [--mstar-err MSUN]] [--json]
 *   input options: --time-col C --rv-col C --err-col C --instrument-col C  (C = header name or 1-based index)
 *                  --unit m/s|km/s   --time-format jd|bjd|mjd|jd-2400000|jd-2450000|days
 *
 * Tables are read by the same code as the upload (shared/ingest). Rows with a problem (a missing
 * or non-numeric cell, error ≤ 0, a duplicate) are left out with a one-line warning on stderr;
 * bad input (unknown flag, unreadable file, no usable rows) exits with code 2 and one line on stderr.
 */
import { readFileSync } from 'node:fs'
import { pathToFileURL } from 'node:url'
import { roundByUncertainty } from '../shared/report/round.ts'
import {
  decodeTableBytes, detectTable, parseTable, formatProblems, IngestError,
  type DetectHints, type TimeFormat, type VelocityUnit,
} from '../shared/ingest/index.ts'
import {
  periodogram, findPeaks, searchPlanets, fitKeplerians, derivedPlanet, toRvData, baseline,
  type RvData, type TrendKind,
} from '../shared/rv/index.ts'

export interface CliIo { out: (s: string) => void; err: (s: string) => void }

class UsageError extends Error {}

const USAGE = 'usage: cli.ts periodogram|fit FILE [options] (see the header of scripts/cli.ts)'
const TIME_FORMATS: TimeFormat[] = ['jd', 'bjd', 'mjd', 'jd-2400000', 'jd-2450000', 'days']
const UNITS: VelocityUnit[] = ['m/s', 'km/s']

const COMMON_FLAGS = ['--time-col', '--rv-col', '--err-col', '--instrument-col', '--unit', '--time-format']
const FLAGS: Record<string, string[]> = {
  periodogram: [...COMMON_FLAGS, '--min-period', '--max-period', '--oversample', '--frequencies', '--peaks'],
  fit: [...COMMON_FLAGS, '--planets', '--trend', '--mstar', '--mstar-err'],
}

interface Parsed { command: string; file: string; flags: Map<string, string>; json: boolean }

function parseArgs(argv: string[]): Parsed {
  const [command, ...rest] = argv
  if (!command || !(command in FLAGS)) throw new UsageError(`unknown command '${command ?? ''}': use 'periodogram' or 'fit'. ${USAGE}`)
  const flags = new Map<string, string>()
  let file: string | null = null
  let json = false
  for (let i = 0; i < rest.length; i++) {
    const a = rest[i]
    if (a === '--json') { json = true; continue }
    if (a.startsWith('--')) {
      const eq = a.indexOf('=')
      const name = eq > 0 ? a.slice(0, eq) : a
      if (!FLAGS[command].includes(name)) throw new UsageError(`unknown option ${name} for '${command}' (allowed: ${FLAGS[command].join(' ')} --json)`)
      const value = eq > 0 ? a.slice(eq + 1) : rest[++i]
      if (value === undefined || value === '') throw new UsageError(`option ${name} needs a value`)
      flags.set(name, value)
      continue
    }
    if (file !== null) throw new UsageError(`unexpected argument '${a}': give exactly one FILE`)
    file = a
  }
  if (file === null) throw new UsageError(`missing FILE. ${USAGE}`)
  return { command, file, flags, json }
}

function numberFlag(p: Parsed, name: string, check: (v: number) => boolean, what: string): number | undefined {
  const s = p.flags.get(name)
  if (s === undefined) return undefined
  const v = Number(s)
  if (!Number.isFinite(v) || !check(v)) throw new UsageError(`${name} must be ${what}, got '${s}'`)
  return v
}

function columnRef(s: string | undefined): string | number | undefined {
  if (s === undefined) return undefined
  return /^\d+$/.test(s) ? Number(s) : s
}

interface Loaded { data: RvData; input: { rows: number; instruments: string[]; unit: string; timeFormat: string; baselineDays: number } }

function load(p: Parsed, io: CliIo): Loaded {
  const hints: DetectHints = {}
  const col = (flag: string): string | number | undefined => {
    const ref = columnRef(p.flags.get(flag))
    if (typeof ref === 'number' && ref < 1) throw new UsageError(`${flag} is a 1-based column index or a header name, got '${p.flags.get(flag)}'`)
    return ref
  }
  const tc = col('--time-col'), rc = col('--rv-col'), ec = col('--err-col'), ic = col('--instrument-col')
  if (tc !== undefined) hints.time = tc
  if (rc !== undefined) hints.rv = rc
  if (ec !== undefined) hints.error = ec
  if (ic !== undefined) hints.instrument = ic
  const unit = p.flags.get('--unit')
  if (unit !== undefined) {
    if (!UNITS.includes(unit as VelocityUnit)) throw new UsageError(`--unit must be m/s or km/s, got '${unit}'`)
    hints.unit = unit as VelocityUnit
  }
  const tf = p.flags.get('--time-format')
  if (tf !== undefined) {
    if (!TIME_FORMATS.includes(tf as TimeFormat)) throw new UsageError(`--time-format must be one of ${TIME_FORMATS.join(', ')}, got '${tf}'`)
    hints.timeFormat = tf as TimeFormat
  }
  let bytes: Buffer
  try { bytes = readFileSync(p.file) } catch (e) {
    throw new UsageError(`cannot read ${p.file}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}; check the path`)
  }
  let text: string
  try {
    text = decodeTableBytes(bytes)
    const detection = detectTable(text, hints)
    const parsed = parseTable(text, detection.mapping)
    if (parsed.problemCount > 0) {
      const first = formatProblems(parsed.problems, 1).split('\n')[0]
      io.err(`warning: ${parsed.problemCount} row(s) left out (first: ${first})`)
    }
    if (parsed.rows.length < 3) throw new UsageError(`${p.file}: only ${parsed.rows.length} usable row(s); need at least 3 with time, velocity and a positive error`)
    const { data } = toRvData({
      time: parsed.rows.map((r) => r.time), rv: parsed.rows.map((r) => r.rv),
      error: parsed.rows.map((r) => r.error), instrument: parsed.rows.map((r) => r.instrument),
    })
    return {
      data,
      input: {
        rows: data.t.length, instruments: data.instrumentNames, unit: detection.mapping.unit,
        timeFormat: detection.mapping.timeFormat, baselineDays: baseline(data.t),
      },
    }
  } catch (e) {
    if (e instanceof IngestError) {
      const field = e.field ? ` (${e.field})` : ''
      throw new UsageError(`${p.file}: ${e.message}${field}; name the columns with --time-col/--rv-col/--err-col or fix the file`)
    }
    throw e
  }
}

/** Velocities with each instrument's weighted mean removed (the periodogram's input). */
function centred(data: RvData): Float64Array {
  const f = fitKeplerians(data, { planets: [], trend: 'none', jitter: data.instrumentNames.map(() => 0), skipUncertainties: true })
  return f.residuals
}

function table(rows: Array<Array<string | number | null>>, head: string[]): string {
  const cells = [head, ...rows.map((r) => r.map((c) => (c === null || (typeof c === 'number' && !Number.isFinite(c)) ? '—' : typeof c === 'number' ? fmt(c) : c)))]
  const widths = head.map((_, j) => Math.max(...cells.map((r) => String(r[j]).length)))
  return cells.map((r) => r.map((c, j) => String(c).padStart(widths[j])).join('  ')).join('\n')
}

function fmt(v: number): string {
  if (v === 0) return '0'
  const a = Math.abs(v)
  if (a >= 1e6) return v.toFixed(5)
  if (a >= 1e-3 && a < 1e6) return Number(v.toPrecision(7)).toString()
  return v.toExponential(3)
}

function finiteOrNull(v: number | undefined): number | null {
  return v === undefined || !Number.isFinite(v) ? null : v
}

function runPeriodogram(p: Parsed, io: CliIo): void {
  const minPeriod = numberFlag(p, '--min-period', (v) => v > 0, 'a positive number of days')
  const maxPeriod = numberFlag(p, '--max-period', (v) => v > 0, 'a positive number of days')
  const oversample = numberFlag(p, '--oversample', (v) => v > 0, 'a positive number')
  const frequencies = numberFlag(p, '--frequencies', (v) => Number.isInteger(v) && v >= 2, 'an integer ≥ 2')
  const npeaks = numberFlag(p, '--peaks', (v) => Number.isInteger(v) && v >= 1, 'a positive integer') ?? 5
  if (oversample !== undefined && frequencies !== undefined) throw new UsageError('give --oversample or --frequencies, not both')
  if (minPeriod !== undefined && maxPeriod !== undefined && !(maxPeriod > minPeriod)) throw new UsageError('--max-period must exceed --min-period')
  const { data, input } = load(p, io)
  const t0 = performance.now()
  const y = centred(data)
  let pg, peaks
  try {
    pg = periodogram(data.t, y, data.dy, { minPeriod, maxPeriod, oversample, frequencies })
    peaks = findPeaks(data.t, y, data.dy, pg, { count: npeaks })
  } catch (e) {
    if (e instanceof RangeError) throw new UsageError(`${e.message}; adjust --min-period/--max-period/--oversample/--frequencies`)
    throw e
  }
  const ms = performance.now() - t0
  const doc = {
    input,
    grid: { minFrequency: pg.grid.f0, maxFrequency: pg.grid.f0 + (pg.grid.count - 1) * pg.grid.df, count: pg.grid.count },
    peaks: peaks.map((k) => ({ period: k.period, frequency: k.frequency, power: k.power, fap: k.fap })),
    timingMs: { periodogram: ms },
  }
  if (p.json) { io.out(JSON.stringify(doc)); return }
  io.out(`${p.file}: ${input.rows} rows, instruments ${input.instruments.join(', ')}, unit ${input.unit}, time ${input.timeFormat}, baseline ${fmt(input.baselineDays)} d`)
  io.out(`grid: ${doc.grid.count} frequencies from ${fmt(doc.grid.minFrequency)} to ${fmt(doc.grid.maxFrequency)} cycles/day (${pg.method})`)
  io.out('')
  io.out(table(doc.peaks.map((k, i) => [i + 1, k.period, k.frequency, k.power, k.fap]), ['#', 'period [d]', 'freq [1/d]', 'power', 'FAP']))
  io.out('')
  io.out('A significant peak is not yet a planet: stellar activity, rotation and the sampling can all make one.')
}

function runFit(p: Parsed, io: CliIo): void {
  const ps = p.flags.get('--planets') ?? 'auto'
  let planets: number | 'auto'
  if (ps === 'auto') planets = 'auto'
  else if (/^\d+$/.test(ps)) planets = Number(ps)
  else throw new UsageError(`--planets must be a non-negative integer or auto, got '${ps}'`)
  const trend = (p.flags.get('--trend') ?? 'auto') as TrendKind | 'auto'
  if (!['auto', 'none', 'linear', 'quadratic'].includes(trend)) throw new UsageError(`--trend must be auto, none, linear or quadratic, got '${trend}'`)
  const mstar = numberFlag(p, '--mstar', (v) => v > 0, 'a positive stellar mass in solar masses')
  const mstarErr = numberFlag(p, '--mstar-err', (v) => v >= 0, 'a non-negative error in solar masses')
  if (mstarErr !== undefined && mstar === undefined) throw new UsageError('--mstar-err needs --mstar')
  const { data, input } = load(p, io)
  const t0 = performance.now()
  const res = searchPlanets(data, { planets, trend })
  const fit = res.fit
  const planetsOut = fit.planets
    .map((pl) => {
      const d = mstar !== undefined ? derivedPlanet(pl, mstar, { mstarErr: mstarErr ?? 0, covariance: pl.covPKe }) : null
      return {
        period: pl.period, K: pl.K, e: pl.e, omegaDeg: pl.omegaDeg, tp: pl.tp, tc: pl.tc,
        msiniMjup: d ? d.msiniMjup : null, msiniMearth: d ? d.msiniMearth : null, aAu: d ? d.aAu : null,
        uncertainty: {
          period: finiteOrNull(pl.uncertainty.period), K: finiteOrNull(pl.uncertainty.K), e: finiteOrNull(pl.uncertainty.e),
          omegaDeg: finiteOrNull(pl.uncertainty.omegaDeg), tp: finiteOrNull(pl.uncertainty.tp),
          msiniMjup: d ? finiteOrNull(d.uncertainty.msiniMjup) : null, aAu: d ? finiteOrNull(d.uncertainty.aAu) : null,
        },
      }
    })
    .sort((a, b) => a.period - b.period)
  const ms = performance.now() - t0
  const doc = {
    input,
    planets: planetsOut,
    instruments: fit.instruments.map((i) => ({ name: i.name, n: i.n, offset: i.offset, jitter: i.jitter, rms: i.rms })),
    trend: fit.trend ? { slope: fit.trend.slope, curvature: fit.trend.curvature, epoch: fit.trend.epoch } : null,
    stats: {
      nPoints: fit.stats.nPoints, nParams: fit.stats.nParams, chi2: fit.stats.chi2, lnL: fit.stats.lnL,
      bic: fit.stats.bic, aic: fit.stats.aic, rms: fit.stats.rms, converged: fit.converged,
    },
    search: res.steps.map((s) => ({ planets: s.planets, bic: s.bic, lnL: s.lnL, nextPeakFap: s.nextPeakFap })),
    timingMs: { total: ms },
  }
  if (p.json) { io.out(JSON.stringify(doc)); return }
  io.out(`${p.file}: ${input.rows} rows, instruments ${input.instruments.join(', ')}, unit ${input.unit}, time ${input.timeFormat}, baseline ${fmt(input.baselineDays)} d`)
  io.out(`model: ${planetsOut.length} Keplerian${planetsOut.length === 1 ? '' : 's'}, trend ${fit.trend ? fit.trend.kind : 'none'}; ${fit.converged ? 'converged' : `NOT converged (${fit.message})`}`)
  io.out('')
  if (planetsOut.length) {
    // values rounded by their uncertainty for reading (the JSON keeps full precision)
    const pm = (v: number | null, e: number | null): string => {
      if (v === null) return '—'
      if (e === null || !(e > 0) || !Number.isFinite(e)) return fmt(v)
      const r = roundByUncertainty(v, e)
      return `${r.value} ± ${r.error}`
    }
    io.out(table(planetsOut.map((q, i) => [
      i + 1, pm(q.period, q.uncertainty.period), pm(q.K, q.uncertainty.K), pm(q.e, q.uncertainty.e),
      pm(q.omegaDeg, q.uncertainty.omegaDeg), pm(q.tp, q.uncertainty.tp), fmt(q.tc),
      pm(q.msiniMjup, q.uncertainty.msiniMjup), pm(q.aAu, q.uncertainty.aAu),
    ]), ['#', 'P [d]', 'K [m/s]', 'e', 'ω [deg]', 'Tp [JD]', 'Tc [JD]', 'M sin i [MJup]', 'a [au]']))
    io.out('')
  }
  io.out(table(doc.instruments.map((i) => [i.name, i.n, i.offset, i.jitter, i.rms]), ['instrument', 'n', 'offset [m/s]', 'jitter [m/s]', 'rms [m/s]']))
  if (doc.trend) io.out(`\ntrend: slope ${fmt(doc.trend.slope)} m/s/d, curvature ${fmt(doc.trend.curvature)} m/s/d², epoch ${fmt(doc.trend.epoch)}`)
  io.out('')
  io.out(`χ² ${fmt(doc.stats.chi2)}  lnL ${fmt(doc.stats.lnL)}  BIC ${fmt(doc.stats.bic)}  AIC ${fmt(doc.stats.aic)}  rms ${fmt(doc.stats.rms)} m/s  (${doc.stats.nPoints} points, ${doc.stats.nParams} parameters)`)
  io.out('')
  io.out(table(doc.search.map((s) => [s.planets, s.bic, s.lnL, s.nextPeakFap]), ['planets', 'BIC', 'lnL', 'next peak FAP']))
}

/** Runs the command line; returns the exit code (0 ok, 2 bad input). */
export function main(argv: string[], io: CliIo = { out: (s) => process.stdout.write(s + '\n'), err: (s) => process.stderr.write(s + '\n') }): number {
  try {
    const p = parseArgs(argv)
    if (p.command === 'periodogram') runPeriodogram(p, io)
    else runFit(p, io)
    return 0
  } catch (e) {
    if (e instanceof UsageError) { io.err(`error: ${e.message}`); return 2 }
    throw e
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  process.exitCode = main(process.argv.slice(2))
}

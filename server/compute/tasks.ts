// The computations the compute pool runs in its worker threads: thin wrappers around the numerical
// core (shared/rv) that take and return structured-clonable plain data.
import {
  periodogram, findPeaks, falseAlarmLevel, windowFunction, fitKeplerians, fitBaseline, planetStarts, searchPlanets, tcToTp,
  type RvData, type FitResult, type PlanetStart, type Prior, type TrendKind, type SearchOptions, type SearchStep, type Keplerian,
} from '../../shared/rv/index.ts'
import type { PeriodogramResult, PlanetSpec } from '../../shared/api/analyses.ts'

/** Largest number of points sent for one plotted curve. */
export const CURVE_POINTS = 4000
export const FAP_LEVELS = [0.1, 0.01, 0.001]

export interface PeriodogramInput {
  t: Float64Array; y: Float64Array; dy: Float64Array
  minPeriod?: number; maxPeriod?: number; oversample?: number
  /**
   * How the instruments' zero points are removed first (needs `instrument`): 'fit' — offsets and
   * jitters of a no-planet maximum-likelihood fit, errors then include the jitters; 'mean' — each
   * instrument's weighted mean; 'none' (default) — as given.
   */
  center?: 'fit' | 'mean' | 'none'
  instrument?: Int32Array
}

function centred(inp: PeriodogramInput): { y: Float64Array; dy: Float64Array } {
  const { t, y, dy, instrument } = inp
  const center = inp.center ?? 'none'
  if (center === 'none') return { y, dy }
  if (!instrument || instrument.length !== t.length) throw new RangeError('instrument must give one index per point when center is fit or mean')
  const nInst = instrument.reduce((m, k) => Math.max(m, k + 1), 0)
  if (center === 'fit') {
    const names = Array.from({ length: nInst }, (_, k) => `i${k}`)
    const base = fitBaseline({ t, y, dy, instrument, instrumentNames: names }, 'none')
    const dyEff = new Float64Array(t.length)
    for (let i = 0; i < t.length; i++) { const s = base.instruments[instrument[i]!]!.jitter; dyEff[i] = Math.sqrt(dy[i]! ** 2 + s * s) }
    return { y: base.residuals, dy: dyEff }
  }
  const sw = new Float64Array(nInst), swy = new Float64Array(nInst)
  for (let i = 0; i < t.length; i++) { const w = 1 / dy[i]! ** 2; sw[instrument[i]!]! += w; swy[instrument[i]!]! += w * y[i]! }
  const out = new Float64Array(t.length)
  for (let i = 0; i < t.length; i++) out[i] = y[i]! - swy[instrument[i]!]! / sw[instrument[i]!]!
  return { y: out, dy }
}

/**
 * Down-samples a curve on a regular frequency grid for plotting: the grid is cut into ≤ max/2
 * equal bins of consecutive points and each bin keeps its minimum and its maximum (in grid
 * order), so every local maximum's top survives and the envelope looks as on the full grid.
 * Returned in increasing period (decreasing frequency).
 */
export function downsampleCurve(frequency: Float64Array, power: Float64Array, max = CURVE_POINTS): { period: number[]; power: number[] } {
  const m = power.length
  const keep: number[] = []
  if (m <= max) for (let k = 0; k < m; k++) keep.push(k)
  else {
    const bins = Math.floor(max / 2)
    for (let b = 0; b < bins; b++) {
      const lo = Math.floor((b * m) / bins), hi = Math.floor(((b + 1) * m) / bins)
      let kMin = lo, kMax = lo
      for (let k = lo; k < hi; k++) {
        if (power[k] < power[kMin]) kMin = k
        if (power[k] > power[kMax]) kMax = k
      }
      if (kMin === kMax) keep.push(kMin)
      else keep.push(Math.min(kMin, kMax), Math.max(kMin, kMax))
    }
  }
  keep.reverse()
  return { period: keep.map((k) => 1 / frequency[k]), power: keep.map((k) => power[k]) }
}

function topMaxima(power: Float64Array, count: number): number[] {
  const idx: number[] = []
  for (let k = 1; k < power.length - 1; k++) if (power[k] > power[k - 1] && power[k] >= power[k + 1]) idx.push(k)
  return idx.sort((a, b) => power[b] - power[a]).slice(0, count)
}

/**
 * Generalised Lomb–Scargle periodogram (Zechmeister & Kürster 2009) with its peaks, Baluev (2008)
 * false-alarm levels and the spectral window (Dawson & Fabrycky 2010), all from shared/rv.
 */
export function periodogramTask(inp: PeriodogramInput): PeriodogramResult {
  const { t } = inp
  const { y, dy } = centred(inp)
  const pg = periodogram(t, y, dy, { minPeriod: inp.minPeriod, maxPeriod: inp.maxPeriod, oversample: inp.oversample })
  const { grid } = pg
  const fmax = grid.f0 + (grid.count - 1) * grid.df
  const peaks = findPeaks(t, y, dy, pg, { count: 10 })
  const win = windowFunction(t, grid)
  const winPeaks = topMaxima(win, 5)
  return {
    grid: { minFrequency: grid.f0, maxFrequency: fmax, count: grid.count, method: pg.method },
    curve: downsampleCurve(pg.frequency, pg.power),
    window: downsampleCurve(pg.frequency, win),
    windowPeaks: winPeaks.map((k) => ({ period: 1 / pg.frequency[k], power: win[k] })),
    peaks: peaks.map((p) => ({
      period: p.period, frequency: p.frequency, power: p.power, fap: p.fap,
      aliases: p.aliases.map((a) => ({ period: a.period, frequency: a.frequency, source: a.source, windowPower: a.windowPower, power: a.power })),
    })),
    fapLevels: FAP_LEVELS.map((fap) => ({ fap, power: falseAlarmLevel(fap, t.length, t, fmax, { dy }) })),
    downsampling: grid.count <= CURVE_POINTS
      ? `full grid (${grid.count} frequencies)`
      : `minimum and maximum of each of ${Math.floor(CURVE_POINTS / 2)} equal bins of the ${grid.count}-frequency grid`,
  }
}

export interface FitInput {
  data: RvData
  planets: PlanetSpec[]
  trend: TrendKind
  maxIterations?: number
}

export type PlainFit = Omit<FitResult, 'history'>
export interface FitOutput { fit: PlainFit; starts: PlanetStart[] }

function orbitOf(p: PlanetStart): Keplerian | null {
  if ((p.tc === undefined && p.tp === undefined) || !Number.isFinite(p.K)) return null
  const e = p.e ?? 0, omega = ((p.omegaDeg ?? 90) * Math.PI) / 180
  return { period: p.period, K: p.K, e, omega, tp: p.tp ?? tcToTp(p.tc!, p.period, e, omega) }
}

/**
 * Fits a model spec: planets given without a phase (tc/tp) or without K get their starting K, e, ω
 * and phase from the exact linear scan of `planetStarts` (given values are kept), with the other
 * planets subtracted; then one ML/MAP
 * fit (`fitKeplerians`, Ford 2006 likelihood with jitters).
 */
export function fitTask(inp: FitInput): FitOutput {
  const { data } = inp
  let epoch = 0
  for (const t of data.t) epoch += t
  epoch /= Math.max(1, data.t.length)
  const starts: PlanetStart[] = inp.planets.map((p) => ({
    period: p.period, K: p.K ?? NaN, e: p.e, omegaDeg: p.omegaDeg, tc: p.tc, tp: p.tp, fix: p.fix,
  }))
  starts.forEach((s, k) => {
    if ((s.tc !== undefined || s.tp !== undefined) && Number.isFinite(s.K)) return
    const others = starts.filter((_, j) => j !== k).map(orbitOf).filter((o): o is Keplerian => o !== null)
    const [best] = planetStarts(data, s.period, { others, trend: inp.trend, epoch, count: 1 })
    if (!best) { if (!Number.isFinite(s.K)) starts[k] = { ...s, K: 1 }; return }
    const hasPhase = s.tc !== undefined || s.tp !== undefined
    const keepShape = hasPhase || (s.e !== undefined && s.omegaDeg !== undefined)
    starts[k] = {
      ...s,
      tc: hasPhase ? s.tc : best.tc, tp: hasPhase ? s.tp : best.tc === undefined ? best.tp : undefined,
      e: keepShape ? s.e : best.e, omegaDeg: keepShape ? s.omegaDeg : best.omegaDeg,
      K: Number.isFinite(s.K) ? s.K : best.K,
    }
  })
  const priors: Prior[] = []
  inp.planets.forEach((p, k) => {
    for (const pr of p.priors ?? []) priors.push({ planet: k, param: pr.param, gaussian: pr.gaussian, uniform: pr.uniform })
  })
  const { history: _h, ...fit } = fitKeplerians(data, { planets: starts, trend: inp.trend, epoch, priors, maxIterations: inp.maxIterations })
  return { fit, starts }
}

export interface SearchInput { data: RvData; options: SearchOptions }
export interface SearchOutput { fit: PlainFit; planets: number; trend: TrendKind; steps: SearchStep[] }

/** The numerical core's automatic planet search (peak → fit → residuals; FAP and BIC stops). */
export function searchTask(inp: SearchInput): SearchOutput {
  const r = searchPlanets(inp.data, inp.options)
  const { history: _h, ...fit } = r.fit
  return { fit, planets: r.planets, trend: r.trend, steps: r.steps }
}

/** Busy-waits `ms` milliseconds (for tests of the pool: time limits, the free event loop). */
export function spinTask(inp: { ms: number; fail?: string }): { spun: number } {
  const end = Date.now() + inp.ms
  let x = 0
  while (Date.now() < end) x++
  if (inp.fail) throw new RangeError(inp.fail)
  return { spun: x }
}

export const TASKS = {
  periodogram: periodogramTask,
  fit: fitTask,
  search: searchTask,
  spin: spinTask,
}
export type TaskName = keyof typeof TASKS
export type TaskInput<K extends TaskName> = Parameters<(typeof TASKS)[K]>[0]
export type TaskOutput<K extends TaskName> = ReturnType<(typeof TASKS)[K]>

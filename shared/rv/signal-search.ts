/**
 * Planet search from the data alone: strongest periodogram peak → Keplerian fit → periodogram of
 * the residuals → next peak, until the next peak's false-alarm probability (Baluev 2008, MNRAS
 * 385, 1279, computed by the periodogram module) exceeds a threshold. The number of planets and
 * the trend (none / linear / quadratic) are then chosen by the Bayesian information criterion
 * (Schwarz 1978): an extra planet must lower BIC by at least 10, "very strong" evidence on the
 * scale of Kass & Raftery 1995; among trends the lowest BIC wins.
 */
import { periodogram, findPeaks } from './periodogram.ts'
import { fitKeplerians, type FitResult, type PlanetStart, type TrendKind } from './orbit-fit.ts'
import { planetStarts, type ScoredStart } from './orbit-start.ts'
import { tcToTp, type Keplerian } from './model.ts'
import { checkRvData, type RvData } from './orbit-data.ts'

export interface SearchOptions {
  /** 'auto' (default): stop by FAP and BIC; a number: exactly that many planets. */
  planets?: number | 'auto'
  trend?: TrendKind | 'auto'
  /** Stop when the next residual peak's FAP exceeds this (default 1e-3). */
  fapThreshold?: number
  /** An extra planet must lower BIC by at least this (default 10). */
  bicThreshold?: number
  /** Largest number of planets tried in 'auto' mode (default 6). */
  maxPlanets?: number
  minPeriod?: number
  maxPeriod?: number
  oversample?: number
  /** Periodogram peaks screened as the period of each new planet (default 6). */
  peaksPerStep?: number
  /** Screened starts refined by the non-linear fit at each step (default 4). */
  startsPerStep?: number
  epoch?: number
}

export interface SearchStep {
  planets: number
  trend: TrendKind
  bic: number
  lnL: number
  /** FAP of the strongest peak in the periodogram of this model's residuals (null if not computed). */
  nextPeakFap: number | null
  /** Period of that peak (days), null if not computed. */
  nextPeakPeriod: number | null
}

export interface SearchResult {
  fit: FitResult
  planets: number
  trend: TrendKind
  steps: SearchStep[]
}

const TRENDS: TrendKind[] = ['none', 'linear', 'quadratic']

function toStarts(fit: FitResult): PlanetStart[] {
  return fit.planets.map((p) => ({ period: p.period, K: p.K, e: p.e, omegaDeg: p.omegaDeg, tc: p.tc }))
}

function toOrbits(fit: FitResult): Keplerian[] {
  return fit.planets.map((p) => ({ period: p.period, K: p.K, e: p.e, omega: p.omega, tp: tcToTp(p.tc, p.period, p.e, p.omega) }))
}

function better(a: FitResult | null, b: FitResult): boolean {
  if (!a) return true
  if (b.status === 'failed') return false
  if (a.status === 'failed') return true
  return b.stats.lnPosterior > a.stats.lnPosterior
}

/** Runs the search; see the module comment. */
export function searchPlanets(data: RvData, opts: SearchOptions = {}): SearchResult {
  checkRvData(data)
  const mode = opts.planets ?? 'auto'
  if (mode !== 'auto' && !(Number.isInteger(mode) && mode >= 0)) throw new RangeError(`planets must be a non-negative integer or 'auto', got ${mode}`)
  const trendOpt = opts.trend ?? 'auto'
  if (trendOpt !== 'auto' && !TRENDS.includes(trendOpt)) throw new RangeError(`trend must be auto, none, linear or quadratic, got ${trendOpt}`)
  const fapThreshold = opts.fapThreshold ?? 1e-3
  const bicThreshold = opts.bicThreshold ?? 10
  const maxPlanets = mode === 'auto' ? (opts.maxPlanets ?? 6) : mode
  const peaksPerStep = opts.peaksPerStep ?? 6
  const startsPerStep = opts.startsPerStep ?? 4
  const trends = trendOpt === 'auto' ? TRENDS : [trendOpt]
  let epoch = opts.epoch
  if (epoch === undefined) { let s = 0; for (const t of data.t) s += t; epoch = s / Math.max(1, data.t.length) }

  const fitsAt: Array<Map<TrendKind, FitResult>> = []
  const base = new Map<TrendKind, FitResult>()
  for (const tr of trends) base.set(tr, fitKeplerians(data, { planets: [], trend: tr, epoch }))
  fitsAt.push(base)
  const bestOf = (m: Map<TrendKind, FitResult>): [TrendKind, FitResult] => {
    let best: [TrendKind, FitResult] | null = null
    for (const [tr, f] of m) if (!best || (f.status !== 'failed' && (best[1].status === 'failed' || f.stats.bic < best[1].stats.bic))) best = [tr, f]
    return best!
  }
  const steps: SearchStep[] = []
  const pushStep = (k: number): SearchStep => {
    const [tr, f] = bestOf(fitsAt[k])
    const s: SearchStep = { planets: k, trend: tr, bic: f.stats.bic, lnL: f.stats.lnL, nextPeakFap: null, nextPeakPeriod: null }
    steps.push(s)
    return s
  }
  let chosen = 0
  let step = pushStep(0)
  for (let k = 0; k < maxPlanets; k++) {
    const [curTrend, cur] = bestOf(fitsAt[k])
    if (data.t.length < cur.stats.nParams + 6) break
    // periodogram of the residuals, errors with the fitted jitters
    const dyEff = new Float64Array(data.t.length)
    for (let i = 0; i < dyEff.length; i++) { const s = cur.instruments[data.instrument[i]].jitter; dyEff[i] = Math.sqrt(data.dy[i] ** 2 + s * s) }
    const pg = periodogram(data.t, cur.residuals, dyEff, { minPeriod: opts.minPeriod, maxPeriod: opts.maxPeriod, oversample: opts.oversample })
    const peaks = findPeaks(data.t, cur.residuals, dyEff, pg, { count: Math.max(peaksPerStep, 1) })
      .sort((a, b) => b.power - a.power)
    if (!peaks.length) break
    step.nextPeakFap = peaks[0].fap
    step.nextPeakPeriod = peaks[0].period
    if (mode === 'auto' && !(peaks[0].fap <= fapThreshold)) break
    const jitter = cur.instruments.map((i) => i.jitter)
    // Screen the top peaks on the (e, ω, phase) grid — a sinusoid's periodogram can rank an
    // eccentric orbit's true period below its harmonics — then refine the best starts.
    const screened: ScoredStart[] = []
    const others = toOrbits(cur)
    peaks.slice(0, peaksPerStep).forEach((pk, rank) => {
      const starts = planetStarts(data, pk.period, { others, jitter, trend: curTrend, epoch, count: 2 })
      // the strongest peak always gets a refinement
      if (rank === 0 && starts.length) starts[0].chi2 = -Infinity
      screened.push(...starts)
    })
    screened.sort((a, b) => a.chi2 - b.chi2)
    let best: FitResult | null = null
    for (const s of screened.slice(0, startsPerStep)) {
      const { chi2, ...start } = s // the screening score is not a fit option
      const f = fitKeplerians(data, { planets: [...toStarts(cur), start], trend: curTrend, epoch, jitterStart: jitter, skipUncertainties: true })
      if (better(best, f)) best = f
    }
    if (!best) break
    const next = new Map<TrendKind, FitResult>()
    for (const tr of trends) {
      // the other trends start from the best orbit found; the winner is refitted with errors
      next.set(tr, fitKeplerians(data, { planets: toStarts(best), trend: tr, epoch, jitterStart: best.instruments.map((i) => i.jitter) }))
    }
    fitsAt.push(next)
    const prevBic = step.bic
    step = pushStep(k + 1)
    if (mode === 'auto' && !(step.bic <= prevBic - bicThreshold)) break
    chosen = k + 1
  }
  if (mode !== 'auto') chosen = Math.min(mode, fitsAt.length - 1)
  const [trend, fit] = bestOf(fitsAt[chosen])
  // the step of the chosen model carries the FAP of its residual peak; compute it if the loop stopped before
  return { fit, planets: chosen, trend, steps }
}

/**
 * Planet search from the data alone.
 *
 * At each step, from the best model so far (k planets, its trend):
 * 1. Screen: the Keplerian periodogram of its residuals with a free offset per instrument at every
 *    trial period (Zechmeister & Kürster 2009, A&A 496, 577, §4; O'Toole et al. 2009, MNRAS 392,
 *    641), from 0.5 d to 5× the baseline, weighted with the quoted errors plus each instrument's
 *    jitter capped at its median quoted error — a jitter fitted without the planet can be inflated
 *    by the planet itself and would hide it. The sinusoid (GLS) peaks of the same residuals are
 *    added as candidates; their Baluev FAP is reported, it is no longer the gate.
 * 2. Global step: the best distinct Keplerian-periodogram cells (long periods, high e, several
 *    offsets included) and GLS peaks each seed an exact (e, phase) scan, and the best starts by
 *    that scan's χ² (`refineStarts`, plus the strongest Keplerian cell) are refined by the
 *    non-linear fit of the whole model with the jitters free (multi-start).
 * 3. Aliases: the best new signal's daily, sidereal, yearly and harmonic partners are each scanned
 *    exactly and the `aliasFits` most promising are fitted in its place (Dawson & Fabrycky 2010,
 *    ApJ 722, 937); the best by likelihood is kept, the runner-up and its ΔlnL are reported.
 * 4. Trends: the new model is refitted with no, linear and quadratic trend.
 * 5. Decision (the stated BIC rule, Schwarz 1978): the (k+1)-planet model is kept when its BIC is
 *    at least `bicThreshold` (10, "very strong", Kass & Raftery 1995) below the k-planet model's
 *    and the false-alarm probability of its likelihood gain over the periods searched is below
 *    `falseAlarm` (0.001; Cumming 2004, ./significance.ts), and the new signal has a warrant
 *    (./warrant.ts: converged, constrained, not a spike through a few points, not carried by one
 *    instrument over fewer than three cycles). Among trends a linear term must lower BIC by the
 *    same 10, and a quadratic one by 10 more.
 * Finally the kept model's signals get their warnings, and a trend is compared with a long-period
 * orbit (and a beyond-baseline orbit with a trend): both fitted, both reported.
 */
import { periodogram, findPeaks } from '../periodogram.ts'
import { fitKeplerians, type FitResult, type PlanetStart, type TrendKind } from '../orbit-fit.ts'
import { planetStarts, type ScoredStart } from '../orbit-start.ts'
import type { Keplerian } from '../model.ts'
import { checkRvData, type RvData } from '../orbit-data.ts'
import { defaultMinPeriod, defaultMaxPeriod } from '../periodogram-core.ts'
import { keplerianPeriodogram, keplerianPeaks, type KeplerianPeriodogramResult } from './keplerian-periodogram.ts'
import { aliasPartners } from './aliases.ts'
import { rejections, warnings, candidateDoubts, type SignalFlag } from './warrant.ts'
import { SEARCH_DEFAULTS } from './defaults.ts'
import { vetOrbits, type ActivityVetting } from '../activity-vetting.ts'
import type { IndicatorColumn } from '../activity-indicators.ts'
import { independentFrequencies, keplerianFap } from './significance.ts'

export interface SearchOptions {
  /** 'auto' (default): by the BIC rule and the warrant checks; a number: exactly that many planets. */
  planets?: number | 'auto'
  trend?: TrendKind | 'auto'
  /** An extra planet (or trend term) must lower BIC by at least this (default 10). */
  bicThreshold?: number
  /** A new planet's likelihood gain must also have a false-alarm probability below this (default 1e-3; ./significance.ts). */
  falseAlarm?: number
  /** Largest number of planets tried in 'auto' mode (default {@link SEARCH_DEFAULTS}.maxPlanets). */
  maxPlanets?: number
  /** Period range searched (d); defaults as the periodogram grid (0.5 d or 0.2 d, to 5× the baseline). */
  minPeriod?: number
  maxPeriod?: number
  /** Oversampling of the GLS grid of the residual periodograms (default 10). */
  oversample?: number
  /** Keplerian-periodogram peaks refined at each step (default 6). */
  keplerianPeaks?: number
  /** GLS peaks of the residuals added as candidates at each step (default 3). */
  sinusoidPeaks?: number
  epoch?: number
  /** Keep each step's Keplerian periodogram in the result (default false; they are large). */
  keepPeriodograms?: boolean
  /**
   * No longer used: detection is judged by the BIC of the Keplerian fit, not the sinusoid FAP.
   * Accepted so old callers keep working; the result carries a flag saying it was ignored.
   */
  fapThreshold?: number
  /**
   * Activity indicators, one value per row (NaN where missing): every kept signal is vetted against
   * them (../activity-vetting.ts). In 'auto' mode a signal labelled an activity candidate is not
   * counted in `planets` (it stays in `fit`, which models every signal); see `activity`.
   */
  indicators?: IndicatorColumn[]
}

/** One alias partner fitted in place of a detected signal. */
export interface AliasTrial { period: number; relation: string; lnL: number; converged: boolean }

export interface SearchStep {
  planets: number
  trend: TrendKind
  bic: number
  lnL: number
  /** FAP of the strongest GLS peak of this model's residuals (null if not computed). */
  nextPeakFap: number | null
  /** Period of that peak (days), null if not computed. */
  nextPeakPeriod: number | null
  /** Best Keplerian-periodogram cell of this model's residuals: period (d), e, Δχ² (screening weights). */
  nextKeplerian: { period: number; e: number; dchi2: number } | null
  /** lnL gain over the previous step's model (null for 0 planets). */
  deltaLnL: number | null
  /** False-alarm probability of that gain over the periods searched (./significance.ts; null for 0 planets). */
  falseAlarm: number | null
}

/** What the search knows about one kept signal. */
export interface SignalReport {
  /** Index in `fit.planets`. */
  planet: number
  period: number
  /** The signal's alias partners fitted in its place (best first), with lnL. */
  aliases: AliasTrial[]
  /** lnL of the chosen period minus the runner-up partner's (null if no partner could be fitted). */
  runnerUpDeltaLnL: number | null
}

/**
 * A signal the BIC and false-alarm rules would keep but whose warrant leaves a doubt
 * (./warrant.ts `candidateDoubts`): reported with its fit and flags, not counted as a planet.
 */
export interface CandidateSignal {
  period: number; K: number; e: number; omegaDeg: number
  /** lnL and BIC of the model with it minus the chosen model's. */
  deltaLnL: number; deltaBic: number
  flags: SignalFlag[]
  /** The model with the candidate added (its last planet). */
  fit: FitResult
}

/** A model fitted as an alternative to the chosen one (e.g. a long orbit in place of a trend). */
export interface AlternativeModel { description: string; planets: number; trend: TrendKind; bic: number; lnL: number; fit: FitResult }

export interface SearchResult {
  fit: FitResult
  planets: number
  trend: TrendKind
  steps: SearchStep[]
  signals: SignalReport[]
  /** Rejections, warnings and notes, each with a readable message. */
  flags: SignalFlag[]
  alternatives: AlternativeModel[]
  /** Flagged candidates (auto mode): signals that passed the BIC and false-alarm rules but not the warrant's doubts. */
  candidates: CandidateSignal[]
  /** The options the search ran with, defaults filled in. */
  settings: { minPeriod: number; maxPeriod: number; bicThreshold: number; falseAlarm: number; maxPlanets: number; trend: TrendKind | 'auto'; planets: number | 'auto' }
  /** Keplerian periodogram of each step's residuals (only with `keepPeriodograms`). */
  periodograms?: KeplerianPeriodogramResult[]
  /** With `indicators`: each signal of `fit` vetted; `planets`/`activity` list the indices of `fit.planets`. */
  activity?: ActivityVetting & { planets: number[]; activity: number[] }
}

const TRENDS: TrendKind[] = ['none', 'linear', 'quadratic']

const toStart = (p: FitResult['planets'][number]): PlanetStart => ({ period: p.period, K: p.K, e: p.e, omegaDeg: p.omegaDeg, tc: p.tc })
const toOrbit = (p: FitResult['planets'][number]): Keplerian => ({ period: p.period, K: p.K, e: p.e, omega: p.omega, tp: p.tp })

function usable(f: FitResult | null | undefined): f is FitResult {
  return !!f && f.status !== 'failed' && Number.isFinite(f.stats.lnL)
}

/** The trend of a set of fits by the stated rule: each extra trend term must lower BIC by `thr`. */
function chooseTrend(fits: Map<TrendKind, FitResult>, thr: number): [TrendKind, FitResult] | null {
  let best: [TrendKind, FitResult] | null = null
  for (const tr of TRENDS) {
    const f = fits.get(tr)
    if (!usable(f)) continue
    if (!best || f.stats.bic <= best[1].stats.bic - thr * (TRENDS.indexOf(tr) - TRENDS.indexOf(best[0]))) best = [tr, f]
  }
  return best
}

/** Per instrument: the fitted jitter capped at `cap` × the instrument's median quoted error. */
function screeningJitter(data: RvData, fit: FitResult, cap: number): number[] {
  return fit.instruments.map((ins, k) => {
    const errs: number[] = []
    for (let i = 0; i < data.t.length; i++) if (data.instrument[i] === k) errs.push(data.dy[i])
    errs.sort((a, b) => a - b)
    const med = errs.length ? errs[Math.floor(errs.length / 2)] : 0
    return Math.min(ins.jitter, cap * med)
  })
}

interface Ctx {
  data: RvData; epoch: number; minPeriod: number; maxPeriod: number; baseline: number
  trends: TrendKind[]; oversample?: number; kPeaks: number; sPeaks: number; startsPerPeriod: number
  refine: number; aliasFits: number; screenIter: number
}

/**
 * A partner whose capped screening fit is this far (lnL) below the detected signal is not continued:
 * its ΔlnL is then that of the capped fit (its trial says converged: false, and the message says so).
 */
const PARTNER_REACH = 25

/** A screening fit that stopped at its iteration cap, continued to convergence from where it stopped. */
function finish(ctx: Ctx, f: FitResult, trend: TrendKind): FitResult {
  if (f.status !== 'max-iterations') return f
  const g = fitFrom(ctx, f.planets.map(toStart), trend, f.instruments.map((i) => i.jitter), true)
  return usable(g) && g.stats.lnL >= f.stats.lnL ? g : f
}

/** Fit of the model from starts with the jitters free; never throws for a bad start. */
function fitFrom(ctx: Ctx, planets: PlanetStart[], trend: TrendKind, jitterStart: number[] | undefined, skipUnc: boolean, maxIterations?: number): FitResult | null {
  try {
    return fitKeplerians(ctx.data, { planets, trend, epoch: ctx.epoch, jitterStart, skipUncertainties: skipUnc, maxIterations })
  } catch {
    return null
  }
}

/** Best new planet on top of `cur`: screening, multi-start, alias resolution. */
function nextPlanet(ctx: Ctx, cur: FitResult, curTrend: TrendKind, cap: number, step: SearchStep, keep: KeplerianPeriodogramResult[] | null):
  { fit: FitResult; aliases: AliasTrial[] } | null {
  const { data } = ctx
  const n = data.t.length
  const jit = screeningJitter(data, cur, cap)
  const kp = keplerianPeriodogram(data, { y: cur.residuals, jitter: jit, minPeriod: ctx.minPeriod, maxPeriod: ctx.maxPeriod })
  if (keep) keep.push(kp)
  const kPeaks = keplerianPeaks(kp, ctx.kPeaks, 3)
  if (kPeaks.length) step.nextKeplerian = { period: kPeaks[0].period, e: kPeaks[0].e, dchi2: kPeaks[0].dchi2 }
  // GLS of the residuals with the screening weights (reported FAP; extra candidates)
  const dyEff = new Float64Array(n)
  for (let i = 0; i < n; i++) dyEff[i] = Math.hypot(data.dy[i], jit[data.instrument[i]])
  const candPeriods: number[] = kPeaks.map((p) => p.period)
  try {
    const pg = periodogram(data.t, cur.residuals, dyEff, { minPeriod: ctx.minPeriod, maxPeriod: ctx.maxPeriod, oversample: ctx.oversample })
    const peaks = findPeaks(data.t, cur.residuals, dyEff, pg, { count: Math.max(ctx.sPeaks, 1) })
    if (peaks.length) { step.nextPeakFap = peaks[0].fap; step.nextPeakPeriod = peaks[0].period }
    for (const pk of peaks.slice(0, ctx.sPeaks)) candPeriods.push(pk.period)
  } catch { /* too few points for the GLS: the Keplerian candidates remain */ }
  if (!candPeriods.length) return null
  const others = cur.planets.map(toOrbit)
  const curStarts = cur.planets.map(toStart)
  const jStart = cur.instruments.map((i, k) => Math.max(jit[k], 0))
  // exact (e, phase) scan at each candidate period; the Keplerian cells' own ranking is kept
  const seen: number[] = []
  const starts: ScoredStart[] = []
  for (const P of candPeriods) {
    if (seen.some((q) => Math.abs(1 / q - 1 / P) < 0.5 / ctx.baseline)) continue
    seen.push(P)
    starts.push(...planetStarts(data, P, { others, jitter: jit, trend: curTrend, epoch: ctx.epoch, count: ctx.startsPerPeriod }))
  }
  // refine the best starts by their exact screening χ² (the strongest Keplerian cell always)
  const first = starts[0]
  starts.sort((a, b) => a.chi2 - b.chi2)
  const refine = starts.slice(0, ctx.refine)
  if (first && !refine.includes(first)) refine.push(first)
  let best: FitResult | null = null
  for (const s of refine) {
    const { chi2, ...start } = s
    void chi2
    const f = fitFrom(ctx, [...curStarts, start], curTrend, jStart, true, ctx.screenIter)
    if (usable(f) && (!best || f.stats.lnL > best.stats.lnL)) best = f
  }
  if (best) best = finish(ctx, best, curTrend)
  if (!best) return null
  // alias partners of the new signal, each fitted in its place
  const newP = best.planets[best.planets.length - 1]
  const trials: AliasTrial[] = [{ period: newP.period, relation: 'detected', lnL: best.stats.lnL, converged: best.status === 'converged' }]
  const partnerOthers = best.planets.slice(0, -1)
  // every partner is screened exactly; the `aliasFits` most promising are fitted in full
  const partners = aliasPartners(newP.period, { minPeriod: ctx.minPeriod, maxPeriod: ctx.maxPeriod, minSeparation: 0.5 / ctx.baseline })
    .map((a) => ({ a, s: planetStarts(data, a.period, { others: partnerOthers.map(toOrbit), jitter: jit, trend: curTrend, epoch: ctx.epoch, count: 1 })[0] }))
    .filter((x) => x.s !== undefined)
    .sort((u, v) => u.s.chi2 - v.s.chi2)
    .slice(0, ctx.aliasFits)
  // screening fits (capped) of every partner; the best partner is continued to convergence, so the
  // runner-up's ΔlnL is that of a converged fit (a partner left at its cap says converged: false)
  const fitted: Array<{ f: FitResult; relation: string }> = []
  for (const { a, s: ps } of partners) {
    const { chi2, ...start } = ps
    void chi2
    const f = fitFrom(ctx, [...partnerOthers.map(toStart), start], curTrend, best.instruments.map((i) => i.jitter), true, ctx.screenIter)
    if (!usable(f)) continue
    // the fit may walk back to the detected period: then it is not a distinct partner
    if (Math.abs(1 / f.planets[f.planets.length - 1].period - 1 / newP.period) < 0.5 / ctx.baseline) continue
    fitted.push({ f, relation: a.relation })
  }
  fitted.sort((u, v) => v.f.stats.lnL - u.f.stats.lnL)
  for (const [q, { f: f0, relation }] of fitted.entries()) {
    let f = f0
    // the best partner is continued to convergence when it is within reach of the detected signal
    if (q === 0 && f0.stats.lnL > best.stats.lnL - PARTNER_REACH) {
      f = finish(ctx, f0, curTrend)
      if (Math.abs(1 / f.planets[f.planets.length - 1].period - 1 / newP.period) < 0.5 / ctx.baseline) continue
    }
    trials.push({ period: f.planets[f.planets.length - 1].period, relation, lnL: f.stats.lnL, converged: f.status === 'converged' })
    if (f.stats.lnL > best.stats.lnL) best = f
  }
  trials.sort((a, b) => b.lnL - a.lnL)
  return { fit: best, aliases: trials }
}

/** Runs the search; see the module comment. */
export function searchPlanets(data: RvData, opts: SearchOptions = {}): SearchResult {
  checkRvData(data)
  const D = SEARCH_DEFAULTS
  const mode = opts.planets ?? D.planets
  if (mode !== 'auto' && !(Number.isInteger(mode) && mode >= 0)) throw new RangeError(`planets must be a non-negative integer or 'auto', got ${mode}`)
  const trendOpt = opts.trend ?? D.trend
  if (trendOpt !== 'auto' && !TRENDS.includes(trendOpt)) throw new RangeError(`trend must be auto, none, linear or quadratic, got ${trendOpt}`)
  const bicThreshold = opts.bicThreshold ?? D.bicThreshold
  if (!(bicThreshold >= 0)) throw new RangeError(`bicThreshold must be >= 0, got ${bicThreshold}`)
  const maxPlanets = mode === 'auto' ? (opts.maxPlanets ?? D.maxPlanets) : mode
  if (!(Number.isInteger(maxPlanets) && maxPlanets >= 0)) throw new RangeError(`maxPlanets must be a non-negative integer, got ${maxPlanets}`)
  let tmin = Infinity, tmax = -Infinity, tsum = 0
  for (const t of data.t) { tmin = Math.min(tmin, t); tmax = Math.max(tmax, t); tsum += t }
  const baseline = tmax - tmin
  const minPeriod = opts.minPeriod ?? defaultMinPeriod(data.t)
  const maxPeriod = opts.maxPeriod ?? defaultMaxPeriod(baseline)
  if (!(minPeriod > 0)) throw new RangeError(`minPeriod must be > 0, got ${minPeriod}`)
  if (!(maxPeriod > minPeriod)) throw new RangeError(`maxPeriod (${maxPeriod}) must exceed minPeriod (${minPeriod}); the baseline is ${baseline} d`)
  const epoch = opts.epoch ?? tsum / Math.max(1, data.t.length)
  const trends = trendOpt === 'auto' ? TRENDS : [trendOpt]
  const ctx: Ctx = {
    data, epoch, minPeriod, maxPeriod, baseline, trends, oversample: opts.oversample,
    kPeaks: opts.keplerianPeaks ?? D.keplerianPeaks, sPeaks: opts.sinusoidPeaks ?? D.sinusoidPeaks, startsPerPeriod: D.startsPerPeriod,
    refine: D.refineStarts, aliasFits: D.aliasFits, screenIter: D.screeningIterations,
  }
  const falseAlarm = opts.falseAlarm ?? D.falseAlarm
  if (!(falseAlarm > 0 && falseAlarm <= 1)) throw new RangeError(`falseAlarm must be in (0, 1], got ${falseAlarm}`)
  const nFreq = independentFrequencies(baseline, minPeriod, maxPeriod)
  const flags: SignalFlag[] = []
  if (opts.fapThreshold !== undefined) {
    flags.push({ kind: 'fap-threshold-unused', severity: 'info', period: null, instrument: null, message: 'fapThreshold was given but is not used: a signal is kept by the BIC of its Keplerian fit, its false-alarm probability (option falseAlarm) and its warrant checks, not by the sinusoid FAP.' })
  }
  const keep = opts.keepPeriodograms ? [] as KeplerianPeriodogramResult[] : null
  const fitAll = (planets: PlanetStart[], jitterStart: number[] | undefined): Map<TrendKind, FitResult> => {
    const m = new Map<TrendKind, FitResult>()
    for (const tr of trends) { const f = fitFrom(ctx, planets, tr, jitterStart, false); if (f) m.set(tr, f) }
    return m
  }
  const chosenAt: Array<[TrendKind, FitResult]> = []
  const signalsAt: AliasTrial[][] = []
  const steps: SearchStep[] = []
  const candidates: CandidateSignal[] = []
  const first = chooseTrend(fitAll([], undefined), bicThreshold)
  if (!first) throw new RangeError('the data cannot be fitted even without planets (too few points per instrument?)')
  chosenAt.push(first)
  steps.push({ planets: 0, trend: first[0], bic: first[1].stats.bic, lnL: first[1].stats.lnL, nextPeakFap: null, nextPeakPeriod: null, nextKeplerian: null, deltaLnL: null, falseAlarm: null })
  let chosen = 0
  for (let k = 0; k < maxPlanets; k++) {
    const [curTrend, cur] = chosenAt[k]
    if (data.t.length < cur.stats.nParams + 6) break
    const step = steps[k]
    const found = nextPlanet(ctx, cur, curTrend, D.screeningJitterCap, step, keep)
    if (!found) break
    // refit with each trend from the best orbits; also from the found fit's own trend result
    const fits = fitAll(found.fit.planets.map(toStart), found.fit.instruments.map((i) => i.jitter))
    const next = chooseTrend(fits, bicThreshold)
    if (!next) break
    chosenAt.push(next)
    signalsAt.push(found.aliases)
    const dLnL = next[1].stats.lnL - chosenAt[k][1].stats.lnL
    const fa = keplerianFap(dLnL, nFreq)
    steps.push({ planets: k + 1, trend: next[0], bic: next[1].stats.bic, lnL: next[1].stats.lnL, nextPeakFap: null, nextPeakPeriod: null, nextKeplerian: null, deltaLnL: dLnL, falseAlarm: fa })
    if (mode !== 'auto') { chosen = k + 1; continue }
    if (!(next[1].stats.bic <= chosenAt[k][1].stats.bic - bicThreshold)) break
    if (!(fa <= falseAlarm)) {
      const p = next[1].planets[k]
      flags.push({
        kind: 'false-alarm', severity: 'rejection', period: p.period, instrument: null,
        message: `The ${p.period.toPrecision(4)}-d signal was not kept: its likelihood gain (ΔlnL = ${dLnL.toFixed(1)}) has a false-alarm probability of ${fa.toPrecision(2)} over the ${Math.round(nFreq)} independent periods searched (law calibrated on simulated noise; above ${falseAlarm}).`,
      })
      break
    }
    const rej = rejections(data, next[1], k, D.oneInstrumentShare) // the new planet is the last one
    if (rej.length) { flags.push(...rej); break }
    const doubts = candidateDoubts(data, next[1], k, bicThreshold)
    if (doubts.length) {
      const p = next[1].planets[k]
      candidates.push({ period: p.period, K: p.K, e: p.e, omegaDeg: p.omegaDeg, deltaLnL: dLnL, deltaBic: next[1].stats.bic - chosenAt[k][1].stats.bic, flags: doubts, fit: next[1] })
      flags.push(...doubts)
      break
    }
    chosen = k + 1
  }
  if (mode !== 'auto') chosen = Math.min(mode, chosenAt.length - 1)
  const [trend, fit] = chosenAt[chosen]
  // reports of the kept signals
  const signals: SignalReport[] = fit.planets.map((p, j) => {
    const trials = signalsAt[j] ?? []
    const runner = trials.find((t) => Math.abs(1 / t.period - 1 / p.period) >= 0.5 / baseline)
    const top = trials[0]
    return { planet: j, period: p.period, aliases: trials, runnerUpDeltaLnL: runner && top ? top.lnL - runner.lnL : null }
  })
  for (const s of signals) {
    const runner = s.aliases.find((t) => Math.abs(1 / t.period - 1 / s.period) >= 0.5 / baseline)
    if (runner && s.runnerUpDeltaLnL !== null) {
      flags.push({
        kind: 'alias-runner-up', severity: s.runnerUpDeltaLnL < 5 ? 'warning' : 'info', period: s.period, instrument: null,
        message: `${s.period.toPrecision(5)} d is preferred to its alias ${runner.period.toPrecision(5)} d (${runner.relation}) by ΔlnL = ${s.runnerUpDeltaLnL.toFixed(1)}${runner.converged ? '' : ' (the partner\'s fit stopped at its iteration cap, far below: the gap is approximate)'}${s.runnerUpDeltaLnL < 5 ? ': not decisive, check the alias' : ''}.`,
      })
    }
  }
  flags.push(...warnings(data, fit, { oneInstrumentShare: D.oneInstrumentShare, jitterPeerFactor: D.jitterPeerFactor }))
  const alternatives = trendAlternatives(ctx, fit, trend, bicThreshold, flags)
  const activity = opts.indicators?.length ? vetOrbits(data, fit.planets.map(toOrbit), opts.indicators) : undefined
  return {
    fit, planets: activity && mode === 'auto' ? activity.planets.length : chosen, trend, steps, signals, flags, alternatives, candidates,
    ...(activity ? { activity } : {}),
    settings: { minPeriod, maxPeriod, bicThreshold, falseAlarm, maxPlanets, trend: trendOpt, planets: mode },
    ...(keep ? { periodograms: keep } : {}),
  }
}

/**
 * A trend and a long-period orbit can stand in for each other. With a trend in the chosen model,
 * fit the model with the trend replaced by one more Keplerian seeded from the long-period cells
 * (periods from half the baseline to the top of the range); with a planet beyond the baseline and
 * no trend, fit the model with that planet replaced by a quadratic trend. Both are reported.
 */
function trendAlternatives(ctx: Ctx, fit: FitResult, trend: TrendKind, thr: number, flags: SignalFlag[]): AlternativeModel[] {
  const out: AlternativeModel[] = []
  const { data } = ctx
  if (trend !== 'none') {
    const base = fitFrom(ctx, fit.planets.map(toStart), 'none', fit.instruments.map((i) => i.jitter), true)
    if (usable(base)) {
      const kp = keplerianPeriodogram(data, { y: base.residuals, jitter: base.instruments.map(() => 0), minPeriod: Math.max(ctx.minPeriod, ctx.baseline / 2), maxPeriod: ctx.maxPeriod })
      let best: FitResult | null = null
      for (const pk of keplerianPeaks(kp, 3, 2)) {
        for (const s of planetStarts(data, pk.period, { others: base.planets.map(toOrbit), epoch: ctx.epoch, count: 2 })) {
          const { chi2, ...start } = s
          void chi2
          const f = fitFrom(ctx, [...fit.planets.map(toStart), start], 'none', fit.instruments.map((i) => i.jitter), false)
          if (usable(f) && (!best || f.stats.lnL > best.stats.lnL)) best = f
        }
      }
      if (best) {
        const lp = best.planets[best.planets.length - 1]
        out.push({ description: `the ${trend} trend replaced by a ${lp.period.toFixed(0)}-d orbit`, planets: best.planets.length, trend: 'none', bic: best.stats.bic, lnL: best.stats.lnL, fit: best })
        flags.push({
          kind: 'trend-or-long-orbit', severity: best.stats.bic < fit.stats.bic + thr ? 'warning' : 'info', period: lp.period, instrument: null,
          message: `The ${trend} trend could be a long-period orbit: with a ${lp.period.toFixed(0)}-d Keplerian (K = ${lp.K.toFixed(1)} m/s, e = ${lp.e.toFixed(2)}) instead, BIC is ${(best.stats.bic - fit.stats.bic).toFixed(1)} relative to the chosen model (${best.stats.bic < fit.stats.bic + thr ? 'not decisively worse' : 'clearly worse'}).`,
        })
      }
    }
  } else {
    fit.planets.forEach((p, j) => {
      if (!(p.period > ctx.baseline)) return
      const rest = fit.planets.filter((_, q) => q !== j).map(toStart)
      const f = fitFrom(ctx, rest, 'quadratic', fit.instruments.map((i) => i.jitter), false)
      if (!usable(f)) return
      out.push({ description: `the ${p.period.toFixed(0)}-d orbit replaced by a quadratic trend`, planets: rest.length, trend: 'quadratic', bic: f.stats.bic, lnL: f.stats.lnL, fit: f })
      flags.push({
        kind: 'trend-or-long-orbit', severity: f.stats.bic < fit.stats.bic + thr ? 'warning' : 'info', period: p.period, instrument: null,
        message: `The ${p.period.toFixed(0)}-d orbit is longer than the baseline; a quadratic trend in its place gives BIC ${(f.stats.bic - fit.stats.bic >= 0 ? '+' : '')}${(f.stats.bic - fit.stats.bic).toFixed(1)} relative to the chosen model (${f.stats.bic < fit.stats.bic + thr ? 'not decisively worse' : 'clearly worse'}).`,
      })
    })
  }
  return out
}

/**
 * From a model as the user writes it (planets by period, optional K, e, ω, phase, fixed
 * parameters, per-planet priors) to the fitter's input: starts for every planet and one flat
 * prior list. The one home for the CLI, the server's fit task and the browser.
 */
import { planetStarts } from './orbit-start.ts'
import { fitKeplerians } from './orbit-fit.ts'
import { elementsOfStart, keplerianOf } from './planet-elements.ts'
import type { FitOptions, FitResult, PlanetParam, PlanetStart, Prior, TrendKind } from './orbit-fit-types.ts'
import type { RvData } from './orbit-data.ts'
import type { Keplerian } from './model.ts'

/** A prior attached to one planet of a spec (the planet is implied). */
export interface PlanetPrior {
  param: PlanetParam
  gaussian?: { mu: number; sigma: number }
  uniform?: { min: number; max: number }
}

/** One planet of a model spec: only the period is required. */
export interface PlanetSpecInput {
  period: number
  K?: number
  e?: number
  omegaDeg?: number
  tc?: number
  tp?: number
  fix?: PlanetParam[]
  priors?: PlanetPrior[]
}

/** Mean time of the data: the default epoch of the trend and of the reported Tc/Tp. */
export function meanEpoch(t: ArrayLike<number>): number {
  let s = 0
  for (let i = 0; i < t.length; i++) s += t[i]
  return s / Math.max(1, t.length)
}

/** The spec's per-planet priors as one list for the fitter. */
export function flattenPriors(planets: PlanetSpecInput[]): Prior[] {
  const priors: Prior[] = []
  planets.forEach((p, k) => {
    for (const pr of p.priors ?? []) priors.push({ planet: k, param: pr.param, gaussian: pr.gaussian, uniform: pr.uniform })
  })
  return priors
}

/**
 * Starts for the fitter. A planet given without a phase (tc/tp) or without K gets its starting K,
 * e, ω and phase from the exact linear scan of `planetStarts` at its period (with the other
 * planets that have full elements subtracted); values the user gave are kept (e and ω are kept
 * only when both are given or a phase is given). A planet the scan cannot score starts at K = 1.
 */
export function startsFromSpec(data: RvData, planets: PlanetSpecInput[], trend: TrendKind, epoch = meanEpoch(data.t)): PlanetStart[] {
  const starts: PlanetStart[] = planets.map((p) => ({
    period: p.period, K: p.K ?? NaN, e: p.e, omegaDeg: p.omegaDeg, tc: p.tc, tp: p.tp, fix: p.fix,
  }))
  starts.forEach((s, k) => {
    if ((s.tc !== undefined || s.tp !== undefined) && Number.isFinite(s.K)) return
    const others: Keplerian[] = []
    starts.forEach((o, j) => { const el = j === k ? null : elementsOfStart(o); if (el) others.push(keplerianOf(el)) })
    // a held e is scanned at its own value only; held values are never replaced by the scan's
    const eHeld = s.fix?.includes('e') && s.e !== undefined
    const [best] = planetStarts(data, s.period, { others, trend, epoch, count: 1, ...(eHeld ? { eccentricities: s.e! > 0 ? [s.e!] : [] } : {}) })
    if (!best) { if (!Number.isFinite(s.K)) starts[k] = { ...s, K: 1 }; return }
    const hasPhase = s.tc !== undefined || s.tp !== undefined
    const keepShape = hasPhase || (s.e !== undefined && s.omegaDeg !== undefined)
    starts[k] = {
      ...s,
      tc: hasPhase ? s.tc : best.tc, tp: hasPhase ? s.tp : best.tc === undefined ? best.tp : undefined,
      e: keepShape || eHeld ? s.e : best.e,
      omegaDeg: keepShape || (s.fix?.includes('omegaDeg') && s.omegaDeg !== undefined) ? s.omegaDeg : best.omegaDeg,
      K: Number.isFinite(s.K) ? s.K : best.K,
    }
  })
  return starts
}

export interface SpecFitOptions {
  trend: TrendKind
  maxIterations?: number
  epoch?: number
  jitter?: FitOptions['jitter']
}

/** Fits a model spec: starts from {@link startsFromSpec}, flattened priors, one `fitKeplerians` call. */
export function fitSpec(data: RvData, planets: PlanetSpecInput[], opts: SpecFitOptions): { fit: FitResult; starts: PlanetStart[] } {
  const epoch = opts.epoch ?? meanEpoch(data.t)
  const starts = startsFromSpec(data, planets, opts.trend, epoch)
  const fit = fitKeplerians(data, {
    planets: starts, trend: opts.trend, epoch, priors: flattenPriors(planets), maxIterations: opts.maxIterations, jitter: opts.jitter,
  })
  return { fit, starts }
}

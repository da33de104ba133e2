/**
 * Planet search that models stellar activity instead of only flagging it ("planets + GP").
 *
 * 1. The white-noise search (`searchPlanets`, with the indicators) runs first: its signals are vetted
 *    (activity-vetting.ts) and those labelled activity become activity candidates.
 * 2. The rotation period: the user's value, or else the strongest significant peak (FAP below the
 *    vetting's `peakFap`) over every indicator's periodogram; its prior 1σ is the peak's half width in
 *    period, P²/T (a peak is about 1/T wide in frequency; common practice), at least 5 % of P. With
 *    neither, there is nothing to tie a GP to and the white-noise search is the answer, unchanged.
 * 3. When the rotation period comes from an indicator, the GP is first trained on that indicator
 *    (`trainGpOnIndicator`: it has no planet in it) and the search decides with that kernel shape
 *    (period, decay time, shape) held fixed, amplitude and jitters fitted on the velocities: a GP free
 *    to reshape itself on the velocities alone stretches its P/2 harmonic over a planet near it (on the
 *    seeded spotted star the 12.3-d planet then gains only 3 in BIC instead of 14). With the user's
 *    period only, every hyperparameter is free.
 *    A GP (rotation kernel by default, O(N) solver) is fitted with no planet (`fitWithGp`); then, up to
 *    `maxPlanets` times: the residual periodogram under the GP covariance (gp-periodogram.ts) gives the
 *    `candidates` strongest peaks — a peak at the rotation period or a harmonic of it (P/2, P/3, 2P,
 *    within one peak width) is activity the GP should carry and is skipped, with a note — each peak
 *    seeds a circular orbit and the whole "planets + GP" model is refitted; the best is kept when its
 *    BIC is at least `bicThreshold` (10, Kass & Raftery 1995) below the model without it.
 * 4. The kept planets are vetted against the indicators (their velocity curves' correlation); a planet
 *    that follows an indicator is moved to the activity candidates and the model refitted without it.
 * 5. The final "planets + GP" model is refitted with every hyperparameter free (priors as
 *    `fitWithGp` states them; P_rot's centre and 1σ as above), errors from its Laplace approximation.
 *    "Planets + white noise" with the same planets is fitted for the model comparison: both BICs are
 *    returned and the noise model with the lower BIC is `preferred`.
 */
import { fitKeplerians, type FitResult } from './orbit-fit.ts'
import { baseline, checkRvData, type RvData } from './orbit-data.ts'
import { searchPlanets, type SearchOptions, type SearchResult } from './planet-search/search.ts'
import { SEARCH_DEFAULTS } from './planet-search/defaults.ts'
import { vetOrbits, VETTING_DEFAULTS } from './activity-vetting.ts'
import { periodRelation } from './peak-coincidence.ts'
import type { IndicatorColumn, IndicatorPeak } from './activity-indicators.ts'
import { fitWithGp, trainGpOnIndicator, type GpFitResult, type GpHyperSpec, type GpPlanetFit } from './gp-fit.ts'
import type { KernelShape } from './gp/kernels.ts'
import { gpResidualPeriodogram } from './gp-periodogram.ts'
import type { PlanetStart } from './orbit-fit-types.ts'

export interface ActivitySearchOptions {
  /** Activity indicators, one value per row (NaN where missing). */
  indicators?: IndicatorColumn[]
  /** The user's rotation period (d) and its 1σ (default 10 %); wins over the indicators'. */
  rotationPeriod?: { value: number; sigma?: number } | null
  /** GP kernel (default 'rotation', the O(N) path). */
  kernel?: GpHyperSpec['kernel']
  /** Give each instrument its own GP amplitude (default false). */
  perInstrumentAmplitude?: boolean
  /** Largest number of planets on top of the GP (default 3). */
  maxPlanets?: number
  /** An extra planet must lower the GP model's BIC by this (default SEARCH_DEFAULTS.bicThreshold = 10). */
  bicThreshold?: number
  /** GP-residual periodogram peaks tried per step (default 3). */
  candidates?: number
  /** Period range searched (d); the periodogram grid's defaults otherwise. */
  minPeriod?: number
  maxPeriod?: number
  /** Options of the white-noise search (the indicators are added). */
  search?: Omit<SearchOptions, 'indicators'>
  /** A white-noise search already run on the same data with the same indicators (skips step 1). */
  whiteSearch?: SearchResult
}

export interface ActivityCandidate {
  period: number
  /** 'velocities': a velocity signal vetted as activity; 'indicator': the rotation seen in an indicator; 'user': the user's rotation period. */
  source: 'velocities' | 'indicator' | 'user'
  /** The evidence in plain words. */
  evidence: string[]
}

/** A hyperparameter with its 1σ (NaN where fixed or undetermined) and unit (astropy spelling; '' dimensionless). */
export interface GpQuantity { value: number; error: number; unit: string }

export interface GpHyperparameters {
  kernel: GpHyperSpec['kernel']
  rotationPeriod: GpQuantity
  decayTime: GpQuantity
  /** Rotation kernel: share of the P/2 harmonic in [0, 1]; quasi-periodic: Γ. */
  shape: GpQuantity
  /** One amplitude for all instruments, or one per instrument (m/s). */
  amplitude: Array<GpQuantity & { instrument: string | null }>
  jitter: Array<GpQuantity & { instrument: string }>
  priors: string[]
}

export interface ActivitySearchStep { planets: number; bic: number; lnL: number; tried: number[]; kept: number | null }

export interface ActivitySearchResult {
  /** The noise model with the lower BIC for the planets found ('white' when no rotation period is known). */
  preferred: 'white' | 'gp'
  /** Planets of the preferred model, each with its errors. */
  planets: GpPlanetFit[]
  activity: ActivityCandidate[]
  /** The rotation period the GP was tied to, its prior 1σ and where it came from; null without one. */
  rotation: { period: number; sigma: number; source: string } | null
  gp: GpHyperparameters | null
  gpFit: GpFitResult | null
  /** The same planets with white noise (null when there are none to compare and no GP was fitted). */
  whiteFit: FitResult | null
  whiteSearch: SearchResult
  /** BIC of "planets + white noise" (same planets), of "planets + GP", and of the white-noise search's own model. */
  bic: { white: number; gp: number | null; whiteSearch: number }
  steps: ActivitySearchStep[]
  cautions: string[]
}

export const ACTIVITY_SEARCH_DEFAULTS = Object.freeze({ maxPlanets: 3, candidates: 3, kernel: 'rotation' as const, minSigmaFraction: 0.05 })

const fmtP = (p: number): string => (p >= 100 ? p.toFixed(0) : p >= 10 ? p.toFixed(1) : p.toFixed(2))
const fmtFap = (f: number): string => (f < 1e-3 ? f.toExponential(0) : f.toPrecision(2))

function planetOfWhite(p: FitResult['planets'][number]): GpPlanetFit {
  return {
    period: p.period, K: p.K, e: p.e, omegaDeg: p.omegaDeg, tc: p.tc, tp: p.tp,
    uncertainty: { period: p.uncertainty.period, K: p.uncertainty.K, e: p.uncertainty.e, tc: p.uncertainty.tc },
  }
}

const startOf = (p: GpPlanetFit | FitResult['planets'][number]): PlanetStart => ({ period: p.period, K: p.K, e: p.e, omegaDeg: p.omegaDeg, tc: p.tc })

/** The hyperparameters of a GP fit with units (for the CLI's --json, the server and reports). */
export function gpHyperparameters(fit: GpFitResult, instrumentNames: string[]): GpHyperparameters {
  const k = fit.noise.kernel
  const u = fit.noiseUncertainty
  const shape = k.kind === 'rotation' ? k.shape : k.roughness
  const amps = fit.noise.amplitude
  return {
    kernel: k.kind,
    rotationPeriod: { value: k.period, error: u.period, unit: 'd' },
    decayTime: { value: k.decayTime, error: u.decayTime, unit: 'd' },
    shape: { value: shape, error: u.shape, unit: '' },
    amplitude: amps.map((a, i) => ({ instrument: amps.length === 1 ? null : instrumentNames[i], value: a, error: u.amplitude[i] ?? NaN, unit: 'm / s' })),
    jitter: fit.noise.jitter.map((j, i) => ({ instrument: instrumentNames[i], value: j, error: NaN, unit: 'm / s' })),
    priors: fit.priors,
  }
}

/** The strongest significant indicator peak (lowest FAP) over every indicator, or null. */
function rotationFromIndicators(search: SearchResult, peakFap: number): { peak: IndicatorPeak; indicator: string } | null {
  let best: { peak: IndicatorPeak; indicator: string } | null = null
  for (const d of search.activity?.indicators ?? []) {
    for (const q of d.peaks) if (q.fap < peakFap && (!best || q.fap < best.peak.fap)) best = { peak: q, indicator: d.name }
  }
  return best
}

/** Searches planets with a GP for the activity; see the module comment. */
export function searchWithActivity(data: RvData, opts: ActivitySearchOptions = {}): ActivitySearchResult {
  checkRvData(data)
  const indicators = opts.indicators ?? []
  const maxPlanets = opts.maxPlanets ?? ACTIVITY_SEARCH_DEFAULTS.maxPlanets
  const thr = opts.bicThreshold ?? SEARCH_DEFAULTS.bicThreshold
  const nCand = opts.candidates ?? ACTIVITY_SEARCH_DEFAULTS.candidates
  if (!(Number.isInteger(maxPlanets) && maxPlanets >= 0 && maxPlanets <= 8)) throw new RangeError(`maxPlanets must be an integer in [0, 8] (got ${maxPlanets})`)
  if (!(thr >= 0)) throw new RangeError(`bicThreshold must be ≥ 0 (got ${thr})`)
  const rp = opts.rotationPeriod
  if (rp && !(rp.value > 0 && (rp.sigma === undefined || rp.sigma > 0))) throw new RangeError('rotationPeriod.value must be > 0 (and its sigma, when given, > 0)')
  const span = baseline(data.t)

  const white = opts.whiteSearch ?? searchPlanets(data, { ...opts.search, minPeriod: opts.minPeriod ?? opts.search?.minPeriod, maxPeriod: opts.maxPeriod ?? opts.search?.maxPeriod, ...(indicators.length ? { indicators } : {}) })
  const cautions: string[] = [...(white.activity?.cautions ?? [])]
  const activity: ActivityCandidate[] = []
  const vetted = white.activity
  if (vetted) {
    for (const k of vetted.activity) {
      activity.push({ period: white.fit.planets[k].period, source: 'velocities', evidence: vetted.candidates[k].cautions })
    }
  }
  const whitePlanetIdx = vetted ? vetted.planets : white.fit.planets.map((_, k) => k).slice(0, white.planets)

  // The rotation period
  let rotation: ActivitySearchResult['rotation'] = null
  let rotationColumn: IndicatorColumn | null = null
  const peakFap = VETTING_DEFAULTS.peakFap
  if (rp) {
    rotation = { period: rp.value, sigma: rp.sigma ?? 0.1 * rp.value, source: 'the user' }
    if (!activity.some((a) => Math.abs(1 / a.period - 1 / rp.value) <= 1 / span)) {
      activity.push({ period: rp.value, source: 'user', evidence: [`Rotation period ${fmtP(rp.value)} d given by the user; modelled by the GP.`] })
    }
  } else {
    const best = rotationFromIndicators(white, peakFap)
    if (best) {
      const P = Number(best.peak.period.toPrecision(4))
      rotation = { period: P, sigma: Math.max(P * P / span, ACTIVITY_SEARCH_DEFAULTS.minSigmaFraction * P), source: `'${best.indicator}' periodogram (FAP ${fmtFap(best.peak.fap)})` }
      rotationColumn = indicators.find((c) => c.name === best.indicator) ?? null
      const words = `'${best.indicator}' has its strongest peak at ${fmtP(P)} d (FAP ${fmtFap(best.peak.fap)}): the star's rotation or activity cycle, modelled by the GP.`
      const same = activity.find((a) => Math.abs(1 / a.period - 1 / P) <= 1 / span)
      if (same) same.evidence = [...same.evidence, words]
      else activity.push({ period: P, source: 'indicator', evidence: [words] })
    }
  }
  const whiteSearchBic = white.fit.stats.bic
  if (!rotation) {
    cautions.push(indicators.length
      ? 'No indicator has a significant periodogram peak and no rotation period was given: the white-noise search stands (no GP).'
      : 'No indicators and no rotation period: the white-noise search stands (no GP).')
    const planets = whitePlanetIdx.map((k) => planetOfWhite(white.fit.planets[k]))
    return {
      preferred: 'white', planets, activity, rotation: null, gp: null, gpFit: null, whiteFit: white.fit, whiteSearch: white,
      bic: { white: whiteSearchBic, gp: null, whiteSearch: whiteSearchBic }, steps: [], cautions,
    }
  }

  // The GP search
  const rot = rotation
  const gpSpec = (prev: GpFitResult | null): GpHyperSpec => {
    const k = prev?.success ? prev.noise.kernel : null
    return {
      kernel: opts.kernel ?? ACTIVITY_SEARCH_DEFAULTS.kernel,
      period: { value: rot.period, sigma: rot.sigma, source: rot.source, ...(k ? { start: k.period } : {}) },
      ...(k ? { decayTime: { value: Math.max(k.decayTime, 0.51 * rot.period) } } : {}),
      ...(k ? { shape: { value: k.kind === 'rotation' ? k.shape : k.roughness } } : {}),
      amplitude: { perInstrument: !!opts.perInstrumentAmplitude, ...(prev?.success ? { value: prev.noise.amplitude } : {}) },
    }
  }
  const fitGp = (planets: PlanetStart[], prev: GpFitResult | null, quick: boolean): GpFitResult =>
    fitWithGp(data, { planets, gp: gpSpec(prev), trend: white.trend, ...(prev?.success ? { jitterStart: prev.noise.jitter } : {}), skipUncertainties: quick })
  const isRotation = (P: number): string | null => {
    const rel = periodRelation(P, [{ period: rot.period, frequency: 1 / rot.period, power: 1, fap: 0 }], span, 1)
    return rel ? rel.relation : null
  }

  // Screening covariance: the kernel shape trained on the indicator that shows the rotation (it has
  // no planet in it, so the GP cannot stretch over a planet near a harmonic), amplitude and jitters
  // refitted on the velocities; without such an indicator, the current velocity fit's own kernel.
  let trained: KernelShape | null = null
  if (rotationColumn) {
    try {
      const tr = trainGpOnIndicator(data, rotationColumn.value, rotationColumn.error ?? null, { kernel: opts.kernel ?? ACTIVITY_SEARCH_DEFAULTS.kernel, period: { value: rot.period, sigma: rot.sigma } })
      if (tr.success) trained = tr.noise.kernel
      else cautions.push(`Training the GP on '${rotationColumn.name}' did not converge (${tr.message}); the velocities' own GP screens for planets.`)
    } catch (err) {
      cautions.push(`Training the GP on '${rotationColumn.name}' failed (${(err as Error).message}); the velocities' own GP screens for planets.`)
    }
  }
  /** The fit the search decides with: the trained kernel shape held fixed when there is one, else everything free. */
  const searchFit = (planets: PlanetStart[], prev: GpFitResult | null): GpFitResult => {
    if (!trained) return fitGp(planets, prev, true)
    const k = trained
    return fitWithGp(data, {
      planets, trend: white.trend, skipUncertainties: true, ...(prev?.success ? { jitterStart: prev.noise.jitter } : {}),
      gp: {
        kernel: k.kind, period: { value: k.period, fixed: true, source: `trained on '${rotationColumn!.name}'` }, decayTime: { value: k.decayTime, fixed: true },
        shape: { value: k.kind === 'rotation' ? k.shape : k.roughness, fixed: true },
        amplitude: { perInstrument: !!opts.perInstrumentAmplitude, ...(prev?.success ? { value: prev.noise.amplitude } : {}) },
      },
    })
  }

  let current = searchFit([], null)
  const steps: ActivitySearchStep[] = [{ planets: 0, bic: current.stats.bic, lnL: current.stats.lnL, tried: [], kept: null }]
  let planets: PlanetStart[] = []
  for (let step = 0; step < maxPlanets && current.success; step++) {
    const pg = gpResidualPeriodogram(data, current.residuals, current.noise, { minPeriod: opts.minPeriod, maxPeriod: opts.maxPeriod, peaks: nCand + 4 })
    const tried: number[] = []
    let best: GpFitResult | null = null
    for (const peak of pg.peaks) {
      if (tried.length >= nCand) break
      const rel = isRotation(peak.period)
      if (rel) {
        cautions.push(`The GP-residual periodogram peak at ${fmtP(peak.period)} d has ${rel} the rotation period (${fmtP(rot.period)} d): left to the GP, not tried as a planet.`)
        continue
      }
      tried.push(peak.period)
      const f = searchFit([...planets, { period: peak.period, K: Math.max(peak.K, 0.1), e: 0.05, omegaDeg: 90, tc: peak.tc }], current)
      if (f.success && (!best || f.stats.bic < best.stats.bic)) best = f
    }
    const gain = best ? current.stats.bic - best.stats.bic : -Infinity
    const keep = best !== null && gain >= thr && isRotation(best.planets[best.planets.length - 1].period) === null
    steps.push({ planets: planets.length + 1, bic: best?.stats.bic ?? NaN, lnL: best?.stats.lnL ?? NaN, tried, kept: keep ? best!.planets[best!.planets.length - 1].period : null })
    if (!keep) break
    current = best!
    planets = current.planets.map(startOf)
  }

  // Vet the planets by correlation with the indicators; the ones that follow an indicator are activity.
  if (planets.length && indicators.length) {
    const v = vetOrbits(data, current.planets.map((p) => ({ period: p.period, K: p.K, e: p.e, omega: p.omegaDeg * Math.PI / 180, tp: p.tp })), indicators)
    if (v.activity.length) {
      for (const k of v.activity) activity.push({ period: current.planets[k].period, source: 'velocities', evidence: v.candidates[k].cautions })
      planets = v.planets.map((k) => startOf(current.planets[k]))
      current = searchFit(planets, current)
    }
  }
  // Final fit with errors, every hyperparameter free (from the search's values)
  const gpFit = fitGp(planets, current, false)
  const final = gpFit.success || !current.success ? gpFit : current
  if (!final.success) cautions.push(`The planets + GP fit did not converge (${final.message}).`)
  const whiteFit = planets.length ? fitKeplerians(data, { planets: final.planets.map(startOf), trend: white.trend }) : fitKeplerians(data, { planets: [], trend: white.trend })
  const bicWhite = whiteFit.stats.bic
  const preferred = Number.isFinite(final.stats.bic) && final.stats.bic < bicWhite ? 'gp' : 'white'
  if (preferred === 'white') cautions.push(`With the same ${planets.length} planet(s), white noise has the lower BIC (${bicWhite.toFixed(1)} vs ${final.stats.bic.toFixed(1)} with the GP).`)
  return {
    preferred,
    planets: preferred === 'gp' ? final.planets : whiteFit.planets.map(planetOfWhite),
    activity, rotation, gp: gpHyperparameters(final, data.instrumentNames), gpFit: final, whiteFit, whiteSearch: white,
    bic: { white: bicWhite, gp: final.stats.bic, whiteSearch: whiteSearchBic }, steps, cautions,
  }
}

/** Public input and output shapes of the Keplerian fitter (`fitKeplerians`, see `orbit-fit.ts`). */

/** Largest eccentricity the fitter will step to (hard bound, e < 1 with margin). */
export const E_MAX = 0.99

export type TrendKind = 'none' | 'linear' | 'quadratic'
export type PlanetParam = 'period' | 'K' | 'e' | 'omegaDeg' | 'tc' | 'tp'

/** Starting values (or fixed values) of one planet. Give `tc` or `tp` (tc wins if both). */
export interface PlanetStart {
  period: number
  K: number
  e?: number
  omegaDeg?: number
  tc?: number
  tp?: number
  /** Parameters held fixed at the given values ('tc' or 'tp' fixes the phase that way). */
  fix?: PlanetParam[]
}

export interface Prior {
  planet: number
  param: PlanetParam
  /** Gaussian prior N(mu, sigma²) — for omegaDeg the difference is wrapped to ±180°. */
  gaussian?: { mu: number; sigma: number }
  /** Uniform prior on [min, max]: steps leaving the box are rejected (the log-prior is −∞ there). */
  uniform?: { min: number; max: number }
}

export interface FitOptions {
  planets: PlanetStart[]
  trend?: TrendKind
  /** Reference time of the trend and of the reported Tp/Tc (default: mean time of the data). */
  epoch?: number
  /** 'fit' (default), or fixed jitters per instrument (m/s). */
  jitter?: 'fit' | number[]
  /** Starting jitters per instrument when fitting them (default 0). */
  jitterStart?: number[]
  priors?: Prior[]
  maxIterations?: number
  /** Skip the covariance (faster, for multi-start screening). */
  skipUncertainties?: boolean
}

export interface PlanetFit {
  period: number
  K: number
  e: number
  /** Star's argument of periastron, radians in [0, 2π) and degrees. */
  omega: number
  omegaDeg: number
  tp: number
  tc: number
  secosw: number
  sesinw: number
  /** 1σ errors (NaN where not determined; 0 for fixed parameters). */
  uncertainty: { period: number; K: number; e: number; omegaDeg: number; tp: number; tc: number }
  /** Covariance of (period, K, e), row-major 3×3, for derived quantities. */
  covPKe: number[]
}

export interface InstrumentFit {
  name: string
  n: number
  offset: number
  offsetErr: number
  jitter: number
  jitterErr: number
  /** rms of the residuals of this instrument, m/s. */
  rms: number
}

export interface FitStats {
  nPoints: number
  /** Free parameters: Keplerian + offsets + trend + fitted jitters. */
  nParams: number
  /** Σ r²/(σ² + s²), with the fitted jitters. */
  chi2: number
  reducedChi2: number
  /** Σ r²/σ², without jitter. */
  chi2NoJitter: number
  lnL: number
  /** ln L + ln(prior) for the Gaussian priors (equals lnL without priors). */
  lnPosterior: number
  bic: number
  aic: number
  rms: number
}

export type FitStatus = 'converged' | 'max-iterations' | 'stalled' | 'failed'

export interface FitResult {
  success: boolean
  converged: boolean
  status: FitStatus
  message: string
  planets: PlanetFit[]
  instruments: InstrumentFit[]
  trend: null | { kind: TrendKind; slope: number; curvature: number; epoch: number; slopeErr: number; curvatureErr: number }
  stats: FitStats
  epoch: number
  model: Float64Array
  residuals: Float64Array
  iterations: number
  /** −2 ln(posterior) after every accepted optimiser step (never rises). */
  history: number[]
}

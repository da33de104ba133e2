// The fit task under a noise model: white noise (the core's `fitSpec`, with pinned jitters) or a
// Gaussian process (`fitWithGp`), both returned in the white fitter's shape plus a `noise` section,
// so the stored JSON, the warnings and the plots read them the same way. Runs in the worker pool.
import {
  fitSpec, fitWithGp, flattenPriors, jitterMle, meanEpoch, startsFromSpec, GP_DENSE_MAX,
  type FitResult, type GpFitResult, type GpHyperSpec, type PlanetStart, type RvData, type TrendKind,
} from '../../shared/rv/index.ts'
import type { FitNoise, InstrumentTermSpec, NoiseModelSpec, PlanetSpec } from '../../shared/api/analyses.ts'

export type PlainFit = Omit<FitResult, 'history'>

export interface NoiseFitInput {
  data: RvData
  planets: PlanetSpec[]
  trend: TrendKind
  maxIterations?: number
  noise?: NoiseModelSpec
  instrumentTerms?: InstrumentTermSpec[]
}
export interface NoiseFitOutput {
  fit: PlainFit
  starts: PlanetStart[]
  noise: FitNoise
  /** GP only: the activity (GP conditional mean) at each data row, in the data's row order. */
  activity: Float64Array | null
}

const DEG = Math.PI / 180

/** Pinned jitter per instrument of the data (null: fitted). Unknown names were refused by the service. */
export function pinsOf(data: RvData, terms: InstrumentTermSpec[] | undefined): Array<number | null> {
  return data.instrumentNames.map((name) => terms?.find((x) => x.instrument === name)?.jitter ?? null)
}

function pinnedList(data: RvData, pins: Array<number | null>) {
  return pins.flatMap((p, k) => (p === null ? [] : [{ instrument: data.instrumentNames[k]!, jitter: p }]))
}

/**
 * White noise with some jitters pinned and the others fitted: the fitter takes all jitters fitted or
 * all fixed, so the free ones are found by coordinate ascent on the same likelihood (orbit at fixed
 * jitters, then each free jitter's one-dimensional maximum at that orbit, `jitterMle`) until they
 * change by less than 1e-4 m/s. Their errors are left undetermined (null).
 */
function fitWhite(inp: NoiseFitInput, pins: Array<number | null>): { fit: PlainFit; starts: PlanetStart[] } {
  const { data, planets, trend, maxIterations } = inp
  const strip = (r: { fit: FitResult; starts: PlanetStart[] }) => { const { history: _h, ...fit } = r.fit; return { fit, starts: r.starts } }
  if (pins.every((p) => p === null)) return strip(fitSpec(data, planets, { trend, maxIterations }))
  if (pins.every((p) => p !== null)) return strip(fitSpec(data, planets, { trend, maxIterations, jitter: pins as number[] }))
  const rowsOf = data.instrumentNames.map((_, k) => Array.from(data.instrument.keys()).filter((i) => data.instrument[i] === k))
  const first = fitSpec(data, planets, { trend, maxIterations })
  let jit = pins.map((p, k) => p ?? first.fit.instruments[k]!.jitter)
  let r = first
  for (let iter = 0; iter < 20; iter++) {
    r = fitSpec(data, planets, { trend, maxIterations, jitter: jit })
    const next = pins.map((p, k) => p ?? jitterMle(r.fit.residuals, data.dy, rowsOf[k]!))
    const change = Math.max(...next.map((v, k) => Math.abs(v - jit[k]!)))
    jit = next
    if (change < 1e-4) break
  }
  r = fitSpec(data, planets, { trend, maxIterations, jitter: jit })
  const out = strip(r)
  const nFree = pins.filter((p) => p === null).length
  const n = out.fit.stats.nPoints
  const nParams = out.fit.stats.nParams + nFree
  out.fit.instruments = out.fit.instruments.map((ins, k) => (pins[k] === null ? { ...ins, jitterErr: NaN } : ins))
  out.fit.stats = { ...out.fit.stats, nParams, bic: nParams * Math.log(n) - 2 * out.fit.stats.lnL, aic: 2 * nParams - 2 * out.fit.stats.lnL }
  return out
}

export function whiteNoise(data: RvData, fit: PlainFit, pins: Array<number | null>): FitNoise {
  const pinned = pinnedList(data, pins)
  const priors = data.instrumentNames.map((name, k) => (pins[k] === null
    ? `jitter of ${name} fitted by maximum likelihood (no prior)` : `jitter of ${name} pinned at ${pins[k]} m/s`))
  return {
    kind: 'white', kernel: null, solver: null, hyperparameters: [], priors, pinnedJitters: pinned,
    lnL: Number.isFinite(fit.stats.lnL) ? fit.stats.lnL : null, bic: Number.isFinite(fit.stats.bic) ? fit.stats.bic : null,
    model: null,
    note: 'White noise: each velocity has its quoted error and its instrument\'s jitter added in quadrature; the residuals are taken as independent.',
  }
}

/** The model spec's GP fields as the core's `GpHyperSpec`. */
export function gpHyperOf(noise: Extract<NoiseModelSpec, { kind: 'gp' }>): GpHyperSpec {
  return { kernel: noise.kernel, period: noise.period, decayTime: noise.decayTime, shape: noise.shape, amplitude: noise.amplitude }
}

const nz = (v: number): number | null => (Number.isFinite(v) ? v : null)

/**
 * The GP fit in the white fitter's shape (errors the GP fit does not give are NaN → null in the JSON; a
 * parameter the model fixes has error 0, the white fitter's mark of "fixed", shown so on screen and in reports).
 */
export function gpAsPlainFit(data: RvData, r: GpFitResult, epoch: number): PlainFit {
  const n = data.t.length
  const white = Float64Array.from(r.residuals, (v, i) => v - r.activity[i]!)
  const rmsOf = (rows: number[]) => rows.length ? Math.sqrt(rows.reduce((s, i) => s + white[i]! ** 2, 0) / rows.length) : NaN
  const all = Array.from({ length: n }, (_, i) => i)
  return {
    success: r.success, converged: r.status === 'converged',
    status: r.status === 'max-evaluations' ? 'max-iterations' : r.status,
    message: r.message,
    planets: r.planets.map((p) => {
      const w = p.omegaDeg * DEG, se = Math.sqrt(p.e)
      const u = p.uncertainty
      return {
        period: p.period, K: p.K, e: p.e, omega: w, omegaDeg: p.omegaDeg, tp: p.tp, tc: p.tc, secosw: se * Math.cos(w), sesinw: se * Math.sin(w),
        uncertainty: { period: u.period, K: u.K, e: u.e, omegaDeg: u.omegaDeg ?? NaN, tp: u.tp ?? NaN, tc: u.tc },
        covPKe: p.covPKe ?? [u.period ** 2, 0, 0, 0, u.K ** 2, 0, 0, 0, u.e ** 2],
      }
    }),
    instruments: r.instruments.map((ins, k) => {
      const rows = all.filter((i) => data.instrument[i] === k)
      return { name: ins.name, n: rows.length, offset: ins.offset, offsetErr: NaN, jitter: ins.jitter, jitterErr: NaN, rms: rmsOf(rows) }
    }),
    trend: r.trend.kind === 'none' ? null : { ...r.trend, slopeErr: NaN, curvatureErr: NaN },
    stats: {
      nPoints: r.stats.nPoints, nParams: r.stats.nParams, chi2: NaN, reducedChi2: NaN, chi2NoJitter: NaN,
      lnL: r.stats.lnL, lnPosterior: r.stats.lnPosterior, bic: r.stats.bic, aic: r.stats.aic, rms: rmsOf(all),
    },
    epoch,
    model: Float64Array.from(data.y, (y, i) => y - r.residuals[i]!),
    residuals: r.residuals,
    iterations: r.evaluations,
  }
}

/** The GP section of the result: hyperparameters with 1σ and units, priors in words, ln L, BIC. */
export function gpNoise(data: RvData, spec: Extract<NoiseModelSpec, { kind: 'gp' }>, r: GpFitResult, pins: Array<number | null>): FitNoise {
  const k = r.noise.kernel
  const u = r.noiseUncertainty
  const rot = k.kind === 'rotation'
  const hyper: FitNoise['hyperparameters'] = [
    { name: 'rotation period', symbol: 'P_rot', value: k.period, error: nz(u.period), unit: 'd', fixed: !!spec.period.fixed },
    { name: 'decay time', symbol: rot ? 'τ_d' : 'λ', value: k.decayTime, error: nz(u.decayTime), unit: 'd', fixed: !!spec.decayTime?.fixed },
    rot
      ? { name: 'shape factor', symbol: 'f', value: k.shape, error: nz(u.shape), unit: '', fixed: !!spec.shape?.fixed }
      : { name: 'harmonic weight', symbol: 'Γ', value: k.roughness, error: nz(u.shape), unit: '', fixed: !!spec.shape?.fixed },
  ]
  const amps = r.noise.amplitude
  amps.forEach((a, j) => hyper.push({
    name: amps.length > 1 ? `GP amplitude (${data.instrumentNames[j]})` : 'GP amplitude', symbol: amps.length > 1 ? `h_${data.instrumentNames[j]}` : 'h',
    value: a, error: nz(u.amplitude[j] ?? NaN), unit: 'm/s', fixed: !!spec.amplitude?.fixed,
  }))
  return {
    kind: 'gp', kernel: k.kind, solver: rot ? 'semiseparable (O(N))' : 'dense Cholesky',
    hyperparameters: hyper, priors: r.priors, pinnedJitters: pinnedList(data, pins),
    lnL: nz(r.stats.lnL), bic: nz(r.stats.bic),
    model: {
      kernel: { kind: k.kind, period: k.period, decayTime: k.decayTime, shape: rot ? k.shape : k.roughness },
      amplitude: amps, jitter: r.noise.jitter, instruments: data.instrumentNames,
    },
    note: 'Planets + GP: the residuals carry correlated stellar noise (the activity curve) besides each instrument\'s jitter. '
      + 'The residual column is velocity − (Keplerians + offsets + trend); residual − activity is what no model term explains. '
      + 'Offsets and trend are profiled out (no separate errors); errors are from the curvature of the posterior at its maximum (Laplace).',
  }
}

/** Fits a model spec under its noise model; see the module comment. Bad options throw RangeError naming the field. */
export function fitWithNoise(inp: NoiseFitInput): NoiseFitOutput {
  const { data, planets, trend } = inp
  const pins = pinsOf(data, inp.instrumentTerms)
  const noise = inp.noise ?? { kind: 'white' as const }
  if (noise.kind === 'white') {
    const w = fitWhite(inp, pins)
    return { ...w, noise: whiteNoise(data, w.fit, pins), activity: null }
  }
  if (pins.some((p) => p === null) && pins.some((p) => p !== null)) {
    throw new RangeError('instrumentTerms: with a GP noise model pin the jitters of every instrument or of none')
  }
  if (noise.kernel === 'quasi-periodic' && data.t.length > GP_DENSE_MAX) {
    throw new RangeError(`noise.kernel: the quasi-periodic kernel is solved densely, at most ${GP_DENSE_MAX} points; use the rotation kernel (O(N))`)
  }
  const epoch = meanEpoch(data.t)
  const starts = startsFromSpec(data, planets, trend, epoch)
  const r = fitWithGp(data, {
    planets: starts, priors: flattenPriors(planets), gp: gpHyperOf(noise), trend, epoch,
    jitter: pins.every((p) => p !== null) && pins.length ? (pins as number[]) : 'fit',
  })
  return { fit: gpAsPlainFit(data, r, epoch), starts, noise: gpNoise(data, noise, r, pins), activity: r.activity }
}

/**
 * A Gaussian-process noise model for velocity residuals: correlated activity with a kernel shape,
 * an amplitude per instrument (one value shared, or one each where instruments see the activity
 * differently) and white jitter per instrument. Covariance of rows i, j:
 *   C_ij = h_{inst(i)} h_{inst(j)} κ(t_i − t_j) + δ_ij (σ_i² + jitter_{inst(i)}²).
 * Picks the solver: the O(N) semiseparable one for the rotation kernel, dense Cholesky for the
 * quasi-periodic kernel (or on request, as the reference).
 */
import { checkKernelShape, kernelValue, rotationTerms, type KernelShape } from './kernels.ts'
import { denseFactor, denseLogLikelihood, densePredict, denseSolve, type DenseFactor } from './dense.ts'
import {
  semiseparableFactor, semiseparableFactorLogLikelihood, semiseparableLogLikelihood, semiseparablePredict, semiseparableSolve,
  type SemiseparableFactor,
} from './semiseparable.ts'

export interface GpNoiseModel {
  kernel: KernelShape
  /** Amplitude of the correlated noise, m/s (√ of its variance): one value for all instruments, or one per instrument. */
  amplitude: number[]
  /** White jitter per instrument, m/s, added in quadrature to the errors (one value for all, or one per instrument). */
  jitter: number[]
}

/** The rows a GP needs: times (days), errors (m/s), instrument index per row. */
export interface GpSeries {
  t: Float64Array
  dy: Float64Array
  instrument: Int32Array
  instrumentNames: string[]
}

/** 'auto': semiseparable for the rotation kernel, dense for the quasi-periodic one. */
export type GpMethod = 'auto' | 'dense' | 'semiseparable'

/** Largest series the dense path takes (memory 8N² bytes: 200 MB at 5000). */
export const GP_DENSE_MAX = 5000

export interface GpFactor {
  method: 'dense' | 'semiseparable'
  model: GpNoiseModel
  /** Row order used inside (sorted by time); order[k] is the caller's row. */
  order: Int32Array
  /** White-noise variance per caller row. */
  noiseVar: Float64Array
  dense: DenseFactor | null
  fast: SemiseparableFactor | null
}

function perInstrument(name: string, v: number[], nInst: number, allowZero: boolean): Float64Array {
  if (!Array.isArray(v) || (v.length !== 1 && v.length !== nInst)) {
    throw new RangeError(`${name} must have 1 or ${nInst} values (one per instrument), got ${Array.isArray(v) ? v.length : typeof v}`)
  }
  const out = new Float64Array(nInst)
  for (let k = 0; k < nInst; k++) {
    const x = v.length === 1 ? v[0] : v[k]
    if (!(Number.isFinite(x) && (allowZero ? x >= 0 : x > 0))) throw new RangeError(`${name}[${v.length === 1 ? 0 : k}] must be a finite number ${allowZero ? '≥' : '>'} 0 (got ${x})`)
    out[k] = x
  }
  return out
}

/** Checks the model against the series; returns per-row amplitude and white-noise variance (caller order). */
export function rowScales(series: GpSeries, model: GpNoiseModel): { scale: Float64Array; noiseVar: Float64Array } {
  checkKernelShape(model.kernel)
  const nInst = Math.max(1, series.instrumentNames.length)
  const h = perInstrument('amplitude', model.amplitude, nInst, true)
  const jit = perInstrument('jitter', model.jitter, nInst, true)
  const n = series.t.length
  if (series.dy.length !== n || series.instrument.length !== n) throw new RangeError('series.t, series.dy and series.instrument must have the same length')
  const scale = new Float64Array(n), noiseVar = new Float64Array(n)
  for (let i = 0; i < n; i++) {
    const k = series.instrument[i]
    if (!(k >= 0 && k < nInst)) throw new RangeError(`series.instrument[${i}] = ${k} has no name`)
    if (!(series.dy[i] > 0) || !Number.isFinite(series.t[i])) throw new RangeError(`row ${i} needs a finite time and an error > 0`)
    scale[i] = h[k]
    noiseVar[i] = series.dy[i] * series.dy[i] + jit[k] * jit[k]
  }
  return { scale, noiseVar }
}

function chooseMethod(model: GpNoiseModel, n: number, method: GpMethod): 'dense' | 'semiseparable' {
  if (method === 'semiseparable' && model.kernel.kind !== 'rotation') {
    throw new RangeError('method semiseparable needs the rotation kernel; the quasi-periodic kernel has only the dense solver')
  }
  const m = method === 'auto' ? (model.kernel.kind === 'rotation' ? 'semiseparable' : 'dense') : method
  if (m === 'dense' && n > GP_DENSE_MAX) {
    throw new RangeError(`the dense GP takes at most ${GP_DENSE_MAX} rows (got ${n}); use the rotation kernel, whose solver is O(N)`)
  }
  return m
}

function timeOrder(t: Float64Array): Int32Array {
  const n = t.length
  const order = new Int32Array(n)
  let sorted = true
  for (let i = 0; i < n; i++) { order[i] = i; if (i > 0 && t[i] < t[i - 1]) sorted = false }
  if (!sorted) order.sort((a, b) => t[a] - t[b] || a - b)
  return order
}

function permute(v: Float64Array, order: Int32Array): Float64Array {
  const out = new Float64Array(order.length)
  for (let k = 0; k < order.length; k++) out[k] = v[order[k]]
  return out
}

function checkResidual(series: GpSeries, residual: Float64Array): void {
  if (residual.length !== series.t.length) throw new RangeError(`residual has ${residual.length} rows, series.t has ${series.t.length}`)
}

/**
 * ln N(r | 0, C) of residuals r under the noise model. The semiseparable path runs in one pass with no
 * stored factor (O(N) time, O(1) memory beyond sorting).
 */
export function gpLogLikelihood(series: GpSeries, residual: Float64Array, model: GpNoiseModel, method: GpMethod = 'auto'): number {
  checkResidual(series, residual)
  const m = chooseMethod(model, series.t.length, method)
  const { scale, noiseVar } = rowScales(series, model)
  const order = timeOrder(series.t)
  const t = permute(series.t, order), s = permute(scale, order), nv = permute(noiseVar, order), r = permute(residual, order)
  if (m === 'semiseparable' && model.kernel.kind === 'rotation') return semiseparableLogLikelihood(t, s, nv, rotationTerms(model.kernel), r)
  const kernel = model.kernel
  return denseLogLikelihood(denseFactor(t, s, nv, (tau) => kernelValue(tau, kernel)), r)
}

/** Factors the covariance once for solves and predictions. */
export function gpFactor(series: GpSeries, model: GpNoiseModel, method: GpMethod = 'auto'): GpFactor {
  const m = chooseMethod(model, series.t.length, method)
  const { scale, noiseVar } = rowScales(series, model)
  const order = timeOrder(series.t)
  const t = permute(series.t, order), s = permute(scale, order), nv = permute(noiseVar, order)
  const kernel = model.kernel
  if (m === 'semiseparable' && kernel.kind === 'rotation') {
    return { method: m, model, order, noiseVar, dense: null, fast: semiseparableFactor(t, s, nv, rotationTerms(kernel)) }
  }
  return { method: 'dense', model, order, noiseVar, dense: denseFactor(t, s, nv, (tau) => kernelValue(tau, kernel)), fast: null }
}

/** ln det C. */
export function gpLogDeterminant(f: GpFactor): number {
  return f.fast ? f.fast.logDet : f.dense!.logDet
}

/** C⁻¹ r in the caller's row order. */
export function gpSolve(f: GpFactor, residual: Float64Array): Float64Array {
  const r = permute(residual, f.order)
  const x = f.fast ? semiseparableSolve(f.fast, r) : denseSolve(f.dense!, r)
  const out = new Float64Array(x.length)
  for (let k = 0; k < x.length; k++) out[f.order[k]] = x[k]
  return out
}

/** ln N(r | 0, C) from a factor. */
export function gpFactorLogLikelihood(f: GpFactor, residual: Float64Array): number {
  const r = permute(residual, f.order)
  return f.fast ? semiseparableFactorLogLikelihood(f.fast, r) : denseLogLikelihood(f.dense!, r)
}

export interface GpPrediction {
  /** Conditional mean of the correlated noise (the activity curve), m/s. */
  mean: Float64Array
  /** Its variance (m/s)², without white noise; null unless asked. */
  variance: Float64Array | null
}

/**
 * The activity curve at times tStar, as instrument `instrument` sees it (its amplitude), given the
 * residuals: conditional mean and, when `variance` is true, the latent variance (no white noise).
 */
export function gpPredict(
  f: GpFactor, residual: Float64Array, tStar: Float64Array, opts: { instrument?: number; variance?: boolean } = {},
): GpPrediction {
  const amps = f.model.amplitude
  const k = opts.instrument ?? 0
  const h = amps.length === 1 ? amps[0] : amps[k]
  if (h === undefined) throw new RangeError(`instrument ${k} has no amplitude`)
  const alpha = permute(gpSolve(f, residual), f.order)
  const p = f.fast
    ? semiseparablePredict(f.fast, alpha, tStar, h, opts.variance ?? false)
    : densePredict(f.dense!, alpha, tStar, h, opts.variance ?? false)
  return { mean: p.mean, variance: p.variance }
}

/**
 * The activity at each data row (each row with its own instrument's amplitude): the conditional mean
 * K_gp C⁻¹ r, computed as r − N C⁻¹ r with N the white-noise diagonal (exact, O(N) on the fast path).
 * r minus this is the residual with the activity removed.
 */
export function gpActivityAtData(f: GpFactor, residual: Float64Array): Float64Array {
  const alpha = gpSolve(f, residual)
  const out = new Float64Array(residual.length)
  for (let i = 0; i < out.length; i++) out[i] = residual[i] - f.noiseVar[i] * alpha[i]
  return out
}

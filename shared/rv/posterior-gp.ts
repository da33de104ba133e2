/**
 * The GP noise term of the posterior (`posterior.ts` with `spec.noise`): its sampling coordinates,
 * their priors and the likelihood of the residuals under C = h_i h_j κ(t_i − t_j) + δ_ij (σ_i² + s_k²).
 *
 * Coordinates (each left out and held when the spec fixes it), appended after the white-noise ones:
 *   ln amplitude (one, or one per instrument), ln decay time, rotation period P_rot (d), shape
 *   (rotation kernel: f on [0, 1]; quasi-periodic: ln Γ).
 * Priors, the same as `fitWithGp` states (gp-fit.ts): amplitude log-uniform on [0.01, 1000] m/s (flat in
 * ln h); decay time log-uniform between P_rot/2 and 10 × max(baseline, P_rot); P_rot Gaussian
 * N(value, sigma²) (sigma default 10 % of the value), truncated at 0; f flat on [0, 1]; Γ log-uniform
 * on [0.05, 20]. The normalising constants of the bounded priors do not depend on the parameters and
 * are left out, except the decay time's, whose bounds move with P_rot: its density is
 * 1/(τ ln(10 max(T, P)/(P/2))), so ln p gains −ln ln(20 max(T, P)/P) (the 1/τ is the flat-in-ln
 * measure of the coordinate).
 *
 * With a GP a planet's long-period, flat-in-P tail is no longer held off by the data (the GP and the
 * offsets take up what a slow orbit would explain, and a flat prior in P grows its volume without
 * bound, and once K is small Tc roams over every revolution): `posterior.ts` then bounds every free
 * period to at most 5 × the baseline (the search's longest period) and each Tc to one revolution
 * around its centre (|Tc − Tc₀| ≤ P/2; the phase is periodic, so this loses nothing), both stated
 * among the priors. Narrower stated priors remain the user's to give.
 *
 * Likelihood: rotation kernel by the O(N) semiseparable pass (gp/semiseparable.ts), quasi-periodic by
 * dense Cholesky (gp/dense.ts); rows sorted by time once here. A covariance that is not positive
 * definite numerically gives −∞.
 */
import type { RvData } from './orbit-data.ts'
import { baseline } from './orbit-data.ts'
import type { GpHyperSpec } from './gp-fit.ts'
import { rotationTerms, kernelValue, type KernelShape } from './gp/kernels.ts'
import { semiseparableLogLikelihood } from './gp/semiseparable.ts'
import { denseFactor, denseLogLikelihood } from './gp/dense.ts'

/** Where the GP hyperparameters sit in the sampling vector (−1: held fixed) and the held values. */
export interface GpCoords {
  kernel: GpHyperSpec['kernel']
  iAmp: number
  nAmp: number
  iDecay: number
  iPeriod: number
  iShape: number
  fixed: { amplitude: number[]; decayTime: number; period: number; shape: number }
}

const AMP_MIN = 0.01, AMP_MAX = 1000, GAMMA_MIN = 0.05, GAMMA_MAX = 20

export interface GpTerm {
  coords: GpCoords
  /** ln prior of the GP coordinates (−∞ outside the support); fills the current hyperparameters. */
  prior(x: ArrayLike<number>): number
  /** ln N(r | 0, C) for residuals r (caller's row order) and the per-instrument jitter variances s2. */
  logLikelihood(r: Float64Array, s2: Float64Array): number
  /** The priors in words (methods text). */
  priors: string[]
  /** Longest planet period allowed (d), 5 × the baseline. */
  maxPlanetPeriod: number
}

/**
 * Builds the GP term and appends its coordinates with `push(name, unit, centre)` (returns the index).
 * Throws a RangeError naming the field on misuse.
 */
export function gpTerm(data: RvData, g: GpHyperSpec, push: (name: string, unit: string, v: number) => number): GpTerm {
  if (g.kernel !== 'rotation' && g.kernel !== 'quasi-periodic') throw new RangeError(`noise.kernel must be 'rotation' or 'quasi-periodic' (got ${g.kernel})`)
  if (!(g.period && g.period.value > 0)) throw new RangeError(`noise.period.value must be > 0 (got ${g.period?.value})`)
  const nInst = data.instrumentNames.length
  const span = baseline(data.t)
  const Pc = g.period.value
  const sigma = g.period.sigma ?? 0.1 * Pc
  if (!(sigma > 0)) throw new RangeError(`noise.period.sigma must be > 0 (got ${g.period.sigma})`)
  const P0 = g.period.fixed ? Pc : g.period.start ?? Pc
  const decay0 = g.decayTime?.value ?? 2 * P0
  if (!(decay0 > P0 / 2)) throw new RangeError(`noise.decayTime.value must exceed half the rotation period (${P0 / 2} d), got ${decay0}`)
  const shape0 = g.shape?.value ?? (g.kernel === 'rotation' ? 0.5 : 1)
  if (g.kernel === 'rotation' ? !(shape0 >= 0 && shape0 <= 1) : !(shape0 > 0)) throw new RangeError(`noise.shape.value out of range for the ${g.kernel} kernel (got ${shape0})`)
  const perInst = !!g.amplitude?.perInstrument && nInst > 1
  const nAmp = perInst ? nInst : 1
  const medErr = Array.from(data.dy).sort((a, b) => a - b)[Math.floor(data.dy.length / 2)] ?? 1
  const amp0 = g.amplitude?.value ?? [Math.max(medErr, 1)]
  if (amp0.length !== 1 && amp0.length !== nAmp) throw new RangeError(`noise.amplitude.value must have 1${nAmp > 1 ? ` or ${nAmp}` : ''} value(s)`)
  const ampAt = (k: number): number => (amp0.length === 1 ? amp0[0] : amp0[k])
  for (let k = 0; k < nAmp; k++) if (!(ampAt(k) > 0)) throw new RangeError(`noise.amplitude.value[${k}] must be > 0`)

  const coords: GpCoords = {
    kernel: g.kernel, iAmp: -1, nAmp, iDecay: -1, iPeriod: -1, iShape: -1,
    fixed: { amplitude: Array.from({ length: nAmp }, (_, k) => ampAt(k)), decayTime: decay0, period: P0, shape: shape0 },
  }
  if (!g.amplitude?.fixed) {
    for (let k = 0; k < nAmp; k++) {
      const i = push(nAmp > 1 ? `ln GP amplitude ${data.instrumentNames[k]}` : 'ln GP amplitude', 'ln m/s', Math.log(ampAt(k)))
      if (k === 0) coords.iAmp = i
    }
  }
  if (!g.decayTime?.fixed) coords.iDecay = push('ln GP decay time', 'ln d', Math.log(decay0))
  if (!g.period.fixed) coords.iPeriod = push('rotation period', 'd', P0)
  if (!g.shape?.fixed) coords.iShape = g.kernel === 'rotation' ? push('GP shape', '', shape0) : push('ln GP Γ', '', Math.log(shape0))

  // time order, scratch
  const n = data.t.length
  const order = Int32Array.from({ length: n }, (_, i) => i).sort((a, b) => data.t[a] - data.t[b] || a - b)
  const tS = Float64Array.from(order, (i) => data.t[i])
  const dy2S = Float64Array.from(order, (i) => data.dy[i] * data.dy[i])
  const instS = Int32Array.from(order, (i) => data.instrument[i])
  const scaleS = new Float64Array(n), nvS = new Float64Array(n), rS = new Float64Array(n)
  const amp = new Float64Array(nAmp)
  let period = P0, decay = decay0, shape = shape0
  const lnAmpMin = Math.log(AMP_MIN), lnAmpMax = Math.log(AMP_MAX)

  const prior = (x: ArrayLike<number>): number => {
    let lp = 0
    for (let k = 0; k < nAmp; k++) {
      if (coords.iAmp >= 0) {
        const v = x[coords.iAmp + k]
        if (!(v >= lnAmpMin && v <= lnAmpMax)) return -Infinity
        amp[k] = Math.exp(v)
      } else amp[k] = coords.fixed.amplitude[k]
    }
    if (coords.iPeriod >= 0) {
      period = x[coords.iPeriod]
      if (!(period > 0)) return -Infinity
      const z = (period - Pc) / sigma
      lp += -0.5 * z * z
    } else period = P0
    const hiDecay = 10 * Math.max(span, period)
    if (coords.iDecay >= 0) {
      const v = x[coords.iDecay]
      if (!(v < 700)) return -Infinity
      decay = Math.exp(v)
      lp -= Math.log(Math.log(hiDecay / (period / 2)))
    } else decay = decay0
    if (!(decay > period / 2 && decay < hiDecay)) return -Infinity
    if (coords.iShape >= 0) {
      const v = x[coords.iShape]
      if (g.kernel === 'rotation') { if (!(v >= 0 && v <= 1)) return -Infinity; shape = v }
      else { if (!(v >= Math.log(GAMMA_MIN) && v <= Math.log(GAMMA_MAX))) return -Infinity; shape = Math.exp(v) }
    } else shape = shape0
    return lp
  }

  const logLikelihood = (r: Float64Array, s2: Float64Array): number => {
    for (let k = 0; k < n; k++) {
      const inst = instS[k]
      rS[k] = r[order[k]]
      scaleS[k] = nAmp === 1 ? amp[0] : amp[inst]
      nvS[k] = dy2S[k] + s2[inst]
    }
    const kern: KernelShape = g.kernel === 'rotation'
      ? { kind: 'rotation', period, decayTime: decay, shape }
      : { kind: 'quasi-periodic', period, decayTime: decay, roughness: shape }
    try {
      const ll = kern.kind === 'rotation'
        ? semiseparableLogLikelihood(tS, scaleS, nvS, rotationTerms(kern), rS)
        : denseLogLikelihood(denseFactor(tS, scaleS, nvS, (tau) => kernelValue(tau, kern)), rS)
      return Number.isNaN(ll) ? -Infinity : ll
    } catch {
      return -Infinity
    }
  }

  /** Longest planet period allowed with a GP (d). */
  const maxPlanetPeriod = 5 * span
  const src = g.period.source ? ` (from ${g.period.source})` : ''
  const priors = [
    g.period.fixed ? `rotation period fixed at ${P0} d${src}` : `rotation period ~ N(${Pc}, ${sigma.toPrecision(3)}²) d${src}`,
    g.decayTime?.fixed ? `GP decay time fixed at ${decay0} d` : 'GP decay time log-uniform between half the rotation period and 10 × max(baseline, rotation period)',
    g.kernel === 'rotation'
      ? (g.shape?.fixed ? `GP shape factor fixed at ${shape0}` : 'GP shape factor (P/2 harmonic share) uniform on [0, 1]')
      : (g.shape?.fixed ? `GP Γ fixed at ${shape0}` : `GP Γ log-uniform on [${GAMMA_MIN}, ${GAMMA_MAX}]`),
    g.amplitude?.fixed ? `GP amplitude fixed at ${coords.fixed.amplitude.join(', ')} m/s` : `GP amplitude${nAmp > 1 ? ' per instrument' : ''} log-uniform on [${AMP_MIN}, ${AMP_MAX}] m/s`,
    `planet periods at most ${maxPlanetPeriod.toFixed(0)} d (5 × the baseline); each Tc within half a period of its centre`,
  ]
  return { coords, prior, logLikelihood, priors, maxPlanetPeriod }
}

/**
 * Periodogram of velocity residuals under a GP noise model: at each trial frequency ω the sinusoid
 * a cos ωt + b sin ωt (with an offset per instrument) is fitted by generalised least squares with the
 * GP covariance C (Rasmussen & Williams 2006, §2.7: a linear mean under a GP prior), and the power is
 * Δχ² = χ²(offsets) − χ²(offsets + sinusoid), χ² = rᵀC⁻¹r − bᵀ(AᵀC⁻¹A)⁻¹b. With white noise this is
 * the generalised Lomb–Scargle χ² drop (Zechmeister & Kürster 2009, A&A 496, 577). A signal the
 * correlated noise already explains (the rotation) gives little power; a coherent planet keeps its.
 * The covariance is factored once (O(N) per solve with the rotation kernel, gp/noise-model.ts).
 */
import { gpFactor, gpSolve, type GpNoiseModel } from './gp/noise-model.ts'
import { invertSymmetric } from './linalg.ts'
import { baseline, type RvData } from './orbit-data.ts'
import { defaultMaxPeriod, defaultMinPeriod } from './periodogram-core.ts'

export interface GpPeriodogramOptions {
  minPeriod?: number
  maxPeriod?: number
  /** Frequency step 1/(oversample × baseline) (default 5). */
  oversample?: number
}

export interface GpPeriodogramPeak {
  period: number
  frequency: number
  /** χ² drop of the sinusoid under the GP covariance. */
  dchi2: number
  /** Semi-amplitude (m/s) and the time of the sinusoid's descending zero (the circular orbit's Tc). */
  K: number
  tc: number
}

export interface GpPeriodogram {
  frequency: Float64Array
  dchi2: Float64Array
  /** Strongest local maxima, at least one peak width (1/baseline) apart, strongest first. */
  peaks: GpPeriodogramPeak[]
}

/** Δχ² of a sinusoid at each trial frequency under the noise model (see the module comment). */
export function gpResidualPeriodogram(data: RvData, residual: Float64Array, noise: GpNoiseModel, opts: GpPeriodogramOptions & { peaks?: number } = {}): GpPeriodogram {
  const n = data.t.length
  if (residual.length !== n) throw new RangeError(`residual has ${residual.length} rows, the data have ${n}`)
  const span = baseline(data.t)
  if (!(span > 0)) throw new RangeError('the data span no time; a periodogram needs a baseline')
  const minP = opts.minPeriod ?? defaultMinPeriod(data.t)
  const maxP = opts.maxPeriod ?? defaultMaxPeriod(span)
  if (!(minP > 0 && maxP > minP)) throw new RangeError(`need 0 < minPeriod < maxPeriod (got ${minP}, ${maxP})`)
  const over = opts.oversample ?? 5
  const df = 1 / (over * span)
  const f0 = 1 / maxP, f1 = 1 / minP
  const nf = Math.max(1, Math.floor((f1 - f0) / df) + 1)
  const fac = gpFactor(data, noise)
  const nInst = data.instrumentNames.length
  const A: Float64Array[] = []
  for (let k = 0; k < nInst; k++) A.push(Float64Array.from(data.instrument, (v) => (v === k ? 1 : 0)))
  const CA = A.map((a) => gpSolve(fac, a))
  const Cr = gpSolve(fac, residual)
  const dot = (a: Float64Array, b: Float64Array): number => { let s = 0; for (let i = 0; i < n; i++) s += a[i] * b[i]; return s }
  const m = nInst + 2
  const G = new Float64Array(m * m), bv = new Float64Array(m)
  for (let p = 0; p < nInst; p++) {
    bv[p] = dot(A[p], Cr)
    for (let q = 0; q < nInst; q++) G[p * m + q] = dot(A[p], CA[q])
  }
  // χ² with offsets only
  const G0 = new Float64Array(nInst * nInst)
  for (let p = 0; p < nInst; p++) for (let q = 0; q < nInst; q++) G0[p * nInst + q] = G[p * m + q]
  const inv0 = invertSymmetric(G0, nInst).inv
  let fit0 = 0
  for (let p = 0; p < nInst; p++) for (let q = 0; q < nInst; q++) fit0 += bv[p] * inv0[p * nInst + q] * bv[q]

  const freq = new Float64Array(nf), power = new Float64Array(nf)
  const amp = new Float64Array(nf), phase = new Float64Array(nf)
  const c = new Float64Array(n), s = new Float64Array(n)
  for (let j = 0; j < nf; j++) {
    const f = f0 + j * df
    freq[j] = f
    const w = 2 * Math.PI * f
    for (let i = 0; i < n; i++) { const x = w * (data.t[i] - data.t[0]); c[i] = Math.cos(x); s[i] = Math.sin(x) }
    const Cc = gpSolve(fac, c), Cs = gpSolve(fac, s)
    const cols = [c, s], Ccols = [Cc, Cs]
    for (let a = 0; a < 2; a++) {
      const p = nInst + a
      bv[p] = dot(cols[a], Cr)
      for (let q = 0; q < nInst; q++) { const v = dot(A[q], Ccols[a]); G[p * m + q] = v; G[q * m + p] = v }
      for (let b = 0; b < 2; b++) G[p * m + nInst + b] = dot(cols[a], Ccols[b])
    }
    const { inv, singular } = invertSymmetric(G, m)
    if (singular) continue
    let fit = 0
    const theta = new Float64Array(m)
    for (let p = 0; p < m; p++) for (let q = 0; q < m; q++) theta[p] += inv[p * m + q] * bv[q]
    for (let p = 0; p < m; p++) fit += theta[p] * bv[p]
    power[j] = Math.max(0, fit - fit0)
    const ca = theta[nInst], sb = theta[nInst + 1]
    amp[j] = Math.hypot(ca, sb)
    // ca cos x + sb sin x = −K sin(x − x_c)  ⇒  x_c = atan2(ca, −sb)
    phase[j] = Math.atan2(ca, -sb)
  }
  const width = 1 / span
  const order = Array.from({ length: nf }, (_, j) => j)
    .filter((j) => (j === 0 || power[j] >= power[j - 1]) && (j === nf - 1 || power[j] >= power[j + 1]) && power[j] > 0)
    .sort((a, b) => power[b] - power[a])
  const peaks: GpPeriodogramPeak[] = []
  for (const j of order) {
    if (peaks.length >= (opts.peaks ?? 5)) break
    if (peaks.some((p) => Math.abs(p.frequency - freq[j]) < width)) continue
    const P = 1 / freq[j]
    peaks.push({ period: P, frequency: freq[j], dchi2: power[j], K: amp[j], tc: data.t[0] + (phase[j] / (2 * Math.PI)) * P })
  }
  return { frequency: freq, dchi2: power, peaks }
}

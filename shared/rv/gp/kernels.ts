/**
 * Covariance kernels for correlated stellar noise (activity), as functions of the time lag τ (days).
 * Both are written with unit variance at τ = 0; the amplitude (m/s) multiplies them per instrument
 * in `noise-model.ts`.
 *
 * - Quasi-periodic (the dense reference): κ(τ) = exp(−τ²/(2λ²) − Γ sin²(πτ/P)), Haywood et al. 2014,
 *   MNRAS 443, 2517 (eq. 1 there has the same form); Rajpaul et al. 2015, MNRAS 452, 2269. λ is the
 *   evolution (decay) time of the spots, P the rotation period, Γ how many harmonics the curve carries.
 * - Rotation (the fast path): a mixture of two stochastically driven damped harmonic oscillators at the
 *   rotation frequency and its first harmonic (Foreman-Mackey et al. 2017, AJ 154, 220, §4: the SHO
 *   term), both damped on the same decay time τ_d:
 *     κ(τ) = Σ_{j=1,2} w_j e^{−|τ|/τ_d} [cos(ω_j τ) + (1/(ω_j τ_d)) sin(ω_j |τ|)],  ω_j = 2πj/P,
 *   w_1 = 1/(1+f), w_2 = f/(1+f) with f the shape factor (variance of the half-period harmonic relative
 *   to the fundamental). Each term is an SHO with ω0² = ω_j² + 1/τ_d² and Q = ω0 τ_d/2 (> ½ always),
 *   so the sum is positive definite for every allowed parameter.
 */

/** Quasi-periodic kernel shape: P (days), λ (days), Γ (dimensionless, ≥ 0). */
export interface QuasiPeriodicShape {
  kind: 'quasi-periodic'
  /** Rotation period P, days. */
  period: number
  /** Evolution time λ, days (the squared-exponential envelope exp(−τ²/2λ²)). */
  decayTime: number
  /** Γ ≥ 0: weight of the periodic part; larger Γ → more harmonics in the curve. */
  roughness: number
}

/** Rotation kernel shape (two damped oscillators), the form the O(N) solver takes. */
export interface RotationShape {
  kind: 'rotation'
  /** Rotation period P, days. */
  period: number
  /** e-folding time τ_d of the oscillation envelope exp(−τ/τ_d), days. */
  decayTime: number
  /** f ∈ [0, 1]: variance of the P/2 harmonic relative to the fundamental at P. */
  shape: number
}

export type KernelShape = QuasiPeriodicShape | RotationShape

/**
 * One damped-oscillator term, k(τ) = e^{−cτ}[a cos(dτ) + b sin(dτ)] for τ ≥ 0
 * (Foreman-Mackey et al. 2017, §4, with the term's variance a).
 */
export interface SemiseparableTerm { a: number; b: number; c: number; d: number }

function positive(name: string, v: number): void {
  if (!(Number.isFinite(v) && v > 0)) throw new RangeError(`${name} must be a finite number > 0 (got ${v})`)
}

/** Throws a RangeError naming the first bad parameter of a kernel shape. */
export function checkKernelShape(k: KernelShape): void {
  positive('kernel.period', k.period)
  positive('kernel.decayTime', k.decayTime)
  if (k.kind === 'quasi-periodic') {
    if (!(Number.isFinite(k.roughness) && k.roughness >= 0)) throw new RangeError(`kernel.roughness must be a finite number ≥ 0 (got ${k.roughness})`)
  } else if (k.kind === 'rotation') {
    if (!(Number.isFinite(k.shape) && k.shape >= 0 && k.shape <= 1)) throw new RangeError(`kernel.shape must be in [0, 1] (got ${k.shape})`)
  } else {
    throw new RangeError(`kernel.kind must be 'quasi-periodic' or 'rotation' (got ${(k as { kind: unknown }).kind})`)
  }
}

/** Quasi-periodic κ(τ), unit variance at τ = 0. */
export function quasiPeriodic(tau: number, k: QuasiPeriodicShape): number {
  const s = Math.sin((Math.PI * tau) / k.period)
  return Math.exp(-(tau * tau) / (2 * k.decayTime * k.decayTime) - k.roughness * s * s)
}

/** The two damped-oscillator terms of the rotation kernel (unit total variance). */
export function rotationTerms(k: RotationShape): SemiseparableTerm[] {
  const c = 1 / k.decayTime
  const w1 = 1 / (1 + k.shape), w2 = k.shape / (1 + k.shape)
  const terms: SemiseparableTerm[] = []
  for (const [j, w] of [[1, w1], [2, w2]] as const) {
    const d = (2 * Math.PI * j) / k.period
    terms.push({ a: w, b: (w * c) / d, c, d })
  }
  return terms
}

/** Value of a sum of damped-oscillator terms at lag τ (element-by-element reference for the fast solver). */
export function termsValue(tau: number, terms: readonly SemiseparableTerm[]): number {
  const x = Math.abs(tau)
  let s = 0
  for (const { a, b, c, d } of terms) s += Math.exp(-c * x) * (a * Math.cos(d * x) + b * Math.sin(d * x))
  return s
}

/** Rotation κ(τ), unit variance at τ = 0, written directly from the formula in the module comment. */
export function rotation(tau: number, k: RotationShape): number {
  const x = Math.abs(tau)
  const env = Math.exp(-x / k.decayTime)
  let s = 0
  for (const j of [1, 2]) {
    const w = j === 1 ? 1 / (1 + k.shape) : k.shape / (1 + k.shape)
    const om = (2 * Math.PI * j) / k.period
    s += w * (Math.cos(om * x) + Math.sin(om * x) / (om * k.decayTime))
  }
  return env * s
}

/** κ(τ) of either kernel. */
export function kernelValue(tau: number, k: KernelShape): number {
  return k.kind === 'quasi-periodic' ? quasiPeriodic(tau, k) : rotation(tau, k)
}

/**
 * O(N) Gaussian-process algebra for sums of damped-oscillator terms k(τ) = e^{−cτ}[a cos(dτ) + b sin(dτ)]:
 * the semiseparable Cholesky factorisation of Foreman-Mackey, Agol, Ambikasaran & Angus 2017, AJ 154,
 * 220, §5, in its pre-conditioned form (the φ factors keep every exponential ≤ 1, so no overflow at
 * long baselines). For sorted times t_1 ≤ … ≤ t_N and J = 2 × (number of terms) columns,
 *   C = diag(A) + tril(U Vᵀ, −1)∘Φ + its transpose,   U_n = s_n[a cos dt_n + b sin dt_n, a sin dt_n − b cos dt_n],
 *   V_n = s_n[cos dt_n, sin dt_n],  A_n = noise_n + s_n² Σ a,  Φ from e^{−c(t_n − t_{n−1})},
 * factored as C = L D Lᵀ with L = I + tril(U Wᵀ)∘Φ (unit lower), D diagonal:
 *   S_n = φ_n(S_{n−1} + D_{n−1} W_{n−1} W_{n−1}ᵀ)φ_n,  D_n = A_n − U_nᵀ S_n U_n,  W_n = (V_n − S_n U_n)/D_n.
 * ln det C = Σ ln D_n; the solves are one forward and one backward sweep. Cost O(N J²).
 * Times are taken relative to the first one so the phases stay small at full Julian days.
 */
import type { SemiseparableTerm } from './kernels.ts'

/** The L D Lᵀ factor of a semiseparable covariance, kept for solves and predictions. */
export interface SemiseparableFactor {
  n: number
  /** Columns: 2 per term. */
  J: number
  /** Times relative to t0 (sorted, non-decreasing). */
  x: Float64Array
  t0: number
  terms: readonly SemiseparableTerm[]
  scale: Float64Array
  U: Float64Array
  W: Float64Array
  D: Float64Array
  logDet: number
}

/** Throws unless t is non-decreasing (the solver needs sorted times). */
export function checkSorted(t: Float64Array): void {
  for (let i = 1; i < t.length; i++) {
    if (!(t[i] >= t[i - 1])) throw new RangeError(`t must be sorted in time for the fast GP (t[${i}] = ${t[i]} < t[${i - 1}] = ${t[i - 1]})`)
  }
}

function fillRow(x: number, s: number, terms: readonly SemiseparableTerm[], u: Float64Array, v: Float64Array, off: number): void {
  for (let j = 0; j < terms.length; j++) {
    const { a, b, d } = terms[j]
    const cs = Math.cos(d * x), sn = Math.sin(d * x)
    u[off + 2 * j] = s * (a * cs + b * sn)
    u[off + 2 * j + 1] = s * (a * sn - b * cs)
    v[off + 2 * j] = s * cs
    v[off + 2 * j + 1] = s * sn
  }
}

function totalVariance(terms: readonly SemiseparableTerm[]): number {
  let s = 0
  for (const t of terms) s += t.a
  return s
}

const NOT_PD = 'the GP covariance is not positive definite (check the kernel parameters and that every error or jitter is > 0)'

/**
 * ln N(y | 0, C) in one pass with O(J²) memory (factorisation and forward solve fused):
 * −½(Σ z_n²/D_n + Σ ln D_n + N ln 2π) where L z = y.
 * The rotation kernel's pair of terms (the second at twice the first's frequency, same decay) takes
 * `rotationPairLogLikelihood`, the same recursion written out for J = 4; any other set of terms the
 * general loop `semiseparableLogLikelihoodGeneral` (its tested reference).
 */
export function semiseparableLogLikelihood(
  t: Float64Array, scale: Float64Array, noiseVar: Float64Array, terms: readonly SemiseparableTerm[], y: Float64Array,
): number {
  if (terms.length === 2 && isRotationPair(terms[0], terms[1])) return rotationPairLogLikelihood(t, scale, noiseVar, terms[0], terms[1], y)
  return semiseparableLogLikelihoodGeneral(t, scale, noiseVar, terms, y)
}

/** True when q2 is q1's first harmonic with the same decay (cos/sin by double angles, one shared φ). */
function isRotationPair(q1: SemiseparableTerm, q2: SemiseparableTerm): boolean {
  return q2.c === q1.c && Math.abs(q2.d - 2 * q1.d) <= 1e-14 * q2.d
}

/**
 * `semiseparableLogLikelihood` for two terms sharing c with d₂ = 2d₁, every J = 4 vector and the
 * symmetric 4 × 4 S held in locals (no array traffic, no inner loops). With one decay rate all four
 * φ are equal, so the update is S ← φ²(S + D w wᵀ), f ← φ(f + w z). Same recursion, same order of
 * operations per element as the general loop up to φ_kφ_l = φ².
 */
export function rotationPairLogLikelihood(
  t: Float64Array, scale: Float64Array, noiseVar: Float64Array, q1: SemiseparableTerm, q2: SemiseparableTerm, y: Float64Array,
): number {
  const n = t.length
  const a1 = q1.a, b1 = q1.b, a2 = q2.a, b2 = q2.b, c = q1.c, d1 = q1.d
  const aTot = a1 + a2
  const t0 = n ? t[0] : 0
  // S (upper triangle), f, w
  let s00 = 0, s01 = 0, s02 = 0, s03 = 0, s11 = 0, s12 = 0, s13 = 0, s22 = 0, s23 = 0, s33 = 0
  let f0 = 0, f1 = 0, f2 = 0, f3 = 0, w0 = 0, w1 = 0, w2 = 0, w3 = 0
  let dPrev = 0, zPrev = 0, logDet = 0, quad = 0, prod = 1, tPrev = t0
  for (let i = 0; i < n; i++) {
    const ti = t[i], si = scale[i]
    const x = ti - t0
    const cs1 = Math.cos(d1 * x), sn1 = Math.sin(d1 * x)
    const cs2 = 2 * cs1 * cs1 - 1, sn2 = 2 * sn1 * cs1
    const u0 = si * (a1 * cs1 + b1 * sn1), u1 = si * (a1 * sn1 - b1 * cs1)
    const u2 = si * (a2 * cs2 + b2 * sn2), u3 = si * (a2 * sn2 - b2 * cs2)
    if (i > 0) {
      const p = Math.exp(-c * (ti - tPrev)), p2 = p * p
      const e0 = dPrev * w0, e1 = dPrev * w1, e2 = dPrev * w2, e3 = dPrev * w3
      s00 = p2 * (s00 + e0 * w0); s01 = p2 * (s01 + e0 * w1); s02 = p2 * (s02 + e0 * w2); s03 = p2 * (s03 + e0 * w3)
      s11 = p2 * (s11 + e1 * w1); s12 = p2 * (s12 + e1 * w2); s13 = p2 * (s13 + e1 * w3)
      s22 = p2 * (s22 + e2 * w2); s23 = p2 * (s23 + e2 * w3)
      s33 = p2 * (s33 + e3 * w3)
      f0 = p * (f0 + w0 * zPrev); f1 = p * (f1 + w1 * zPrev); f2 = p * (f2 + w2 * zPrev); f3 = p * (f3 + w3 * zPrev)
    }
    const g0 = s00 * u0 + s01 * u1 + s02 * u2 + s03 * u3
    const g1 = s01 * u0 + s11 * u1 + s12 * u2 + s13 * u3
    const g2 = s02 * u0 + s12 * u1 + s22 * u2 + s23 * u3
    const g3 = s03 * u0 + s13 * u1 + s23 * u2 + s33 * u3
    const d = noiseVar[i] + si * si * aTot - (u0 * g0 + u1 * g1 + u2 * g2 + u3 * g3)
    if (!(d > 0)) throw new RangeError(NOT_PD)
    const id = 1 / d
    w0 = (si * cs1 - g0) * id; w1 = (si * sn1 - g1) * id; w2 = (si * cs2 - g2) * id; w3 = (si * sn2 - g3) * id
    const z = y[i] - (u0 * f0 + u1 * f1 + u2 * f2 + u3 * f3)
    prod *= d
    if (prod > 1e150 || prod < 1e-150) { logDet += Math.log(prod); prod = 1 }
    quad += z * z * id
    dPrev = d; zPrev = z; tPrev = ti
  }
  logDet += Math.log(prod)
  return -0.5 * (quad + logDet + n * Math.log(2 * Math.PI))
}

/** `semiseparableLogLikelihood` for any number of terms (the plain loop; reference of the J = 4 path). */
export function semiseparableLogLikelihoodGeneral(
  t: Float64Array, scale: Float64Array, noiseVar: Float64Array, terms: readonly SemiseparableTerm[], y: Float64Array,
): number {
  const n = t.length, nt = terms.length, J = 2 * nt
  // Flat copies of the term coefficients (no object access in the loop).
  const ta = new Float64Array(nt), tb = new Float64Array(nt), tc = new Float64Array(nt), td = new Float64Array(nt)
  terms.forEach((q, j) => { ta[j] = q.a; tb[j] = q.b; tc[j] = q.c; td[j] = q.d })
  // Fewer transcendental calls (they dominate the cost): a term at exactly twice term 0's frequency
  // takes its cos/sin by the double-angle formulae, and terms sharing term 0's decay share its exp.
  const harmonic = new Uint8Array(nt), sameDecay = new Uint8Array(nt)
  for (let j = 1; j < nt; j++) {
    harmonic[j] = Math.abs(td[j] - 2 * td[0]) <= 1e-14 * td[j] ? 1 : 0
    sameDecay[j] = tc[j] === tc[0] ? 1 : 0
  }
  const cosv = new Float64Array(nt), sinv = new Float64Array(nt)
  const S = new Float64Array(J * J), f = new Float64Array(J)
  const u = new Float64Array(J), v = new Float64Array(J), w = new Float64Array(J), tmp = new Float64Array(J)
  const phi = new Float64Array(J)
  const a0 = totalVariance(terms)
  const t0 = n ? t[0] : 0
  let dPrev = 0, zPrev = 0, logDet = 0, quad = 0, prod = 1
  for (let i = 0; i < n; i++) {
    const x = t[i] - t0, si = scale[i]
    for (let j = 0; j < nt; j++) {
      let cs: number, sn: number
      if (harmonic[j]) { const c1 = cosv[0], s1 = sinv[0]; cs = 2 * c1 * c1 - 1; sn = 2 * s1 * c1 } // cos 2θ, sin 2θ from term 0
      else { cs = Math.cos(td[j] * x); sn = Math.sin(td[j] * x) }
      cosv[j] = cs; sinv[j] = sn
      u[2 * j] = si * (ta[j] * cs + tb[j] * sn)
      u[2 * j + 1] = si * (ta[j] * sn - tb[j] * cs)
      v[2 * j] = si * cs
      v[2 * j + 1] = si * sn
    }
    if (i > 0) {
      const dt = t[i] - t[i - 1]
      for (let j = 0; j < nt; j++) { const p = sameDecay[j] ? phi[0] : Math.exp(-tc[j] * dt); phi[2 * j] = p; phi[2 * j + 1] = p }
      for (let k = 0; k < J; k++) {
        const wk = dPrev * w[k], pk = phi[k]
        const row = k * J
        for (let l = 0; l <= k; l++) {
          const val = pk * phi[l] * (S[row + l] + wk * w[l])
          S[row + l] = val
          S[l * J + k] = val
        }
        f[k] = pk * (f[k] + w[k] * zPrev)
      }
    }
    let uSu = 0, uf = 0
    for (let k = 0; k < J; k++) {
      let acc = 0
      const row = k * J
      for (let l = 0; l < J; l++) acc += S[row + l] * u[l]
      tmp[k] = acc
      uSu += u[k] * acc
      uf += u[k] * f[k]
    }
    const d = noiseVar[i] + si * si * a0 - uSu
    if (!(d > 0)) throw new RangeError(NOT_PD)
    const id = 1 / d
    for (let k = 0; k < J; k++) w[k] = (v[k] - tmp[k]) * id
    const z = y[i] - uf
    // ln det as Σ ln of running products (one log per block, flushed before over/underflow)
    prod *= d
    if (prod > 1e150 || prod < 1e-150) { logDet += Math.log(prod); prod = 1 }
    quad += z * z * id
    dPrev = d; zPrev = z
  }
  logDet += Math.log(prod)
  return -0.5 * (quad + logDet + n * Math.log(2 * Math.PI))
}

/**
 * In one pass (factorisation fused with the forward solves, O(N J²) time and O(J² + R²) memory):
 * ln det C and the Gram matrix G_pq = v_pᵀ C⁻¹ v_q of R right-hand sides, from L z_p = v_p as
 * Σ_n z_pn z_qn / D_n. Everything a generalised least-squares fit needs (AᵀC⁻¹A, AᵀC⁻¹r, rᵀC⁻¹r)
 * without storing the factor. Same transcendental savings as `semiseparableLogLikelihood`.
 */
export function semiseparableGram(
  t: Float64Array, scale: Float64Array, noiseVar: Float64Array, terms: readonly SemiseparableTerm[], rhs: readonly Float64Array[],
): { logDet: number; gram: Float64Array } {
  const n = t.length, nt = terms.length, J = 2 * nt, R = rhs.length
  const ta = new Float64Array(nt), tb = new Float64Array(nt), tc = new Float64Array(nt), td = new Float64Array(nt)
  terms.forEach((q, j) => { ta[j] = q.a; tb[j] = q.b; tc[j] = q.c; td[j] = q.d })
  const harmonic = new Uint8Array(nt), sameDecay = new Uint8Array(nt)
  for (let j = 1; j < nt; j++) {
    harmonic[j] = Math.abs(td[j] - 2 * td[0]) <= 1e-14 * td[j] ? 1 : 0
    sameDecay[j] = tc[j] === tc[0] ? 1 : 0
  }
  const cosv = new Float64Array(nt), sinv = new Float64Array(nt)
  const S = new Float64Array(J * J), F = new Float64Array(R * J)
  const u = new Float64Array(J), v = new Float64Array(J), w = new Float64Array(J), tmp = new Float64Array(J), phi = new Float64Array(J)
  const zPrev = new Float64Array(R), z = new Float64Array(R)
  const gram = new Float64Array(R * R)
  const a0 = totalVariance(terms)
  const t0 = n ? t[0] : 0
  let dPrev = 0, logDet = 0, prod = 1
  for (let i = 0; i < n; i++) {
    const x = t[i] - t0, si = scale[i]
    for (let j = 0; j < nt; j++) {
      let cs: number, sn: number
      if (harmonic[j]) { const c1 = cosv[0], s1 = sinv[0]; cs = 2 * c1 * c1 - 1; sn = 2 * s1 * c1 }
      else { cs = Math.cos(td[j] * x); sn = Math.sin(td[j] * x) }
      cosv[j] = cs; sinv[j] = sn
      u[2 * j] = si * (ta[j] * cs + tb[j] * sn)
      u[2 * j + 1] = si * (ta[j] * sn - tb[j] * cs)
      v[2 * j] = si * cs
      v[2 * j + 1] = si * sn
    }
    if (i > 0) {
      const dt = t[i] - t[i - 1]
      for (let j = 0; j < nt; j++) { const p = sameDecay[j] ? phi[0] : Math.exp(-tc[j] * dt); phi[2 * j] = p; phi[2 * j + 1] = p }
      for (let k = 0; k < J; k++) {
        const wk = dPrev * w[k], pk = phi[k]
        for (let l = 0; l <= k; l++) {
          const val = pk * phi[l] * (S[k * J + l] + wk * w[l])
          S[k * J + l] = val
          S[l * J + k] = val
        }
        for (let r = 0; r < R; r++) F[r * J + k] = pk * (F[r * J + k] + w[k] * zPrev[r])
      }
    }
    let uSu = 0
    for (let k = 0; k < J; k++) {
      let acc = 0
      for (let l = 0; l < J; l++) acc += S[k * J + l] * u[l]
      tmp[k] = acc
      uSu += u[k] * acc
    }
    const d = noiseVar[i] + si * si * a0 - uSu
    if (!(d > 0)) throw new RangeError(NOT_PD)
    const id = 1 / d
    for (let k = 0; k < J; k++) w[k] = (v[k] - tmp[k]) * id
    for (let r = 0; r < R; r++) {
      let uf = 0
      for (let k = 0; k < J; k++) uf += u[k] * F[r * J + k]
      z[r] = rhs[r][i] - uf
    }
    for (let p = 0; p < R; p++) { const zp = z[p] * id; for (let q = 0; q <= p; q++) gram[p * R + q] += zp * z[q] }
    prod *= d
    if (prod > 1e150 || prod < 1e-150) { logDet += Math.log(prod); prod = 1 }
    zPrev.set(z)
    dPrev = d
  }
  logDet += Math.log(prod)
  for (let p = 0; p < R; p++) for (let q = 0; q < p; q++) gram[q * R + p] = gram[p * R + q]
  return { logDet, gram }
}

/** Factors C = L D Lᵀ and keeps U, W, D for solves and predictions. Times must be sorted. */
export function semiseparableFactor(
  t: Float64Array, scale: Float64Array, noiseVar: Float64Array, terms: readonly SemiseparableTerm[],
): SemiseparableFactor {
  checkSorted(t)
  const n = t.length, nt = terms.length, J = 2 * nt
  const t0 = n ? t[0] : 0
  const x = new Float64Array(n)
  const U = new Float64Array(n * J), V = new Float64Array(n * J), W = new Float64Array(n * J), D = new Float64Array(n)
  const S = new Float64Array(J * J), tmp = new Float64Array(J), phi = new Float64Array(J)
  const a0 = totalVariance(terms)
  let logDet = 0
  for (let i = 0; i < n; i++) {
    x[i] = t[i] - t0
    fillRow(x[i], scale[i], terms, U, V, i * J)
    if (i > 0) {
      const dt = x[i] - x[i - 1]
      for (let j = 0; j < nt; j++) { const p = Math.exp(-terms[j].c * dt); phi[2 * j] = p; phi[2 * j + 1] = p }
      const o = (i - 1) * J
      for (let k = 0; k < J; k++) {
        const wk = D[i - 1] * W[o + k]
        for (let l = 0; l < J; l++) S[k * J + l] = phi[k] * phi[l] * (S[k * J + l] + wk * W[o + l])
      }
    }
    let uSu = 0
    for (let k = 0; k < J; k++) {
      let s = 0
      for (let l = 0; l < J; l++) s += S[k * J + l] * U[i * J + l]
      tmp[k] = s
      uSu += U[i * J + k] * s
    }
    const d = noiseVar[i] + scale[i] * scale[i] * a0 - uSu
    if (!(d > 0)) throw new RangeError(NOT_PD)
    D[i] = d
    for (let k = 0; k < J; k++) W[i * J + k] = (V[i * J + k] - tmp[k]) / d
    logDet += Math.log(d)
  }
  return { n, J, x, t0, terms, scale, U, W, D, logDet }
}

function decay(f: SemiseparableFactor, dt: number, phi: Float64Array): void {
  for (let j = 0; j < f.terms.length; j++) { const p = Math.exp(-f.terms[j].c * dt); phi[2 * j] = p; phi[2 * j + 1] = p }
}

/** Solves L z = y in place (unit lower triangular; D not applied). */
export function semiseparableForward(f: SemiseparableFactor, y: Float64Array): Float64Array {
  const { n, J, U, W, x } = f
  const acc = new Float64Array(J), phi = new Float64Array(J)
  for (let i = 1; i < n; i++) {
    decay(f, x[i] - x[i - 1], phi)
    let uf = 0
    for (let k = 0; k < J; k++) {
      acc[k] = phi[k] * (acc[k] + W[(i - 1) * J + k] * y[i - 1])
      uf += U[i * J + k] * acc[k]
    }
    y[i] -= uf
  }
  return y
}

/** Solves Lᵀ x = z in place. */
export function semiseparableBackward(f: SemiseparableFactor, z: Float64Array): Float64Array {
  const { n, J, U, W, x } = f
  const acc = new Float64Array(J), phi = new Float64Array(J)
  for (let i = n - 2; i >= 0; i--) {
    decay(f, x[i + 1] - x[i], phi)
    let wg = 0
    for (let k = 0; k < J; k++) {
      acc[k] = phi[k] * (acc[k] + U[(i + 1) * J + k] * z[i + 1])
      wg += W[i * J + k] * acc[k]
    }
    z[i] -= wg
  }
  return z
}

/** C⁻¹ y (new array). */
export function semiseparableSolve(f: SemiseparableFactor, y: Float64Array): Float64Array {
  const z = semiseparableForward(f, Float64Array.from(y))
  for (let i = 0; i < f.n; i++) z[i] /= f.D[i]
  return semiseparableBackward(f, z)
}

/** ln N(y | 0, C) from a factor. */
export function semiseparableFactorLogLikelihood(f: SemiseparableFactor, y: Float64Array): number {
  const z = semiseparableForward(f, Float64Array.from(y))
  let q = 0
  for (let i = 0; i < f.n; i++) q += (z[i] * z[i]) / f.D[i]
  return -0.5 * (q + f.logDet + f.n * Math.log(2 * Math.PI))
}

/**
 * Predictive mean k*ᵀα at test times (any order) in O(N + M log M): one forward sweep gathers the
 * data at or before each test time, one backward sweep those after it (each a J-vector decayed by
 * e^{−cΔt}). Variance, when asked, is s*²Σa − k*ᵀC⁻¹k* with one O(N) forward solve per test time,
 * so O(N·M) in all — meant for plot grids.
 */
export function semiseparablePredict(
  f: SemiseparableFactor, alpha: Float64Array, tStar: Float64Array, scaleStar: number, withVariance: boolean,
): { mean: Float64Array; variance: Float64Array | null } {
  const { n, J, terms, x, scale } = f
  const nt = terms.length
  const m = tStar.length
  const order = Array.from({ length: m }, (_, i) => i).sort((p, q) => tStar[p] - tStar[q])
  const mean = new Float64Array(m)
  const us = new Float64Array(J), vs = new Float64Array(J), un = new Float64Array(J), vn = new Float64Array(J)
  // Forward: data with x_n ≤ x*.
  const F = new Float64Array(J)
  let i = 0, xF = 0
  for (const p of order) {
    const xs = tStar[p] - f.t0
    while (i < n && x[i] <= xs) {
      fillRow(x[i], scale[i], terms, un, vn, 0)
      for (let j = 0; j < nt; j++) {
        const e = i === 0 ? 0 : Math.exp(-terms[j].c * (x[i] - xF))
        for (const k of [2 * j, 2 * j + 1]) F[k] = F[k] * e + vn[k] * alpha[i]
      }
      xF = x[i]; i++
    }
    if (i > 0) {
      fillRow(xs, scaleStar, terms, us, vs, 0)
      let s = 0
      for (let j = 0; j < nt; j++) {
        const e = Math.exp(-terms[j].c * (xs - xF))
        s += e * (us[2 * j] * F[2 * j] + us[2 * j + 1] * F[2 * j + 1])
      }
      mean[p] += s
    }
  }
  // Backward: data with x_n > x*.
  const G = new Float64Array(J)
  i = n - 1
  let xG = 0, started = false
  for (let q = m - 1; q >= 0; q--) {
    const p = order[q]
    const xs = tStar[p] - f.t0
    while (i >= 0 && x[i] > xs) {
      fillRow(x[i], scale[i], terms, un, vn, 0)
      for (let j = 0; j < nt; j++) {
        const e = started ? Math.exp(-terms[j].c * (xG - x[i])) : 0
        for (const k of [2 * j, 2 * j + 1]) G[k] = G[k] * e + un[k] * alpha[i]
      }
      xG = x[i]; started = true; i--
    }
    if (started) {
      fillRow(xs, scaleStar, terms, us, vs, 0)
      let s = 0
      for (let j = 0; j < nt; j++) {
        const e = Math.exp(-terms[j].c * (xG - xs))
        s += e * (vs[2 * j] * G[2 * j] + vs[2 * j + 1] * G[2 * j + 1])
      }
      mean[p] += s
    }
  }
  let variance: Float64Array | null = null
  if (withVariance) {
    variance = new Float64Array(m)
    const k0 = scaleStar * scaleStar * totalVariance(terms)
    const ks = new Float64Array(n)
    for (let p = 0; p < m; p++) {
      const xs = tStar[p] - f.t0
      for (let r = 0; r < n; r++) {
        let kv = 0
        const tau = Math.abs(xs - x[r])
        for (const { a, b, c, d } of terms) kv += Math.exp(-c * tau) * (a * Math.cos(d * tau) + b * Math.sin(d * tau))
        ks[r] = scaleStar * scale[r] * kv
      }
      semiseparableForward(f, ks)
      let q = 0
      for (let r = 0; r < n; r++) q += (ks[r] * ks[r]) / f.D[r]
      variance[p] = Math.max(0, k0 - q)
    }
  }
  return { mean, variance }
}

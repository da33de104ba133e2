/**
 * Dense Gaussian-process algebra, O(N³) by Cholesky — the readable reference for any kernel, and the
 * only path for the quasi-periodic kernel (which has no semiseparable form). Rasmussen & Williams 2006,
 * "Gaussian Processes for Machine Learning", Algorithm 2.1: L = chol(C), α = Lᵀ\(L\y),
 * ln L = −½ yᵀα − Σ ln L_ii − (N/2) ln 2π, predictive mean k*ᵀα and variance k** − |L\k*|².
 *
 * Covariance: C_ij = s_i s_j κ(t_i − t_j) + δ_ij n_i, with s the per-point amplitude (m/s, the
 * instrument's) and n the white-noise variance (error² + jitter²).
 */

/** The Cholesky factor of a dense covariance and what predictions need. */
export interface DenseFactor {
  n: number
  /** Row-major N×N; the lower triangle holds L (C = L Lᵀ). */
  L: Float64Array
  /** ln det C = 2 Σ ln L_ii. */
  logDet: number
  t: Float64Array
  scale: Float64Array
  kappa: (tau: number) => number
}

/** Builds C element by element (both triangles), row-major N×N. */
export function denseCovariance(t: Float64Array, scale: Float64Array, noiseVar: Float64Array, kappa: (tau: number) => number): Float64Array {
  const n = t.length
  const c = new Float64Array(n * n)
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      const v = scale[i] * scale[j] * kappa(t[i] - t[j])
      c[i * n + j] = v
      c[j * n + i] = v
    }
    c[i * n + i] += noiseVar[i]
  }
  return c
}

/**
 * In-place Cholesky C = L Lᵀ (row by row, Cholesky–Banachiewicz: both inner operands are contiguous
 * row prefixes). Rows are taken four at a time so each earlier row is read once for all four (a
 * quarter of the memory traffic, four independent sums). Returns false if C is not numerically
 * positive definite. `choleskyRowByRow` is the plain one-row form, kept as its reference.
 */
export function choleskyInPlace(a: Float64Array, n: number): boolean {
  let i0 = 0
  for (; i0 + 3 < n; i0 += 4) {
    const r0 = i0 * n, r1 = r0 + n, r2 = r1 + n, r3 = r2 + n
    // columns j < i0: four rows against row j at once
    for (let j = 0; j < i0; j++) {
      const rj = j * n
      let s0 = 0, s1 = 0, s2 = 0, s3 = 0
      for (let k = 0; k < j; k++) {
        const l = a[rj + k]
        s0 += a[r0 + k] * l; s1 += a[r1 + k] * l; s2 += a[r2 + k] * l; s3 += a[r3 + k] * l
      }
      const d = a[rj + j]
      a[r0 + j] = (a[r0 + j] - s0) / d
      a[r1 + j] = (a[r1 + j] - s1) / d
      a[r2 + j] = (a[r2 + j] - s2) / d
      a[r3 + j] = (a[r3 + j] - s3) / d
    }
    // the 4 × 4 diagonal block, row by row
    for (let i = i0; i < i0 + 4; i++) {
      const ri = i * n
      for (let j = i0; j <= i; j++) {
        const rj = j * n
        let s = 0
        for (let k = 0; k < j; k++) s += a[ri + k] * a[rj + k]
        const v = a[ri + j] - s
        if (i === j) {
          if (!(v > 0)) return false
          a[ri + i] = Math.sqrt(v)
        } else a[ri + j] = v / a[rj + j]
      }
    }
  }
  return choleskyRows(a, n, i0)
}

/** Rows from..n−1 of the row-by-row Cholesky (rows before `from` already factored). */
function choleskyRows(a: Float64Array, n: number, from: number): boolean {
  for (let i = from; i < n; i++) {
    const ri = i * n
    for (let j = 0; j <= i; j++) {
      const rj = j * n
      let s = 0
      for (let k = 0; k < j; k++) s += a[ri + k] * a[rj + k]
      const v = a[ri + j] - s
      if (i === j) {
        if (!(v > 0)) return false
        a[ri + i] = Math.sqrt(v)
      } else a[ri + j] = v / a[rj + j]
    }
  }
  return true
}

/** The plain row-by-row Cholesky (the readable reference of `choleskyInPlace`). */
export function choleskyRowByRow(a: Float64Array, n: number): boolean {
  return choleskyRows(a, n, 0)
}

/** Solves L z = b in place (forward substitution). */
export function forwardSolve(L: Float64Array, n: number, b: Float64Array): Float64Array {
  for (let i = 0; i < n; i++) {
    let s = b[i]
    const ri = i * n
    for (let k = 0; k < i; k++) s -= L[ri + k] * b[k]
    b[i] = s / L[ri + i]
  }
  return b
}

/** Solves Lᵀ x = z in place (back substitution). */
export function backSolve(L: Float64Array, n: number, z: Float64Array): Float64Array {
  for (let i = n - 1; i >= 0; i--) {
    let s = z[i]
    for (let k = i + 1; k < n; k++) s -= L[k * n + i] * z[k]
    z[i] = s / L[i * n + i]
  }
  return z
}

/** Factors the covariance; throws if it is not positive definite (a kernel or noise error). */
export function denseFactor(t: Float64Array, scale: Float64Array, noiseVar: Float64Array, kappa: (tau: number) => number): DenseFactor {
  const n = t.length
  const L = denseCovariance(t, scale, noiseVar, kappa)
  if (!choleskyInPlace(L, n)) throw new RangeError('the GP covariance is not positive definite (check the kernel parameters and that every error or jitter is > 0)')
  let logDet = 0
  for (let i = 0; i < n; i++) logDet += 2 * Math.log(L[i * n + i])
  return { n, L, logDet, t, scale, kappa }
}

/** x = C⁻¹ y (new array). */
export function denseSolve(f: DenseFactor, y: Float64Array): Float64Array {
  return backSolve(f.L, f.n, forwardSolve(f.L, f.n, Float64Array.from(y)))
}

/** ln N(y | 0, C) = −½ yᵀC⁻¹y − ½ ln det C − (N/2) ln 2π. */
export function denseLogLikelihood(f: DenseFactor, y: Float64Array): number {
  const z = forwardSolve(f.L, f.n, Float64Array.from(y))
  let q = 0
  for (let i = 0; i < f.n; i++) q += z[i] * z[i]
  return -0.5 * (q + f.logDet + f.n * Math.log(2 * Math.PI))
}

/**
 * Predictive mean and variance of the correlated part (amplitude `scale` at the test times) given
 * α = C⁻¹y: mean = k*ᵀα, variance = scale² κ(0) − |L⁻¹k*|² (noise-free, the latent curve).
 */
export function densePredict(
  f: DenseFactor, alpha: Float64Array, tStar: Float64Array, scaleStar: number, withVariance: boolean,
): { mean: Float64Array; variance: Float64Array | null } {
  const m = tStar.length, n = f.n
  const mean = new Float64Array(m)
  const variance = withVariance ? new Float64Array(m) : null
  const ks = new Float64Array(n)
  const k0 = scaleStar * scaleStar * f.kappa(0)
  for (let p = 0; p < m; p++) {
    let mu = 0
    for (let i = 0; i < n; i++) {
      ks[i] = scaleStar * f.scale[i] * f.kappa(tStar[p] - f.t[i])
      mu += ks[i] * alpha[i]
    }
    mean[p] = mu
    if (variance) {
      forwardSolve(f.L, n, ks)
      let q = 0
      for (let i = 0; i < n; i++) q += ks[i] * ks[i]
      variance[p] = Math.max(0, k0 - q)
    }
  }
  return { mean, variance }
}

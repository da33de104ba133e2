/**
 * Dense Gaussian-process algebra, O(N³) by Cholesky — the readable reference for any kernel, and the
 * only path for the quasi-periodic kernel (which has no semiseparable form). Rasmussen & Williams 2006,
 * "Gaussian Processes for Machine Learning", Algorithm 2.1: L = chol(C), α = Lᵀ\(L\y),
 * ln L = −½ yᵀα − Σ ln L_ii − (N/2) ln 2π, predictive mean k*ᵀα and variance k** − |L\k*|².
 *
 * Covariance: C_ij = s_i s_j κ(t_i − t_j) + δ_ij n_i, with s the per-point amplitude (m/s, the
 * instrument's) and n the white-noise variance (error² + jitter²).
 */
import { choleskyWasm } from './dense-wasm.ts'

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
 * Order from which `choleskyInPlace` hands the factorisation to WebAssembly (measured: below it,
 * copying in and out and the scalar diagonal blocks cost more than the SIMD update saves).
 */
export const WASM_MIN_N = 64

/**
 * In-place Cholesky C = L Lᵀ of the row-major n × n `a`: the lower triangle is read and replaced by
 * L, the upper triangle is left as it was. Returns false if C is not numerically positive definite.
 * From WASM_MIN_N rows on, the WebAssembly SIMD kernel (dense-wasm.ts: blocked, the trailing update
 * as a register-tiled matrix product; measured about 2× faster than `choleskyTiled` at N = 100, 3× at
 * 200, 5× at 1000); below that, or where WebAssembly is unavailable, `choleskyTiled`. Both agree
 * with `choleskyRowByRow` to rounding (tests/shared/rv/gp/dense.spec.ts). An `a` from
 * dense-wasm.ts `wasmMatrix(n)` is factored where it lies in the kernel's memory (no copy in or out;
 * its upper triangle is scratch then).
 */
export function choleskyInPlace(a: Float64Array, n: number): boolean {
  if (n >= WASM_MIN_N) {
    const ok = choleskyWasm(a, n)
    if (ok !== null) return ok
  }
  return choleskyTiled(a, n)
}

/**
 * The TypeScript Cholesky (Cholesky–Banachiewicz, rows of L in order; both inner operands are
 * contiguous row prefixes). Register-tiled: rows are taken four at a time and, against them, the
 * earlier rows four at a time, so one pass over k feeds sixteen independent sums (4 × 4 tile, eight
 * loads per sixteen multiply–adds, no reduction chain longer than the tile); the tile's own columns
 * are then finished in order. The 4 × 4 diagonal blocks and the last n mod 4 rows go row by row.
 * Returns false if C is not numerically positive definite. `choleskyRowByRow` is the plain form,
 * kept as its reference (same factor to rounding; tests/shared/rv/gp/dense.spec.ts). A partial
 * factor is left in `a` when it returns false.
 */
export function choleskyTiled(a: Float64Array, n: number): boolean {
  let i0 = 0
  for (; i0 + 3 < n; i0 += 4) {
    const r0 = i0 * n, r1 = r0 + n, r2 = r1 + n, r3 = r2 + n
    for (let j0 = 0; j0 < i0; j0 += 4) {
      const q0 = j0 * n, q1 = q0 + n, q2 = q1 + n, q3 = q2 + n
      let s00 = 0, s01 = 0, s02 = 0, s03 = 0, s10 = 0, s11 = 0, s12 = 0, s13 = 0
      let s20 = 0, s21 = 0, s22 = 0, s23 = 0, s30 = 0, s31 = 0, s32 = 0, s33 = 0
      for (let k = 0; k < j0; k++) {
        const b0 = a[q0 + k], b1 = a[q1 + k], b2 = a[q2 + k], b3 = a[q3 + k]
        let x = a[r0 + k]; s00 += x * b0; s01 += x * b1; s02 += x * b2; s03 += x * b3
        x = a[r1 + k]; s10 += x * b0; s11 += x * b1; s12 += x * b2; s13 += x * b3
        x = a[r2 + k]; s20 += x * b0; s21 += x * b1; s22 += x * b2; s23 += x * b3
        x = a[r3 + k]; s30 += x * b0; s31 += x * b1; s32 += x * b2; s33 += x * b3
      }
      // finish the four columns j0..j0+3 in order (in-tile terms k = j0..j−1)
      let d = a[q0 + j0]
      const l00 = (a[r0 + j0] - s00) / d, l10 = (a[r1 + j0] - s10) / d, l20 = (a[r2 + j0] - s20) / d, l30 = (a[r3 + j0] - s30) / d
      a[r0 + j0] = l00; a[r1 + j0] = l10; a[r2 + j0] = l20; a[r3 + j0] = l30
      let c = a[q1 + j0]; d = a[q1 + j0 + 1]
      const l01 = (a[r0 + j0 + 1] - s01 - l00 * c) / d, l11 = (a[r1 + j0 + 1] - s11 - l10 * c) / d
      const l21 = (a[r2 + j0 + 1] - s21 - l20 * c) / d, l31 = (a[r3 + j0 + 1] - s31 - l30 * c) / d
      a[r0 + j0 + 1] = l01; a[r1 + j0 + 1] = l11; a[r2 + j0 + 1] = l21; a[r3 + j0 + 1] = l31
      c = a[q2 + j0]; let c2 = a[q2 + j0 + 1]; d = a[q2 + j0 + 2]
      const l02 = (a[r0 + j0 + 2] - s02 - l00 * c - l01 * c2) / d, l12 = (a[r1 + j0 + 2] - s12 - l10 * c - l11 * c2) / d
      const l22 = (a[r2 + j0 + 2] - s22 - l20 * c - l21 * c2) / d, l32 = (a[r3 + j0 + 2] - s32 - l30 * c - l31 * c2) / d
      a[r0 + j0 + 2] = l02; a[r1 + j0 + 2] = l12; a[r2 + j0 + 2] = l22; a[r3 + j0 + 2] = l32
      c = a[q3 + j0]; c2 = a[q3 + j0 + 1]; const c3 = a[q3 + j0 + 2]; d = a[q3 + j0 + 3]
      a[r0 + j0 + 3] = (a[r0 + j0 + 3] - s03 - l00 * c - l01 * c2 - l02 * c3) / d
      a[r1 + j0 + 3] = (a[r1 + j0 + 3] - s13 - l10 * c - l11 * c2 - l12 * c3) / d
      a[r2 + j0 + 3] = (a[r2 + j0 + 3] - s23 - l20 * c - l21 * c2 - l22 * c3) / d
      a[r3 + j0 + 3] = (a[r3 + j0 + 3] - s33 - l30 * c - l31 * c2 - l32 * c3) / d
    }
    for (let i = i0; i < i0 + 4; i++) {
      const ri = i * n
      for (let j = i0; j <= i; j++) {
        const rj = j * n
        let s = 0
        for (let k = 0; k < j; k++) s += a[ri + k] * a[rj + k]
        const v = a[ri + j] - s
        if (i === j) { if (!(v > 0)) return false; a[ri + i] = Math.sqrt(v) } else a[ri + j] = v / a[rj + j]
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

/** The plain row-by-row Cholesky (the readable reference of `choleskyTiled` and of the WebAssembly kernel). */
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

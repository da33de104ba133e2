/**
 * Small dense linear algebra for the fitter (n ≲ 50): row-major Float64Array matrices.
 * Private to shared/rv (not re-exported).
 */

/**
 * Cholesky factorisation A = L Lᵀ in place (lower triangle holds L). Returns false if A is not
 * numerically positive definite.
 */
export function cholesky(a: Float64Array, n: number): boolean {
  for (let j = 0; j < n; j++) {
    let d = a[j * n + j]
    for (let k = 0; k < j; k++) d -= a[j * n + k] * a[j * n + k]
    if (!(d > 0)) return false
    const l = Math.sqrt(d)
    a[j * n + j] = l
    for (let i = j + 1; i < n; i++) {
      let s = a[i * n + j]
      for (let k = 0; k < j; k++) s -= a[i * n + k] * a[j * n + k]
      a[i * n + j] = s / l
    }
  }
  return true
}

/** Solves L Lᵀ x = b given the factor from `cholesky`; b is overwritten with x. */
export function choleskySolve(l: Float64Array, n: number, b: Float64Array): Float64Array {
  for (let i = 0; i < n; i++) {
    let s = b[i]
    for (let k = 0; k < i; k++) s -= l[i * n + k] * b[k]
    b[i] = s / l[i * n + i]
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i]
    for (let k = i + 1; k < n; k++) s -= l[k * n + i] * b[k]
    b[i] = s / l[i * n + i]
  }
  return b
}

/**
 * Inverse of a symmetric positive semi-definite matrix. Uses Cholesky; if that fails, a
 * pseudo-inverse via Jacobi eigen-decomposition that drops directions with eigenvalues below
 * `rcond`·max (those parameters are unconstrained; their variances come out as Infinity).
 */
export function invertSymmetric(a: Float64Array, n: number, rcond = 1e-13): { inv: Float64Array; singular: boolean } {
  const l = Float64Array.from(a)
  if (cholesky(l, n)) {
    const inv = new Float64Array(n * n)
    const col = new Float64Array(n)
    for (let j = 0; j < n; j++) {
      col.fill(0); col[j] = 1
      choleskySolve(l, n, col)
      for (let i = 0; i < n; i++) inv[i * n + j] = col[i]
    }
    return { inv, singular: false }
  }
  const { values, vectors } = jacobiEigen(a, n)
  let max = 0
  for (const v of values) max = Math.max(max, Math.abs(v))
  const inv = new Float64Array(n * n)
  for (let k = 0; k < n; k++) {
    if (!(values[k] > rcond * max)) continue
    const w = 1 / values[k]
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) inv[i * n + j] += w * vectors[i * n + k] * vectors[j * n + k]
  }
  // Mark unconstrained parameters: those with weight on a dropped eigenvector.
  for (let k = 0; k < n; k++) {
    if (values[k] > rcond * max) continue
    for (let i = 0; i < n; i++) if (Math.abs(vectors[i * n + k]) > 1e-6) inv[i * n + i] = Infinity
  }
  return { inv, singular: true }
}

/** Cyclic Jacobi eigen-decomposition of a symmetric matrix (columns of `vectors` are eigenvectors). */
export function jacobiEigen(a0: Float64Array, n: number): { values: Float64Array; vectors: Float64Array } {
  const a = Float64Array.from(a0)
  const v = new Float64Array(n * n)
  for (let i = 0; i < n; i++) v[i * n + i] = 1
  for (let sweep = 0; sweep < 60; sweep++) {
    let off = 0
    for (let p = 0; p < n; p++) for (let q = p + 1; q < n; q++) off += a[p * n + q] * a[p * n + q]
    if (off < 1e-30) break
    for (let p = 0; p < n; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = a[p * n + q]
        if (apq === 0) continue
        const theta = (a[q * n + q] - a[p * n + p]) / (2 * apq)
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1))
        const c = 1 / Math.sqrt(t * t + 1), s = t * c
        for (let k = 0; k < n; k++) {
          const akp = a[k * n + p], akq = a[k * n + q]
          a[k * n + p] = c * akp - s * akq
          a[k * n + q] = s * akp + c * akq
        }
        for (let k = 0; k < n; k++) {
          const apk = a[p * n + k], aqk = a[q * n + k]
          a[p * n + k] = c * apk - s * aqk
          a[q * n + k] = s * apk + c * aqk
        }
        for (let k = 0; k < n; k++) {
          const vkp = v[k * n + p], vkq = v[k * n + q]
          v[k * n + p] = c * vkp - s * vkq
          v[k * n + q] = s * vkp + c * vkq
        }
      }
    }
  }
  const values = new Float64Array(n)
  for (let i = 0; i < n; i++) values[i] = a[i * n + i]
  return { values, vectors: v }
}

/**
 * The linear part of the RV model: one offset per instrument plus an optional linear or quadratic
 * trend in (t − epoch). At fixed Keplerians (and fixed weights) it is solved exactly by weighted
 * linear least squares (normal equations, Cholesky), which is the variable-projection idea of
 * Golub & Pereyra (1973, SIAM J. Numer. Anal. 10, 413): the non-linear optimiser only sees the
 * Keplerian parameters. The same columns are used by the start scan (`orbit-start.ts`), which
 * adds the Keplerian shape columns in front of them.
 */
import { cholesky, choleskySolve } from './linalg.ts'
import type { RvData } from './orbit-data.ts'
import type { TrendKind } from './orbit-fit-types.ts'

/** Number of trend coefficients of a trend kind (0, 1 or 2). */
export function trendTerms(trend: TrendKind): number {
  return trend === 'linear' ? 1 : trend === 'quadratic' ? 2 : 0
}

/**
 * Writes the linear-part design row of point i into `row[at …]`: instrument indicators (one 1,
 * the rest 0) followed by `nTrend` powers of (t − epoch). Returns nothing; `row` is reused.
 */
export function linearDesignRow(data: RvData, i: number, epoch: number, nTrend: number, row: Float64Array, at = 0): void {
  const nInst = data.instrumentNames.length
  for (let k = 0; k < nInst; k++) row[at + k] = 0
  row[at + data.instrument[i]] = 1
  if (nTrend) { const dt = data.t[i] - epoch; row[at + nInst] = dt; if (nTrend > 1) row[at + nInst + 1] = dt * dt }
}

/** Design-matrix entry j of the linear part for row i (offsets first, then trend powers). */
export function linearColumn(data: RvData, nInst: number, epoch: number, i: number, j: number): number {
  if (j < nInst) return data.instrument[i] === j ? 1 : 0
  const dt = data.t[i] - epoch
  return j === nInst ? dt : dt * dt
}

/** The linear part (offset of point i's instrument plus the trend) at coefficients β. */
function linearValue(data: RvData, epoch: number, nLin: number, beta: ArrayLike<number>, i: number): number {
  const nInst = data.instrumentNames.length
  let m = beta[data.instrument[i]]
  if (nLin > nInst) {
    const dt = data.t[i] - epoch
    m += beta[nInst] * dt
    if (nLin > nInst + 1) m += beta[nInst + 1] * dt * dt
  }
  return m
}

/** Reusable buffers of the linear solve (`nLin` = instruments + trend terms). */
export interface LinearScratch {
  ata: Float64Array
  atb: Float64Array
  /** The solution: offsets, then trend coefficients. */
  beta: Float64Array
  cols: Float64Array
}

export function linearScratch(nLin: number): LinearScratch {
  return { ata: new Float64Array(nLin * nLin), atb: new Float64Array(nLin), beta: new Float64Array(nLin), cols: new Float64Array(nLin) }
}

/**
 * Residuals y − kep − (offsets + trend) with the linear part solved by weighted least squares
 * (weights w). Writes `resid` and `s.beta`. Returns false if the normal matrix is singular.
 */
export function solveLinear(
  data: RvData, epoch: number, nLin: number, kep: ArrayLike<number>, w: ArrayLike<number>, s: LinearScratch, resid: Float64Array,
): boolean {
  const { ata, atb, beta, cols } = s
  const { y, t, instrument } = data
  const n = t.length
  const nInst = data.instrumentNames.length
  ata.fill(0); atb.fill(0)
  for (let i = 0; i < n; i++) {
    const r0 = y[i] - kep[i]
    const wi = w[i]
    const k = instrument[i]
    // offsets: diagonal block; trend columns dense
    ata[k * nLin + k] += wi
    atb[k] += wi * r0
    if (nLin > nInst) {
      const dt = t[i] - epoch
      cols[nInst] = dt
      if (nLin > nInst + 1) cols[nInst + 1] = dt * dt
      for (let a = nInst; a < nLin; a++) {
        atb[a] += wi * cols[a] * r0
        ata[a * nLin + k] += wi * cols[a]
        ata[k * nLin + a] += wi * cols[a]
        for (let b = nInst; b < nLin; b++) ata[a * nLin + b] += wi * cols[a] * cols[b]
      }
    }
  }
  const l = Float64Array.from(ata)
  if (!cholesky(l, nLin)) return false
  beta.set(atb)
  choleskySolve(l, nLin, beta)
  for (let i = 0; i < n; i++) resid[i] = y[i] - kep[i] - linearValue(data, epoch, nLin, beta, i)
  return true
}

/**
 * The weighted projection of many vectors onto the linear columns at one set of weights: the normal
 * matrix is built and factored once (`prepareProjection`), then `removeLinearFit` leaves d − Xβ(d)
 * for each d — the same as `solveLinear` of y − (y − d), without rebuilding the matrix.
 */
export interface LinearProjection { nLin: number; nInst: number; l: Float64Array; beta: Float64Array; epoch: number }

export function prepareProjection(data: RvData, epoch: number, nLin: number, w: ArrayLike<number>, s: LinearScratch, scratch: Float64Array): LinearProjection | null {
  // the normal matrix does not depend on the right-hand side: built by solveLinear's own loop
  solveLinear(data, epoch, nLin, data.y, w, s, scratch)
  const l = Float64Array.from(s.ata)
  if (!cholesky(l, nLin)) return null
  return { nLin, nInst: data.instrumentNames.length, l, beta: s.beta, epoch }
}

/** out = d − Xβ with β the weighted least-squares fit of d on the linear columns (see `prepareProjection`). */
export function removeLinearFit(data: RvData, p: LinearProjection, w: ArrayLike<number>, d: ArrayLike<number>, out: Float64Array): void {
  const { nLin, nInst, beta, epoch } = p
  const { t, instrument } = data
  const n = t.length
  beta.fill(0)
  for (let i = 0; i < n; i++) {
    const wd = w[i] * d[i]
    beta[instrument[i]] += wd
    if (nLin > nInst) { const dt = t[i] - epoch; beta[nInst] += wd * dt; if (nLin > nInst + 1) beta[nInst + 1] += wd * dt * dt }
  }
  choleskySolve(p.l, nLin, beta)
  for (let i = 0; i < n; i++) out[i] = d[i] - linearValue(data, epoch, nLin, beta, i)
}

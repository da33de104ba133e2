/**
 * Jitter of each instrument at fixed orbit: the one-dimensional maximum of the Ford (2006, ApJ 642,
 * 505) likelihood ln L = −½ Σ [r²/(σ² + s²) + ln 2π(σ² + s²)] in s², found by bisection on its
 * derivative, and the "jitter half-step" the optimiser alternates with its orbit steps.
 */
import type { FitLayout } from './orbit-fit-layout.ts'
import { setWeights, type Workspace } from './orbit-fit-objective.ts'

/**
 * One-dimensional ML jitter for one instrument from its residuals (Ford 2006 likelihood): the root
 * of d lnL/d(s²) by Newton's method kept inside a shrinking bracket (a bisection step whenever
 * Newton would leave it), from `start` (s, m/s; e.g. the previous jitter) when given.
 */
export function jitterMle(resid: ArrayLike<number>, dy: ArrayLike<number>, rows: ArrayLike<number>, start?: number): number {
  // g(v) = d lnL / d(s²) = ½ Σ [r²/(σ²+v)² − 1/(σ²+v)] (the ½ dropped); it falls from v = 0 across its root.
  const grad = (v: number): number => {
    let g = 0
    for (let j = 0; j < rows.length; j++) { const i = rows[j]; const V = dy[i] * dy[i] + v; g += resid[i] * resid[i] / (V * V) - 1 / V }
    return g
  }
  if (rows.length === 0 || grad(0) <= 0) return 0
  let hi = 0
  for (let j = 0; j < rows.length; j++) hi = Math.max(hi, resid[rows[j]] * resid[rows[j]])
  let lo = 0
  if (grad(hi) > 0) return Math.sqrt(hi)
  const s2 = start !== undefined ? start * start : NaN
  let v = s2 > lo && s2 < hi ? s2 : 0.5 * (lo + hi)
  for (let it = 0; it < 100; it++) {
    let g = 0, dg = 0
    for (let j = 0; j < rows.length; j++) {
      const i = rows[j]; const V = dy[i] * dy[i] + v; const r2 = resid[i] * resid[i]
      const iv = 1 / V
      g += iv * (r2 * iv - 1)
      dg += iv * iv * (1 - 2 * r2 * iv)
    }
    if (g > 0) lo = v; else hi = v
    if (g === 0 || hi - lo <= 1e-12 * hi) break
    let next = v - g / dg
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi)
    const moved = Math.abs(next - v)
    v = next
    if (moved <= 1e-13 * hi) break
  }
  return Math.sqrt(v)
}

/** Sets ML jitters from the workspace residuals and the weights from them; returns the largest change (m/s). */
export type JitterHook = () => number

/** Row indices of each instrument. */
export function instrumentRows(L: FitLayout): number[][] {
  const rowsOf: number[][] = Array.from({ length: L.nInst }, () => [])
  for (let i = 0; i < L.n; i++) rowsOf[L.data.instrument[i]].push(i)
  return rowsOf
}

/** The jitter half-step: updates `jit` in place from ws.resid, then the weights. */
export function jitterHook(L: FitLayout, ws: Workspace, jit: Float64Array, rowsOf: number[][]): JitterHook {
  return () => {
    let change = 0
    for (let k = 0; k < L.nInst; k++) {
      const s = jitterMle(ws.resid, L.data.dy, rowsOf[k], jit[k])
      change = Math.max(change, Math.abs(s - jit[k]))
      jit[k] = s
    }
    setWeights(L, ws, jit)
    return change
  }
}

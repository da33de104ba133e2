/**
 * Levenberg–Marquardt (Levenberg 1944; Marquardt 1963, SIAM J. Appl. Math. 11, 431, with its
 * diagonal scaling) on the whitened residual vector of `orbit-fit-objective.ts`, with the
 * variable-projection Jacobian of `orbit-fit-jacobian.ts` and projection onto the bounds (the
 * convergence test uses the projected gradient). A step is accepted only if it lowers the cost, so the recorded cost history never rises. Between accepted steps an optional jitter
 * half-step (`orbit-fit-jitter.ts`) re-solves the jitters: a coordinate ascent on ln L.
 */
import { cholesky, choleskySolve } from './linalg.ts'
import { project, projectGradient, type FitLayout } from './orbit-fit-layout.ts'
import { nGaussianPriors, residualVector, type Workspace } from './orbit-fit-objective.ts'
import { jacobian, jacobianScratch } from './orbit-fit-jacobian.ts'
import type { JitterHook } from './orbit-fit-jitter.ts'

const TWO_PI = 2 * Math.PI
/** Entries of the −2 ln L history (about two per iteration) over which FLAT_DROP is measured. */
const FLAT_SPAN = 20
/** A drop of −2 ln L below this over FLAT_SPAN entries (ln L by 5e-5 over about ten iterations) counts as converged. */
const FLAT_DROP = 1e-4

export interface LmOutcome { x: Float64Array; cost: number; iterations: number; status: 'converged' | 'max-iterations' | 'stalled'; history: number[] }

export function levenbergMarquardt(L: FitLayout, ws: Workspace, x0: Float64Array, maxIter: number, hook?: JitterHook): LmOutcome {
  const nf = L.nFree
  const m = L.n + nGaussianPriors(L)
  const r = new Float64Array(m), rt = new Float64Array(m)
  const kep = new Float64Array(L.n)
  const J = new Float64Array(m * nf)
  const jac = jacobianScratch(L)
  const gp = new Float64Array(nf)
  const x = Float64Array.from(x0)
  project(L, x)
  let cost = residualVector(L, ws, x, r, kep)
  const norm = (): number => { let s = 0; for (let i = 0; i < L.n; i++) s -= Math.log(ws.w[i] / TWO_PI); return s }
  const history = [cost + norm()]
  // Jitter half-step: ML jitters at the current residuals, then the cost at the new weights.
  const updateJitter = (): number => {
    if (!hook) return 0
    residualVector(L, ws, x, r, kep) // ws.resid at x (trial steps overwrite it)
    const change = hook()
    cost = residualVector(L, ws, x, r, kep)
    history.push(cost + norm())
    return change
  }
  if (!Number.isFinite(cost)) return { x, cost, iterations: 0, status: 'stalled', history }
  if (nf === 0) {
    for (let k = 0; k < 100 && hook; k++) if (updateJitter() < 1e-9) break
    return { x, cost, iterations: 0, status: 'converged', history }
  }
  let jitterChange = updateJitter()
  let lambda = 1e-3
  const H = new Float64Array(nf * nf), g = new Float64Array(nf), A = new Float64Array(nf * nf), step = new Float64Array(nf)
  const xt = new Float64Array(nf)
  let iter = 0
  let status: LmOutcome['status'] = 'max-iterations'
  outer: for (; iter < maxIter; iter++) {
    jacobian(L, ws, x, r, J, jac)
    // Jᵀ J and Jᵀ r from contiguous columns
    for (let a = 0; a < nf; a++) {
      const ca = a * m
      let ga = 0
      for (let i = 0; i < m; i++) ga += J[ca + i] * r[i]
      g[a] = ga
      for (let b = a; b < nf; b++) {
        const cb = b * m
        let h0 = 0, h1 = 0
        let i = 0
        for (; i + 1 < m; i += 2) { h0 += J[ca + i] * J[cb + i]; h1 += J[ca + i + 1] * J[cb + i + 1] }
        if (i < m) h0 += J[ca + i] * J[cb + i]
        H[a * nf + b] = h0 + h1
      }
    }
    for (let a = 0; a < nf; a++) for (let b = 0; b < a; b++) H[a * nf + b] = H[b * nf + a]
    let gmax = 0
    projectGradient(L, x, g, gp)
    // a parameter the model does not depend on (K = 0 leaves that planet's others free) does not count
    for (let a = 0; a < nf; a++) if (H[a * nf + a] > 0) gmax = Math.max(gmax, Math.abs(gp[a]) / Math.sqrt(H[a * nf + a]))
    if (gmax < 1e-8 * Math.sqrt(Math.max(cost, 1e-300)) && jitterChange < 1e-7) { status = 'converged'; break }
    // flat: −2 ln L (the history, with the jitter half-steps) fell by less than FLAT_DROP over the
    // last FLAT_SPAN entries — a crawl along a ridge or against a bound changes nothing a user reads
    const h = history.length
    if (h > FLAT_SPAN && history[h - 1 - FLAT_SPAN] - history[h - 1] < FLAT_DROP && jitterChange < 1e-6) { status = 'converged'; break }
    for (;;) {
      A.set(H)
      for (let a = 0; a < nf; a++) A[a * nf + a] += lambda * Math.max(H[a * nf + a], 1e-12)
      if (!cholesky(A, nf)) { lambda *= 10; if (lambda > 1e16) { status = 'stalled'; break outer } continue }
      for (let a = 0; a < nf; a++) step[a] = -g[a]
      choleskySolve(A, nf, step)
      for (let a = 0; a < nf; a++) xt[a] = x[a] + step[a]
      project(L, xt, true)
      const ct = residualVector(L, ws, xt, rt, kep)
      if (ct < cost) {
        const drop = cost - ct
        let rel = 0
        for (let a = 0; a < nf; a++) rel = Math.max(rel, Math.abs(xt[a] - x[a]) / (L.scales[a] * 1e5))
        x.set(xt); r.set(rt)
        cost = ct
        history.push(cost + norm())
        lambda = Math.max(lambda / 5, 1e-12)
        jitterChange = updateJitter()
        if (drop <= 1e-10 * Math.max(cost, 1e-300) && rel < 1e-6 && jitterChange < 1e-7) { status = 'converged'; iter++; break outer }
        break
      }
      lambda *= 4
      if (lambda > 1e12) {
        // No downhill step even with a tiny step: a (constrained) stationary point at these
        // jitters; converged unless the jitters are still moving.
        if (jitterChange < 1e-7) { status = 'converged'; break outer }
        lambda = 1e-3
        jitterChange = updateJitter()
        break
      }
    }
  }
  residualVector(L, ws, x, r, kep)
  return { x, cost, iterations: iter, status, history }
}

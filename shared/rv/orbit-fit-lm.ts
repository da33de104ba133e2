/**
 * Levenberg–Marquardt (Levenberg 1944; Marquardt 1963, SIAM J. Appl. Math. 11, 431, with its
 * diagonal scaling) on the whitened residual vector of `orbit-fit-objective.ts`, with a
 * forward-difference Jacobian and projection onto the bounds. A step is accepted only if it lowers
 * the cost, so the recorded cost history never rises. Between accepted steps an optional jitter
 * half-step (`orbit-fit-jitter.ts`) re-solves the jitters: a coordinate ascent on ln L.
 */
import { cholesky, choleskySolve } from './linalg.ts'
import { project, type FitLayout } from './orbit-fit-layout.ts'
import {
  addPlanet, insideUniformPriors, keplerModel, nGaussianPriors, residualFromModel, residualVector, type Workspace,
} from './orbit-fit-objective.ts'
import type { JitterHook } from './orbit-fit-jitter.ts'

const TWO_PI = 2 * Math.PI

export interface LmOutcome { x: Float64Array; cost: number; iterations: number; status: 'converged' | 'max-iterations' | 'stalled'; history: number[] }

export function levenbergMarquardt(L: FitLayout, ws: Workspace, x0: Float64Array, maxIter: number, hook?: JitterHook): LmOutcome {
  const nf = L.nFree
  const m = L.n + nGaussianPriors(L)
  const r = new Float64Array(m), rt = new Float64Array(m)
  const kep = new Float64Array(L.n), kepAll = new Float64Array(L.n)
  const nPl = L.layouts.length
  const perPlanet = Array.from({ length: nPl }, () => new Float64Array(L.n))
  const J = new Float64Array(m * nf)
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
    // Jacobian by forward differences; only the planet owning parameter j is recomputed
    keplerModel(L, ws, x, kepAll)
    for (let k = 0; k < nPl; k++) { const c = perPlanet[k]; c.fill(0); addPlanet(L, ws, x, k, c) }
    for (let j = 0; j < nf; j++) {
      const k = L.owner[j]
      const h = L.scales[j]
      let hh = h
      for (let pass = 0; pass < 2; pass++) {
        xt.set(x)
        xt[j] += hh
        const own = perPlanet[k]
        const Kk = x[j]
        if (j === L.layouts[k].iK && Kk > 0) {
          // the model is linear in K: no Kepler solves needed for this column
          const gK = hh / Kk
          for (let i = 0; i < L.n; i++) kep[i] = kepAll[i] + own[i] * gK
        } else {
          for (let i = 0; i < L.n; i++) kep[i] = kepAll[i] - own[i]
          addPlanet(L, ws, xt, k, kep)
        }
        const c = insideUniformPriors(L, xt) ? residualFromModel(L, ws, xt, kep, rt) : Infinity
        if (Number.isFinite(c)) break
        hh = -h
      }
      for (let i = 0; i < m; i++) J[i * nf + j] = (rt[i] - r[i]) / hh
    }
    H.fill(0); g.fill(0)
    for (let i = 0; i < m; i++) {
      const row = i * nf
      for (let a = 0; a < nf; a++) {
        const ja = J[row + a]
        if (ja === 0) continue
        g[a] += ja * r[i]
        for (let b = a; b < nf; b++) H[a * nf + b] += ja * J[row + b]
      }
    }
    for (let a = 0; a < nf; a++) for (let b = 0; b < a; b++) H[a * nf + b] = H[b * nf + a]
    let gmax = 0
    for (let a = 0; a < nf; a++) gmax = Math.max(gmax, Math.abs(g[a]) / Math.sqrt(Math.max(H[a * nf + a], 1e-300)))
    if (gmax < 1e-8 * Math.sqrt(Math.max(cost, 1e-300)) && jitterChange < 1e-7) { status = 'converged'; break }
    for (;;) {
      A.set(H)
      for (let a = 0; a < nf; a++) A[a * nf + a] += lambda * Math.max(H[a * nf + a], 1e-12)
      if (!cholesky(A, nf)) { lambda *= 10; if (lambda > 1e16) { status = 'stalled'; break outer } continue }
      for (let a = 0; a < nf; a++) step[a] = -g[a]
      choleskySolve(A, nf, step)
      for (let a = 0; a < nf; a++) xt[a] = x[a] + step[a]
      project(L, xt)
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

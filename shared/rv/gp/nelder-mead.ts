/**
 * Nelder–Mead simplex minimisation (Nelder & Mead 1965, Comput. J. 7, 308) with the dimension-adapted
 * coefficients of Gao & Han 2012 (Comput. Optim. Appl. 51, 259): reflection 1, expansion 1 + 2/n,
 * contraction 0.75 − 1/(2n), shrink 1 − 1/n. Derivative-free, so it copes with the hard prior bounds
 * (+∞ outside) of the GP hyperparameters. Deterministic.
 */

export interface SimplexResult {
  x: Float64Array
  f: number
  evaluations: number
  converged: boolean
}

export interface SimplexOptions {
  /** Initial step per coordinate (the simplex is x0 + step_i e_i). */
  step: ArrayLike<number>
  maxEvaluations?: number
  /** Stop when the spread of f over the simplex is below this (absolute) … */
  fTolerance?: number
  /** … and every vertex is within xTolerance × step of the best one. */
  xTolerance?: number
}

/** Minimises f from x0. f may return +Infinity (outside the allowed region) but not NaN. */
export function nelderMead(f: (x: Float64Array) => number, x0: ArrayLike<number>, opts: SimplexOptions): SimplexResult {
  const n = x0.length
  const maxEval = opts.maxEvaluations ?? 2000 * n
  const fTol = opts.fTolerance ?? 1e-9
  const xTol = opts.xTolerance ?? 1e-7
  const alpha = 1, beta = 1 + 2 / n, gamma = 0.75 - 1 / (2 * n), delta = 1 - 1 / n
  const pts: Float64Array[] = [Float64Array.from(x0)]
  for (let i = 0; i < n; i++) { const p = Float64Array.from(x0); p[i] += opts.step[i]; pts.push(p) }
  let evals = 0
  const val = (x: Float64Array): number => { evals++; const v = f(x); return Number.isNaN(v) ? Infinity : v }
  const fs = pts.map(val)
  const c = new Float64Array(n), xr = new Float64Array(n), xe = new Float64Array(n), xc = new Float64Array(n)
  let converged = false
  const idx = Array.from({ length: n + 1 }, (_, i) => i)
  while (evals < maxEval) {
    idx.sort((a, b) => fs[a] - fs[b])
    const best = idx[0], worst = idx[n], second = idx[n - 1]
    // convergence
    let xSpread = 0
    for (let k = 1; k <= n; k++) for (let i = 0; i < n; i++) xSpread = Math.max(xSpread, Math.abs(pts[idx[k]][i] - pts[best][i]) / Math.abs(opts.step[i]))
    if (Math.abs(fs[worst] - fs[best]) <= fTol && xSpread <= xTol * 1e3) { converged = true; break }
    if (xSpread <= xTol) { converged = Number.isFinite(fs[best]); break }
    c.fill(0)
    for (let k = 0; k < n; k++) for (let i = 0; i < n; i++) c[i] += pts[idx[k]][i] / n
    for (let i = 0; i < n; i++) xr[i] = c[i] + alpha * (c[i] - pts[worst][i])
    const fr = val(xr)
    if (fr < fs[best]) {
      for (let i = 0; i < n; i++) xe[i] = c[i] + beta * (xr[i] - c[i])
      const fe = val(xe)
      if (fe < fr) { pts[worst].set(xe); fs[worst] = fe } else { pts[worst].set(xr); fs[worst] = fr }
      continue
    }
    if (fr < fs[second]) { pts[worst].set(xr); fs[worst] = fr; continue }
    const outside = fr < fs[worst]
    for (let i = 0; i < n; i++) xc[i] = outside ? c[i] + gamma * (xr[i] - c[i]) : c[i] - gamma * (c[i] - pts[worst][i])
    const fc = val(xc)
    if (fc < (outside ? fr : fs[worst])) { pts[worst].set(xc); fs[worst] = fc; continue }
    for (let k = 1; k <= n; k++) {
      const p = pts[idx[k]]
      for (let i = 0; i < n; i++) p[i] = pts[best][i] + delta * (p[i] - pts[best][i])
      fs[idx[k]] = val(p)
    }
  }
  let b = 0
  for (let k = 1; k <= n; k++) if (fs[k] < fs[b]) b = k
  return { x: pts[b], f: fs[b], evaluations: evals, converged }
}

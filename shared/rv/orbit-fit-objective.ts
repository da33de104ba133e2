/**
 * The objective of the fit at fixed jitters: the whitened residual vector
 *   rᵢ = (yᵢ − Keplerians − offsets − trend) / √(σᵢ² + s_k²)   (data part, Ford 2006 likelihood)
 * followed by (g(x) − μ)/σ for each Gaussian prior, so that Σ r² = −2 ln(posterior) + const.
 * Uniform priors make the cost +∞ outside their box. Also the full ln L (with the normalisation
 * ln 2π(σ² + s²)) and the Gaussian log-prior at the optimum.
 *
 * `Workspace` holds the buffers that change during a fit (weights, residuals, linear solution);
 * everything fixed lives in the `FitLayout`.
 */
import { addKeplerian, type Keplerian } from './model.ts'
import { linearScratch, solveLinear, type LinearScratch } from './orbit-fit-linear.ts'
import { priorValue, unpack, wrapDegrees, type FitLayout } from './orbit-fit-layout.ts'

const TWO_PI = 2 * Math.PI

export interface Workspace {
  /** Residuals y − full model (unwhitened), written by every linear solve. */
  resid: Float64Array
  /** Weights 1/(σ² + s²) and their square roots (the whitening factors). */
  w: Float64Array
  sw: Float64Array
  linear: LinearScratch
  /** One reusable orbit per planet for the model evaluation. */
  orbits: Keplerian[]
}

export function createWorkspace(L: FitLayout): Workspace {
  return {
    resid: new Float64Array(L.n), w: new Float64Array(L.n), sw: new Float64Array(L.n), linear: linearScratch(L.nLin),
    orbits: L.layouts.map(() => ({ period: 1, K: 0, e: 0, omega: 0, tp: 0 })),
  }
}

/** Sets the weights from per-instrument jitters. */
export function setWeights(L: FitLayout, ws: Workspace, jit: ArrayLike<number>): void {
  const { dy, instrument } = L.data
  for (let i = 0; i < L.n; i++) {
    const s = jit[instrument[i]]
    ws.w[i] = 1 / (dy[i] * dy[i] + s * s)
    ws.sw[i] = Math.sqrt(ws.w[i])
  }
}

/** Model of planet k alone at x, added into out. */
export function addPlanet(L: FitLayout, ws: Workspace, x: ArrayLike<number>, k: number, out: Float64Array): void {
  const p = unpack(L, x, k)
  const o = ws.orbits[k]
  o.period = p.period; o.K = p.K; o.e = p.e; o.omega = p.omega; o.tp = p.tp
  addKeplerian(L.data.t, o, out)
}

/** Sum of the Keplerians (no offsets or trend) at x into out. */
export function keplerModel(L: FitLayout, ws: Workspace, x: ArrayLike<number>, out: Float64Array): void {
  out.fill(0)
  for (let k = 0; k < L.layouts.length; k++) addPlanet(L, ws, x, k, out)
}

/** Solves the linear part against the Keplerian model `kep` at the current weights (writes ws.resid). */
export function solveLinearPart(L: FitLayout, ws: Workspace, kep: Float64Array): boolean {
  return solveLinear(L.data, L.epoch, L.nLin, kep, ws.w, ws.linear, ws.resid)
}

export function insideUniformPriors(L: FitLayout, x: Float64Array): boolean {
  for (const pr of L.priors) {
    if (!pr.uniform) continue
    const v = priorValue(unpack(L, x, pr.planet), pr.param)
    if (v < pr.uniform.min || v > pr.uniform.max) return false
  }
  return true
}

export function nGaussianPriors(L: FitLayout): number {
  let c = 0
  for (const p of L.priors) if (p.gaussian) c++
  return c
}

/** Whitened residuals and cost given the Keplerian model `kep` at x. */
export function residualFromModel(L: FitLayout, ws: Workspace, x: Float64Array, kep: Float64Array, out: Float64Array): number {
  if (!solveLinearPart(L, ws, kep)) return Infinity
  let cost = 0
  for (let i = 0; i < L.n; i++) { const r = ws.resid[i] * ws.sw[i]; out[i] = r; cost += r * r }
  const end = priorResiduals(L, x, out, L.n)
  for (let q = L.n; q < end; q++) cost += out[q] * out[q]
  return Number.isFinite(cost) ? cost : Infinity
}

/** The Gaussian priors' residuals (g(x) − μ)/σ written from out[at]; returns the index after the last. */
export function priorResiduals(L: FitLayout, x: ArrayLike<number>, out: Float64Array, at: number): number {
  let m = at
  for (const pr of L.priors) {
    if (!pr.gaussian) continue
    out[m++] = priorDifference(L, x, pr.planet, pr.param, pr.gaussian.mu) / pr.gaussian.sigma
  }
  return m
}

/**
 * Whitened residual vector (data part then Gaussian-prior part) at fixed weights; returns the
 * cost Σ rᵢ² or Infinity outside a uniform prior or when the linear solve fails.
 */
export function residualVector(L: FitLayout, ws: Workspace, x: Float64Array, out: Float64Array, kep: Float64Array): number {
  if (!insideUniformPriors(L, x)) return Infinity
  keplerModel(L, ws, x, kep)
  return residualFromModel(L, ws, x, kep, out)
}

/** ln L of the residuals in ws.resid with jitters `jit` (Ford 2006). */
export function logLikelihood(L: FitLayout, ws: Workspace, jit: ArrayLike<number>): number {
  const { dy, instrument } = L.data
  let s = 0
  for (let i = 0; i < L.n; i++) {
    const j = jit[instrument[i]]
    const V = dy[i] * dy[i] + j * j
    s += ws.resid[i] * ws.resid[i] / V + Math.log(TWO_PI * V)
  }
  return -0.5 * s
}

/** Normalised Gaussian log-prior at x (uniform priors are checked by `insideUniformPriors`). */
export function logPrior(L: FitLayout, x: Float64Array): number {
  let s = 0
  for (const pr of L.priors) {
    if (!pr.gaussian) continue
    const d = priorDifference(L, x, pr.planet, pr.param, pr.gaussian.mu)
    s += -0.5 * (d / pr.gaussian.sigma) ** 2 - Math.log(pr.gaussian.sigma * Math.sqrt(TWO_PI))
  }
  return s
}

function priorDifference(L: FitLayout, x: ArrayLike<number>, planet: number, param: Parameters<typeof priorValue>[1], mu: number): number {
  const d = priorValue(unpack(L, x, planet), param) - mu
  return param === 'omegaDeg' ? wrapDegrees(d) : d
}

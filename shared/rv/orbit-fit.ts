/**
 * Maximum-likelihood (or maximum a posteriori, with priors) fit of N Keplerians plus a per-
 * instrument offset and jitter and an optional linear or quadratic trend.
 *
 * Likelihood (Ford 2006, ApJ 642, 505): jitter s_k of instrument k is added in quadrature,
 *   ln L = −½ Σ_i [ r_i² / (σ_i² + s_k²) + ln 2π(σ_i² + s_k²) ].
 * Eccentricity and ω are parameterised as √e cos ω, √e sin ω (Ford 2006; Eastman, Gaudi & Agol
 * 2013, PASP 125, 83), which keeps the fit regular near e = 0; the orbital phase as the time of
 * conjunction Tc, well defined for any e.
 *
 * Optimiser (why not a general −ln L minimiser): at fixed jitters −2 ln L is a weighted χ², which
 * Levenberg–Marquardt minimises well on the whitened residual vector; and at fixed orbit the jitter
 * of each instrument has a one-dimensional maximum-likelihood equation that is solved exactly.
 * Alternating the two is a coordinate ascent on ln L (each half-step cannot lower it), so it
 * converges to a stationary point of the full likelihood; in practice the jitters settle in a few
 * rounds. Offsets and trend coefficients are linear and are solved exactly by weighted least
 * squares inside every residual evaluation (variable projection), so the non-linear search only
 * sees the Keplerian parameters. We use our own small LM (Marquardt's diagonal scaling, projected
 * bounds) rather than ml-levenberg-marquardt: that package weights the objective and the step
 * inconsistently (see the stack notes), has no covariance and reports no convergence status.
 *
 * Uncertainties: the inverse Fisher information at the optimum. For Gaussian data with variance
 * parameters the information is block-diagonal: Jᵀ V⁻¹ J (+ Gaussian-prior terms) for the mean
 * parameters (Keplerian, offsets, trend) and ½ Σ (∂V/∂s)² / V² for each jitter.
 */
import { addKeplerian, tcToTp, tpToTc, nearestEpoch, type Keplerian } from './model.ts'
import { cholesky, choleskySolve, invertSymmetric } from './linalg.ts'
import { checkRvData, baseline, type RvData } from './orbit-data.ts'

const TWO_PI = 2 * Math.PI
const DEG = Math.PI / 180
/** Largest eccentricity the fitter will step to (hard bound, e < 1 with margin). */
export const E_MAX = 0.99

export type TrendKind = 'none' | 'linear' | 'quadratic'
export type PlanetParam = 'period' | 'K' | 'e' | 'omegaDeg' | 'tc' | 'tp'

/** Starting values (or fixed values) of one planet. Give `tc` or `tp` (tc wins if both). */
export interface PlanetStart {
  period: number
  K: number
  e?: number
  omegaDeg?: number
  tc?: number
  tp?: number
  /** Parameters held fixed at the given values ('tc' or 'tp' fixes the phase that way). */
  fix?: PlanetParam[]
}

export interface Prior {
  planet: number
  param: PlanetParam
  /** Gaussian prior N(mu, sigma²) — for omegaDeg the difference is wrapped to ±180°. */
  gaussian?: { mu: number; sigma: number }
  /** Uniform prior on [min, max]: steps leaving the box are rejected (the log-prior is −∞ there). */
  uniform?: { min: number; max: number }
}

export interface FitOptions {
  planets: PlanetStart[]
  trend?: TrendKind
  /** Reference time of the trend and of the reported Tp/Tc (default: mean time of the data). */
  epoch?: number
  /** 'fit' (default), or fixed jitters per instrument (m/s). */
  jitter?: 'fit' | number[]
  /** Starting jitters per instrument when fitting them (default 0). */
  jitterStart?: number[]
  priors?: Prior[]
  maxIterations?: number
  /** Skip the covariance (faster, for multi-start screening). */
  skipUncertainties?: boolean
}

export interface PlanetFit {
  period: number
  K: number
  e: number
  /** Star's argument of periastron, radians in [0, 2π) and degrees. */
  omega: number
  omegaDeg: number
  tp: number
  tc: number
  secosw: number
  sesinw: number
  /** 1σ errors (NaN where not determined; 0 for fixed parameters). */
  uncertainty: { period: number; K: number; e: number; omegaDeg: number; tp: number; tc: number }
  /** Covariance of (period, K, e), row-major 3×3, for derived quantities. */
  covPKe: number[]
}

export interface InstrumentFit {
  name: string
  n: number
  offset: number
  offsetErr: number
  jitter: number
  jitterErr: number
  /** rms of the residuals of this instrument, m/s. */
  rms: number
}

export interface FitStats {
  nPoints: number
  /** Free parameters: Keplerian + offsets + trend + fitted jitters. */
  nParams: number
  /** Σ r²/(σ² + s²), with the fitted jitters. */
  chi2: number
  reducedChi2: number
  /** Σ r²/σ², without jitter. */
  chi2NoJitter: number
  lnL: number
  /** ln L + ln(prior) for the Gaussian priors (equals lnL without priors). */
  lnPosterior: number
  bic: number
  aic: number
  rms: number
}

export interface FitResult {
  success: boolean
  converged: boolean
  status: 'converged' | 'max-iterations' | 'stalled' | 'failed'
  message: string
  planets: PlanetFit[]
  instruments: InstrumentFit[]
  trend: null | { kind: TrendKind; slope: number; curvature: number; epoch: number; slopeErr: number; curvatureErr: number }
  stats: FitStats
  epoch: number
  model: Float64Array
  residuals: Float64Array
  iterations: number
  /** −2 ln(posterior) after every accepted optimiser step (never rises). */
  history: number[]
}

// ---------------------------------------------------------------------------------------------
// Parameter layout

type EccMode = 'both' | 'omega' | 'sqrte' | 'none'
interface PlanetLayout {
  iP: number; iK: number; iA: number; iB: number; iTc: number
  ecc: EccMode
  phaseFixed: 'tc' | 'tp' | null
  base: { period: number; K: number; e: number; omega: number; tc: number; tp: number }
}

interface Problem {
  data: RvData
  n: number
  epoch: number
  trend: TrendKind
  nInst: number
  nLin: number
  layouts: PlanetLayout[]
  nFree: number
  scales: Float64Array
  priors: Prior[]
  jitterFixed: number[] | null
  // scratch
  model: Float64Array
  resid: Float64Array
  w: Float64Array
  /** √w, the whitening factors. */
  sw: Float64Array
  /** Free-parameter index → planet it belongs to. */
  owner: Int32Array
  beta: Float64Array
  linRow: Float64Array
  ata: Float64Array
  atb: Float64Array
  orbits: Keplerian[]
}

function buildProblem(data: RvData, opts: FitOptions): { prob: Problem; x0: Float64Array } {
  checkRvData(data)
  const n = data.t.length
  const nInst = data.instrumentNames.length
  const trend = opts.trend ?? 'none'
  if (!['none', 'linear', 'quadratic'].includes(trend)) throw new RangeError(`trend must be none, linear or quadratic, got ${trend}`)
  let mean = 0
  for (let i = 0; i < n; i++) mean += data.t[i]
  mean = n ? mean / n : 0
  const epoch = opts.epoch ?? mean
  if (!Number.isFinite(epoch)) throw new RangeError('epoch must be finite')
  const nLin = nInst + (trend === 'linear' ? 1 : trend === 'quadratic' ? 2 : 0)
  const T = Math.max(baseline(data.t), 1)
  let medErr = 0
  for (let i = 0; i < n; i++) medErr += data.dy[i]
  medErr = n ? medErr / n : 1

  const x: number[] = []
  const scales: number[] = []
  const layouts: PlanetLayout[] = opts.planets.map((p, k) => {
    const label = `planets[${k}]`
    if (!(p.period > 0)) throw new RangeError(`${label}.period must be > 0, got ${p.period}`)
    if (!(p.K >= 0)) throw new RangeError(`${label}.K must be ≥ 0, got ${p.K}`)
    const e = p.e ?? 0
    if (!(e >= 0 && e < 1)) throw new RangeError(`${label}.e must be in [0, 1), got ${e}`)
    const omega = (p.omegaDeg ?? 0) * DEG
    if (!Number.isFinite(omega)) throw new RangeError(`${label}.omegaDeg must be finite`)
    let tc: number, tp: number
    if (p.tc !== undefined) { tc = p.tc; tp = tcToTp(tc, p.period, e, omega) }
    else if (p.tp !== undefined) { tp = p.tp; tc = tpToTc(tp, p.period, e, omega) }
    else throw new RangeError(`${label} needs tc or tp`)
    if (!Number.isFinite(tc)) throw new RangeError(`${label}.tc must be finite`)
    const fix = new Set(p.fix ?? [])
    for (const f of fix) if (!['period', 'K', 'e', 'omegaDeg', 'tc', 'tp'].includes(f)) throw new RangeError(`${label}.fix: unknown parameter ${f}`)
    const lay: PlanetLayout = {
      iP: -1, iK: -1, iA: -1, iB: -1, iTc: -1, ecc: 'both',
      phaseFixed: fix.has('tc') ? 'tc' : fix.has('tp') ? 'tp' : null,
      base: { period: p.period, K: p.K, e, omega, tc, tp },
    }
    const push = (v: number, s: number): number => { x.push(v); scales.push(s); return x.length - 1 }
    if (!fix.has('period')) lay.iP = push(p.period, 1e-5 * p.period * p.period / (TWO_PI * T))
    if (!fix.has('K')) lay.iK = push(p.K, 1e-5 * Math.max(p.K, medErr, 1e-3))
    const fe = fix.has('e'), fw = fix.has('omegaDeg')
    if (e === 0 && fe) lay.ecc = 'none'
    else if (fe && fw) lay.ecc = 'none'
    else if (fe) { lay.ecc = 'omega'; lay.iA = push(omega, 1e-5) }
    else if (fw) { lay.ecc = 'sqrte'; lay.iA = push(Math.sqrt(e), 1e-5) }
    else { lay.ecc = 'both'; lay.iA = push(Math.sqrt(e) * Math.cos(omega), 1e-5); lay.iB = push(Math.sqrt(e) * Math.sin(omega), 1e-5) }
    if (!lay.phaseFixed) lay.iTc = push(nearestEpoch(tc, p.period, epoch), 1e-5 * p.period / TWO_PI)
    return lay
  })
  const ownerOf: number[] = []
  layouts.forEach((L, k) => { for (const i of [L.iP, L.iK, L.iA, L.iB, L.iTc]) if (i >= 0) ownerOf[i] = k })
  const priors = opts.priors ?? []
  priors.forEach((pr, j) => {
    if (!(pr.planet >= 0 && pr.planet < layouts.length)) throw new RangeError(`priors[${j}].planet out of range`)
    if (pr.gaussian && !(pr.gaussian.sigma > 0)) throw new RangeError(`priors[${j}].gaussian.sigma must be > 0`)
    if (pr.uniform && !(pr.uniform.max > pr.uniform.min)) throw new RangeError(`priors[${j}].uniform.max must exceed min`)
  })
  let jitterFixed: number[] | null = null
  if (Array.isArray(opts.jitter)) {
    if (opts.jitter.length !== nInst) throw new RangeError(`jitter must have one value per instrument (${nInst})`)
    opts.jitter.forEach((s, k) => { if (!(s >= 0)) throw new RangeError(`jitter[${k}] must be ≥ 0`) })
    jitterFixed = opts.jitter.slice()
  }
  const prob: Problem = {
    data, n, epoch, trend, nInst, nLin, layouts, nFree: x.length, scales: Float64Array.from(scales), priors, jitterFixed,
    model: new Float64Array(n), resid: new Float64Array(n), w: new Float64Array(n), sw: new Float64Array(n),
    owner: new Int32Array(x.length), beta: new Float64Array(nLin), linRow: new Float64Array(nLin),
    ata: new Float64Array(nLin * nLin), atb: new Float64Array(nLin),
    orbits: layouts.map(() => ({ period: 1, K: 0, e: 0, omega: 0, tp: 0 })),
  }
  prob.owner.set(ownerOf)
  return { prob, x0: Float64Array.from(x) }
}

/** Planet elements from the free vector. */
function unpack(prob: Problem, x: ArrayLike<number>, k: number): { period: number; K: number; e: number; omega: number; tc: number; tp: number } {
  const L = prob.layouts[k]
  const period = L.iP >= 0 ? x[L.iP] : L.base.period
  const K = L.iK >= 0 ? x[L.iK] : L.base.K
  let e = L.base.e, omega = L.base.omega
  if (L.ecc === 'both') { const a = x[L.iA], b = x[L.iB]; e = a * a + b * b; omega = e > 0 ? Math.atan2(b, a) : 0 }
  else if (L.ecc === 'omega') omega = x[L.iA]
  else if (L.ecc === 'sqrte') e = x[L.iA] * x[L.iA]
  let tc: number, tp: number
  if (L.phaseFixed === 'tp') { tp = L.base.tp; tc = tpToTc(tp, period, e, omega) }
  else { tc = L.iTc >= 0 ? x[L.iTc] : L.base.tc; tp = tcToTp(tc, period, e, omega) }
  return { period, K, e, omega, tc, tp }
}

/** Projects a free vector onto the bounds P > 0, K ≥ 0, e ≤ E_MAX (in place). */
function project(prob: Problem, x: Float64Array): void {
  for (const L of prob.layouts) {
    if (L.iP >= 0 && !(x[L.iP] > 0)) x[L.iP] = 1e-6
    if (L.iK >= 0 && x[L.iK] < 0) x[L.iK] = 0
    if (L.ecc === 'both') {
      const e = x[L.iA] * x[L.iA] + x[L.iB] * x[L.iB]
      if (e > E_MAX) { const f = Math.sqrt(E_MAX / e); x[L.iA] *= f; x[L.iB] *= f }
    } else if (L.ecc === 'sqrte') {
      x[L.iA] = Math.min(Math.abs(x[L.iA]), Math.sqrt(E_MAX))
    }
  }
}

function priorValue(p: ReturnType<typeof unpack>, param: PlanetParam): number {
  switch (param) {
    case 'period': return p.period
    case 'K': return p.K
    case 'e': return p.e
    case 'omegaDeg': return p.omega / DEG
    case 'tc': return p.tc
    case 'tp': return p.tp
  }
}

/** Keplerian model (no offsets/trend) into prob.model. */
function keplerModel(prob: Problem, x: ArrayLike<number>, out: Float64Array): void {
  out.fill(0)
  for (let k = 0; k < prob.layouts.length; k++) addPlanet(prob, x, k, out)
}

/** Design-matrix entry j of the linear part for row i. */
function linColumn(prob: Problem, i: number, j: number): number {
  if (j < prob.nInst) return prob.data.instrument[i] === j ? 1 : 0
  const dt = prob.data.t[i] - prob.epoch
  return j === prob.nInst ? dt : dt * dt
}

/**
 * Residuals y − Keplerians − (offsets + trend) with the linear part solved by weighted least
 * squares (weights prob.w). Writes prob.resid and prob.beta. Returns false if singular.
 */
function solveLinear(prob: Problem, kep: Float64Array): boolean {
  const { n, nLin, nInst, ata, atb, beta, w, resid } = prob
  const { y, t, instrument } = prob.data
  ata.fill(0); atb.fill(0)
  const cols = prob.linRow
  for (let i = 0; i < n; i++) {
    const r0 = y[i] - kep[i]
    const wi = w[i]
    const k = instrument[i]
    // offsets: diagonal block; trend columns dense
    ata[k * nLin + k] += wi
    atb[k] += wi * r0
    if (nLin > nInst) {
      const dt = t[i] - prob.epoch
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
  // Scale trend columns to keep the normal equations well conditioned.
  const l = Float64Array.from(ata)
  if (!cholesky(l, nLin)) return false
  beta.set(atb)
  choleskySolve(l, nLin, beta)
  for (let i = 0; i < n; i++) {
    let m = beta[instrument[i]]
    if (nLin > nInst) {
      const dt = t[i] - prob.epoch
      m += beta[nInst] * dt
      if (nLin > nInst + 1) m += beta[nInst + 1] * dt * dt
    }
    resid[i] = y[i] - kep[i] - m
  }
  return true
}

function setWeights(prob: Problem, jit: ArrayLike<number>): void {
  const { dy, instrument } = prob.data
  for (let i = 0; i < prob.n; i++) {
    const s = jit[instrument[i]]
    prob.w[i] = 1 / (dy[i] * dy[i] + s * s)
    prob.sw[i] = Math.sqrt(prob.w[i])
  }
}

/**
 * Whitened residual vector (data part then Gaussian-prior part) at fixed weights; returns the
 * cost Σ rᵢ² or Infinity outside a uniform prior or when the linear solve fails.
 */
function residualVector(prob: Problem, x: Float64Array, out: Float64Array, kep: Float64Array): number {
  if (!insideUniformPriors(prob, x)) return Infinity
  keplerModel(prob, x, kep)
  return residualFromModel(prob, x, kep, out)
}

function insideUniformPriors(prob: Problem, x: Float64Array): boolean {
  for (const pr of prob.priors) {
    if (!pr.uniform) continue
    const v = priorValue(unpack(prob, x, pr.planet), pr.param)
    if (v < pr.uniform.min || v > pr.uniform.max) return false
  }
  return true
}

/** Whitened residuals and cost given the Keplerian model `kep` at x. */
function residualFromModel(prob: Problem, x: Float64Array, kep: Float64Array, out: Float64Array): number {
  if (!solveLinear(prob, kep)) return Infinity
  let cost = 0
  for (let i = 0; i < prob.n; i++) { const r = prob.resid[i] * prob.sw[i]; out[i] = r; cost += r * r }
  let m = prob.n
  for (const pr of prob.priors) {
    if (!pr.gaussian) continue
    let d = priorValue(unpack(prob, x, pr.planet), pr.param) - pr.gaussian.mu
    if (pr.param === 'omegaDeg') d = ((d % 360) + 540) % 360 - 180
    const r = d / pr.gaussian.sigma
    out[m++] = r
    cost += r * r
  }
  return Number.isFinite(cost) ? cost : Infinity
}

/** Model of planet k alone at x, added into out. */
function addPlanet(prob: Problem, x: ArrayLike<number>, k: number, out: Float64Array): void {
  const p = unpack(prob, x, k)
  const o = prob.orbits[k]
  o.period = p.period; o.K = p.K; o.e = p.e; o.omega = p.omega; o.tp = p.tp
  addKeplerian(prob.data.t, o, out)
}

function nGaussianPriors(prob: Problem): number {
  let c = 0
  for (const p of prob.priors) if (p.gaussian) c++
  return c
}

/** Sets ML jitters from prob.resid and the weights from them; returns the largest change (m/s). */
type JitterHook = () => number

interface LmOutcome { x: Float64Array; cost: number; iterations: number; status: 'converged' | 'max-iterations' | 'stalled'; history: number[] }

/**
 * Levenberg–Marquardt (Marquardt 1963 diagonal scaling) on the whitened residual vector with a
 * forward-difference Jacobian and projection onto the bounds. A step is accepted only if it lowers
 * the cost, so the recorded cost history never rises.
 */
function levenbergMarquardt(prob: Problem, x0: Float64Array, maxIter: number, hook?: JitterHook): LmOutcome {
  const nf = prob.nFree
  const m = prob.n + nGaussianPriors(prob)
  const r = new Float64Array(m), rt = new Float64Array(m)
  const kep = new Float64Array(prob.n), kepAll = new Float64Array(prob.n)
  const nPl = prob.layouts.length
  const perPlanet = Array.from({ length: nPl }, () => new Float64Array(prob.n))
  const J = new Float64Array(m * nf)
  const x = Float64Array.from(x0)
  project(prob, x)
  let cost = residualVector(prob, x, r, kep)
  const norm = (): number => { let s = 0; for (let i = 0; i < prob.n; i++) s -= Math.log(prob.w[i] / TWO_PI); return s }
  const history = [cost + norm()]
  // Jitter half-step: ML jitters at the current residuals, then the cost at the new weights.
  const updateJitter = (): number => {
    if (!hook) return 0
    residualVector(prob, x, r, kep) // prob.resid at x (trial steps overwrite it)
    const change = hook()
    cost = residualVector(prob, x, r, kep)
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
    keplerModel(prob, x, kepAll)
    for (let k = 0; k < nPl; k++) { const c = perPlanet[k]; c.fill(0); addPlanet(prob, x, k, c) }
    for (let j = 0; j < nf; j++) {
      const k = prob.owner[j]
      const h = prob.scales[j]
      let hh = h
      for (let pass = 0; pass < 2; pass++) {
        xt.set(x)
        xt[j] += hh
        const own = perPlanet[k]
        const Kk = x[j]
        if (j === prob.layouts[k].iK && Kk > 0) {
          // the model is linear in K: no Kepler solves needed for this column
          const g = hh / Kk
          for (let i = 0; i < prob.n; i++) kep[i] = kepAll[i] + own[i] * g
        } else {
          for (let i = 0; i < prob.n; i++) kep[i] = kepAll[i] - own[i]
          addPlanet(prob, xt, k, kep)
        }
        const c = insideUniformPriors(prob, xt) ? residualFromModel(prob, xt, kep, rt) : Infinity
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
      project(prob, xt)
      const ct = residualVector(prob, xt, rt, kep)
      if (ct < cost) {
        const drop = cost - ct
        let rel = 0
        for (let a = 0; a < nf; a++) rel = Math.max(rel, Math.abs(xt[a] - x[a]) / (prob.scales[a] * 1e5))
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
  residualVector(prob, x, r, kep)
  return { x, cost, iterations: iter, status, history }
}

/** One-dimensional ML jitter for one instrument from its residuals (Ford 2006 likelihood). */
export function jitterMle(resid: ArrayLike<number>, dy: ArrayLike<number>, rows: ArrayLike<number>): number {
  // d lnL / d(s²) = ½ Σ [r²/(σ²+v)² − 1/(σ²+v)]; it falls from v = 0 across its root.
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
  for (let it = 0; it < 100 && hi - lo > 1e-12 * hi; it++) {
    const mid = 0.5 * (lo + hi)
    if (grad(mid) > 0) lo = mid; else hi = mid
  }
  return Math.sqrt(0.5 * (lo + hi))
}

function logLikelihood(prob: Problem, jit: ArrayLike<number>): number {
  const { dy, instrument } = prob.data
  let s = 0
  for (let i = 0; i < prob.n; i++) {
    const j = jit[instrument[i]]
    const V = dy[i] * dy[i] + j * j
    s += prob.resid[i] * prob.resid[i] / V + Math.log(TWO_PI * V)
  }
  return -0.5 * s
}

function logPrior(prob: Problem, x: Float64Array): number {
  let s = 0
  for (const pr of prob.priors) {
    if (!pr.gaussian) continue
    let d = priorValue(unpack(prob, x, pr.planet), pr.param) - pr.gaussian.mu
    if (pr.param === 'omegaDeg') d = ((d % 360) + 540) % 360 - 180
    s += -0.5 * (d / pr.gaussian.sigma) ** 2 - Math.log(pr.gaussian.sigma * Math.sqrt(TWO_PI))
  }
  return s
}

/**
 * Fits the model from the given starting planets (see the module comment for the method).
 * Returns `success: false` with a message, never throws, when the data cannot constrain the
 * model (fewer points than parameters, singular offsets); throws RangeError on misuse.
 */
export function fitKeplerians(data: RvData, opts: FitOptions): FitResult {
  const { prob, x0 } = buildProblem(data, opts)
  const nInst = prob.nInst
  const fitJitter = prob.jitterFixed === null
  const jit = new Float64Array(nInst)
  if (prob.jitterFixed) jit.set(prob.jitterFixed)
  else if (opts.jitterStart) {
    if (opts.jitterStart.length !== nInst) throw new RangeError(`jitterStart must have one value per instrument (${nInst})`)
    jit.set(opts.jitterStart.map((s) => Math.max(0, s)))
  }
  const rowsOf: number[][] = Array.from({ length: nInst }, () => [])
  for (let i = 0; i < prob.n; i++) rowsOf[data.instrument[i]].push(i)
  const nParams = prob.nFree + prob.nLin + (fitJitter ? nInst : 0)
  const maxIter = opts.maxIterations ?? 200
  let x = x0
  let status: FitResult['status'] = 'converged'
  let iterations = 0
  const history: number[] = []
  let lnPost = -Infinity
  if (prob.n < nParams) {
    status = 'failed'
  } else {
    setWeights(prob, jit)
    const hook: JitterHook | undefined = fitJitter
      ? () => {
        let change = 0
        for (let k = 0; k < nInst; k++) {
          const s = jitterMle(prob.resid, data.dy, rowsOf[k])
          change = Math.max(change, Math.abs(s - jit[k]))
          jit[k] = s
        }
        setWeights(prob, jit)
        return change
      }
      : undefined
    const lm = levenbergMarquardt(prob, x, maxIter, hook)
    x = lm.x
    iterations = lm.iterations
    history.push(...lm.history)
    status = Number.isFinite(lm.cost) ? lm.status : 'failed'
    setWeights(prob, jit)
    const kep = new Float64Array(prob.n)
    keplerModel(prob, x, kep)
    solveLinear(prob, kep)
    lnPost = logLikelihood(prob, jit) + logPrior(prob, x)
    if (!Number.isFinite(lnPost)) status = 'failed'
  }
  return assemble(prob, x, jit, fitJitter, nParams, status, iterations, history, lnPost, opts.skipUncertainties ?? false)
}

function assemble(
  prob: Problem, x: Float64Array, jit: Float64Array, fitJitter: boolean, nParams: number,
  status: FitResult['status'], iterations: number, history: number[], lnPost: number, skipUnc: boolean,
): FitResult {
  const { data, n, nInst, nLin, nFree } = prob
  setWeights(prob, jit)
  const kep = new Float64Array(n)
  keplerModel(prob, x, kep)
  const linOk = solveLinear(prob, kep)
  const model = new Float64Array(n)
  for (let i = 0; i < n; i++) model[i] = data.y[i] - prob.resid[i]
  const residuals = Float64Array.from(prob.resid)
  const lnL = logLikelihood(prob, jit)
  let chi2 = 0, chi2NoJ = 0, ss = 0
  for (let i = 0; i < n; i++) {
    chi2 += residuals[i] * residuals[i] * prob.w[i]
    chi2NoJ += (residuals[i] / data.dy[i]) ** 2
    ss += residuals[i] * residuals[i]
  }
  // ---- covariance of mean parameters: [free Keplerian | linear]
  const np = nFree + nLin
  const F = new Float64Array(np * np)
  let covOk = false
  let cov: Float64Array = new Float64Array(np * np).fill(NaN)
  if (!skipUnc && linOk && status !== 'failed') {
    const cols = new Float64Array(n * np)
    const up = new Float64Array(n), dn = new Float64Array(n)
    const xt = new Float64Array(nFree)
    for (let j = 0; j < nFree; j++) {
      const h = prob.scales[j] * 10
      xt.set(x); xt[j] = x[j] + h; project(prob, xt); const hu = xt[j] - x[j]; keplerModel(prob, xt, up)
      xt.set(x); xt[j] = x[j] - h; project(prob, xt); const hd = x[j] - xt[j]; keplerModel(prob, xt, dn)
      const den = hu + hd
      for (let i = 0; i < n; i++) cols[i * np + j] = den > 0 ? (up[i] - dn[i]) / den : 0
    }
    for (let i = 0; i < n; i++) for (let j = 0; j < nLin; j++) cols[i * np + nFree + j] = linColumn(prob, i, j)
    for (let i = 0; i < n; i++) {
      const wi = prob.w[i]
      for (let a = 0; a < np; a++) {
        const ca = cols[i * np + a]
        if (ca === 0) continue
        for (let b = a; b < np; b++) F[a * np + b] += wi * ca * cols[i * np + b]
      }
    }
    // Gaussian priors: information of (g(x) − μ)/σ, by central differences of g
    for (const pr of prob.priors) {
      if (!pr.gaussian) continue
      const gr = new Float64Array(np)
      for (let j = 0; j < nFree; j++) {
        const h = prob.scales[j] * 10
        xt.set(x); xt[j] += h; const vu = priorValue(unpack(prob, xt, pr.planet), pr.param)
        xt.set(x); xt[j] -= h; const vd = priorValue(unpack(prob, xt, pr.planet), pr.param)
        let d = vu - vd
        if (pr.param === 'omegaDeg') d = ((d % 360) + 540) % 360 - 180
        gr[j] = d / (2 * h) / pr.gaussian.sigma
      }
      for (let a = 0; a < np; a++) for (let b = a; b < np; b++) F[a * np + b] += gr[a] * gr[b]
    }
    for (let a = 0; a < np; a++) for (let b = 0; b < a; b++) F[a * np + b] = F[b * np + a]
    const inv = invertSymmetric(F, np)
    cov = inv.inv
    covOk = !inv.singular
  }
  const sd = (j: number): number => Math.sqrt(Math.max(cov[j * np + j], 0))

  // ---- planets with propagated errors
  const planets: PlanetFit[] = prob.layouts.map((_, k) => {
    const p = unpack(prob, x, k)
    const tc = nearestEpoch(p.tc, p.period, prob.epoch)
    const tp = nearestEpoch(p.tp, p.period, prob.epoch)
    let omega = p.omega % TWO_PI
    if (omega < 0) omega += TWO_PI
    const vec = (pp: ReturnType<typeof unpack>): number[] => [pp.period, pp.K, pp.e, pp.omega / DEG, pp.tp, pp.tc]
    const base = vec(p)
    const G: number[][] = []
    const xt = new Float64Array(nFree)
    for (let j = 0; j < nFree; j++) {
      const h = prob.scales[j] * 10
      xt.set(x); xt[j] = x[j] + h; const vu = vec(unpack(prob, xt, k))
      xt.set(x); xt[j] = x[j] - h; const vd = vec(unpack(prob, xt, k))
      const gcol = vu.map((v, q) => {
        let d = v - vd[q]
        if (q === 3) d = ((d % 360) + 540) % 360 - 180
        if (q >= 4) {
          // Tp/Tc may jump by a period across the wrap; keep the small difference
          const P = base[0]
          d = d - P * Math.round(d / P)
        }
        return d / (2 * h)
      })
      G.push(gcol)
    }
    const prop = (q1: number, q2: number): number => {
      let s = 0
      for (let a = 0; a < nFree; a++) for (let b = 0; b < nFree; b++) s += G[a][q1] * G[b][q2] * cov[a * np + b]
      return s
    }
    const u = (q: number): number => (skipUnc ? NaN : Math.sqrt(Math.max(prop(q, q), 0)))
    const covPKe = [0, 1, 2].flatMap((a) => [0, 1, 2].map((b) => (skipUnc ? NaN : prop(a, b))))
    return {
      period: p.period, K: p.K, e: p.e, omega, omegaDeg: omega / DEG, tp, tc,
      secosw: Math.sqrt(p.e) * Math.cos(p.omega), sesinw: Math.sqrt(p.e) * Math.sin(p.omega),
      uncertainty: { period: u(0), K: u(1), e: u(2), omegaDeg: u(3), tp: u(4), tc: u(5) },
      covPKe,
    }
  })
  // ---- instruments
  const instruments: InstrumentFit[] = data.instrumentNames.map((name, k) => {
    let cnt = 0, s2 = 0, sw2 = 0
    for (let i = 0; i < n; i++) {
      if (data.instrument[i] !== k) continue
      cnt++; s2 += residuals[i] * residuals[i]
      const V = 1 / prob.w[i]; sw2 += 1 / (V * V)
    }
    const s = jit[k]
    // Fisher information of s: ½ Σ (2s)²/V² = 2 s² Σ 1/V²
    const jErr = fitJitter && !skipUnc ? (s > 0 ? 1 / Math.sqrt(2 * s * s * sw2) : NaN) : 0
    return {
      name, n: cnt, offset: prob.beta[k], offsetErr: skipUnc ? NaN : sd(nFree + k),
      jitter: s, jitterErr: jErr, rms: cnt ? Math.sqrt(s2 / cnt) : NaN,
    }
  })
  const trend = prob.trend === 'none' ? null : {
    kind: prob.trend,
    slope: prob.beta[nInst],
    curvature: prob.trend === 'quadratic' ? prob.beta[nInst + 1] : 0,
    epoch: prob.epoch,
    slopeErr: skipUnc ? NaN : sd(nFree + nInst),
    curvatureErr: prob.trend === 'quadratic' ? (skipUnc ? NaN : sd(nFree + nInst + 1)) : 0,
  }
  const success = status === 'converged'
  let message: string
  switch (status) {
    case 'converged': message = covOk || skipUnc ? 'converged' : 'converged, but the covariance is singular: some parameters are not constrained by the data'; break
    case 'max-iterations': message = 'stopped at the iteration limit before the likelihood settled'; break
    case 'stalled': message = 'the optimiser could not find a downhill step (ill-conditioned problem)'; break
    default: message = n < nParams ? `too few points (${n}) for ${nParams} parameters` : 'the model could not be evaluated (singular offsets or non-finite values)'
  }
  return {
    success, converged: success, status, message, planets, instruments, trend,
    stats: {
      nPoints: n, nParams, chi2, reducedChi2: n > nParams ? chi2 / (n - nParams) : NaN, chi2NoJitter: chi2NoJ,
      lnL, lnPosterior: Number.isFinite(lnPost) ? lnPost : lnL,
      bic: nParams * Math.log(n) - 2 * lnL, aic: 2 * nParams - 2 * lnL, rms: n ? Math.sqrt(ss / n) : NaN,
    },
    epoch: prob.epoch, model, residuals, iterations, history,
  }
}

/**
 * Fit of a model without Keplerians (offsets, jitters, trend only): the baseline of a search.
 */
export function fitBaseline(data: RvData, trend: TrendKind = 'none', epoch?: number): FitResult {
  return fitKeplerians(data, { planets: [], trend, epoch })
}

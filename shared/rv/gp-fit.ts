/**
 * Keplerian fit with a Gaussian-process noise model ("planets + GP"): the same Keplerians, offsets
 * and trend as the white-noise fitter, but the residuals are scored by the GP likelihood
 * ln N(r | 0, C) with C from `gp/noise-model.ts` (rotation kernel: O(N) semiseparable solver;
 * quasi-periodic: dense). Offsets and trend are profiled out exactly by generalised least squares
 * at every step (θ = (AᵀC⁻¹A)⁻¹AᵀC⁻¹r); everything else is found by the MAP of ln L + ln prior with a
 * Nelder–Mead simplex (restarted once from its optimum), and errors come from the inverse of the
 * central-difference Hessian of −ln posterior there (Laplace approximation; common practice).
 *
 * Hyperparameters and their stated priors (each may be fixed instead):
 * - rotation period P_rot: Gaussian N(value, sigma²) — value from an activity indicator's periodogram
 *   or the user (default sigma 10 % of the value);
 * - decay time: flat in ln between P_rot/2 and 10 × the baseline (a decay shorter than half a rotation
 *   leaves no periodicity to speak of; common practice after Haywood et al. 2014);
 * - amplitude(s): flat in ln between 0.01 and 1000 m/s (data units for an indicator);
 * - shape: rotation kernel f flat on [0, 1]; quasi-periodic Γ flat in ln on [0.05, 20];
 * - jitter per instrument: flat in ln between 0.001 and 1000 m/s.
 * Planets: the free coordinates, fixed parameters (`PlanetStart.fix`) and priors (`GpFitOptions.priors`) are
 * the white-noise fitter's (orbit-fit-layout.ts: P, K, √e cos ω, √e sin ω, Tc, with fixing e or ω leaving
 * ω or √e free, a fixed parameter held at its start and left out of the simplex), except that P and K are
 * searched as ln P and ln K; the stated priors on planet parameters enter ln prior as the white fitter's
 * (orbit-fit-objective.ts: normalised Gaussians, ω differences wrapped; uniform boxes, −∞ outside), and
 * the planet's errors are propagated from the Laplace covariance by the white fitter's `planetWithErrors`
 * (a fixed parameter's error is exactly 0, the fitters' mark of "fixed").
 * "Train on an indicator first": `trainGpOnIndicator` fits the GP alone to an activity indicator
 * (FWHM, S-index …) and returns the kernel shape to reuse, fixed or as the centre of the priors.
 */
import { radialVelocity, type Keplerian } from './model.ts'
import { baseline, checkRvData, type RvData } from './orbit-data.ts'
import { invertSymmetric } from './linalg.ts'
import type { PlanetParam, PlanetStart, Prior, TrendKind } from './orbit-fit-types.ts'
import { buildLayout, unpack as unpackPlanet, type FitLayout } from './orbit-fit-layout.ts'
import { insideUniformPriors, logPrior as planetLogPrior } from './orbit-fit-objective.ts'
import { planetWithErrors } from './orbit-fit-uncertainty.ts'
import { checkKernelShape, kernelValue, rotationTerms, type KernelShape } from './gp/kernels.ts'
import { denseFactor, denseSolve } from './gp/dense.ts'
import { semiseparableGram } from './gp/semiseparable.ts'
import { gpActivityAtData, gpFactor, type GpNoiseModel } from './gp/noise-model.ts'
import { nelderMead } from './gp/nelder-mead.ts'

const DEG = Math.PI / 180
const E_LIMIT = 0.95

export interface GpHyperSpec {
  kernel: 'rotation' | 'quasi-periodic'
  /** Rotation period: prior centre (d), its 1σ (default 10 %), where the value came from (for reports), the start (default the centre). */
  period: { value: number; sigma?: number; fixed?: boolean; source?: string; start?: number }
  /** Decay time (d): start (default 2 × period) or fixed value. */
  decayTime?: { value?: number; fixed?: boolean }
  /** Rotation kernel f ∈ [0, 1] (default start 0.5) or quasi-periodic Γ (default start 1). */
  shape?: { value?: number; fixed?: boolean }
  /** Amplitude(s), m/s: start or fixed values; `perInstrument` (default false) gives each instrument its own. */
  amplitude?: { value?: number[]; fixed?: boolean; perInstrument?: boolean }
}

export interface GpFitOptions {
  /** Starts of the planets; `fix` holds parameters at these values (as for the white-noise fitter). */
  planets: PlanetStart[]
  /** Priors on planet parameters, as the white-noise fitter's `FitOptions.priors` (Gaussian or uniform). */
  priors?: Prior[]
  gp: GpHyperSpec
  trend?: TrendKind
  epoch?: number
  /** 'fit' (default) or fixed jitters per instrument (m/s). */
  jitter?: 'fit' | number[]
  /** Starting jitters per instrument when they are fitted (default 0.1 × the median error). */
  jitterStart?: number[]
  /** Largest number of likelihood evaluations per simplex run (default 4000 × free parameters). */
  maxEvaluations?: number
  /** Skip the Hessian (errors NaN; for screening). */
  skipUncertainties?: boolean
}

export interface GpPlanetFit {
  period: number; K: number; e: number; omegaDeg: number; tc: number; tp: number
  /** 1σ errors; exactly 0 for a parameter held fixed, NaN where undetermined (ω and Tp may be absent). */
  uncertainty: { period: number; K: number; e: number; tc: number; omegaDeg?: number; tp?: number }
  /** Covariance of (period, K, e), row-major 3×3, when the errors were computed. */
  covPKe?: number[]
}

export interface GpFitResult {
  success: boolean
  status: 'converged' | 'max-evaluations' | 'failed'
  message: string
  planets: GpPlanetFit[]
  instruments: Array<{ name: string; offset: number; jitter: number; amplitude: number }>
  trend: { kind: TrendKind; slope: number; curvature: number; epoch: number }
  /** The fitted noise model (kernel shape, amplitudes, jitters) — reusable in gp/ functions. */
  noise: GpNoiseModel
  /** 1σ errors of the free hyperparameters (NaN where fixed or undetermined). */
  noiseUncertainty: { period: number; decayTime: number; shape: number; amplitude: number[] }
  /** The priors as applied, in words (for the methods text). */
  priors: string[]
  stats: { nPoints: number; nParams: number; lnL: number; lnPosterior: number; bic: number; aic: number }
  /** y − Keplerians − offsets − trend (the GP's input). */
  residuals: Float64Array
  /** The GP's conditional mean at each row (the activity as that row's instrument sees it). */
  activity: Float64Array
  evaluations: number
}

interface Layout {
  np: number
  /** The planets' part of the free vector: the white-noise fitter's layout (P and K searched in ln). */
  planet: FitLayout
  nInst: number
  nAmp: number
  freeAmp: boolean
  freeDecay: boolean
  freePeriod: boolean
  freeShape: boolean
  freeJitter: boolean
  nFree: number
}

const clampLn = (v: number, lo: number, hi: number): boolean => v >= Math.log(lo) && v <= Math.log(hi)

function median(a: ArrayLike<number>): number {
  const s = Array.from(a).sort((x, y) => x - y)
  return s.length ? s[Math.floor(s.length / 2)] : 0
}

/** Checks the options; throws naming the field. */
function checkSpec(o: GpFitOptions, nInst: number): void {
  const g = o.gp
  if (g.kernel !== 'rotation' && g.kernel !== 'quasi-periodic') throw new RangeError(`gp.kernel must be 'rotation' or 'quasi-periodic' (got ${g.kernel})`)
  if (!(g.period && g.period.value > 0)) throw new RangeError(`gp.period.value must be > 0 (got ${g.period?.value})`)
  if (g.period.sigma !== undefined && !(g.period.sigma > 0)) throw new RangeError(`gp.period.sigma must be > 0 (got ${g.period.sigma})`)
  if (g.period.start !== undefined && !(g.period.start > 0)) throw new RangeError(`gp.period.start must be > 0 (got ${g.period.start})`)
  const d = g.decayTime?.value
  if (d !== undefined && !(d > g.period.value / 2)) throw new RangeError(`gp.decayTime.value must exceed half the rotation period (${g.period.value / 2} d), got ${d}`)
  const a = g.amplitude?.value
  if (a && (a.length !== 1 && a.length !== nInst)) throw new RangeError(`gp.amplitude.value must have 1 or ${nInst} values`)
  if (Array.isArray(o.jitter) && o.jitter.length !== nInst) throw new RangeError(`jitter must have ${nInst} values (one per instrument)`)
  if (o.jitterStart && o.jitterStart.length !== nInst) throw new RangeError(`jitterStart must have ${nInst} values (one per instrument)`)
  // the planets and their priors are checked by the white fitter's `buildLayout`
}

/** The posterior of the "planets + GP" model over its free coordinates (see the module comment). */
function buildPosterior(data: RvData, opts: GpFitOptions) {
  checkRvData(data)
  const nInst = data.instrumentNames.length
  checkSpec(opts, nInst)
  const g = opts.gp
  const n = data.t.length
  const span = baseline(data.t)
  const trend = opts.trend ?? 'none'
  const epoch = opts.epoch ?? data.t.reduce((s, v) => s + v, 0) / Math.max(1, n)
  const jitterFree = opts.jitter === undefined || opts.jitter === 'fit'
  const perInst = !!g.amplitude?.perInstrument && nInst > 1
  const planetLayout = buildLayout(data, { planets: opts.planets, priors: opts.priors, trend, epoch })
  const PL = planetLayout.layout
  const nPlanetFree = PL.nFree
  const L: Layout = {
    np: opts.planets.length, planet: PL, nInst, nAmp: perInst ? nInst : 1,
    freeAmp: !g.amplitude?.fixed, freeDecay: !g.decayTime?.fixed, freePeriod: !g.period.fixed, freeShape: !g.shape?.fixed,
    freeJitter: jitterFree, nFree: 0,
  }
  L.nFree = nPlanetFree + (L.freeAmp ? L.nAmp : 0) + (L.freeDecay ? 1 : 0) + (L.freePeriod ? 1 : 0) + (L.freeShape ? 1 : 0) + (L.freeJitter ? nInst : 0)
  const nTrend = trend === 'none' ? 0 : trend === 'linear' ? 1 : 2
  const nLin = nInst + nTrend

  // Rows sorted by time once (the fast solver needs it); results are mapped back at the end.
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => data.t[a] - data.t[b] || a - b)
  const t = Float64Array.from(order, (i) => data.t[i])
  const y = Float64Array.from(order, (i) => data.y[i])
  const dy = Float64Array.from(order, (i) => data.dy[i])
  const inst = Int32Array.from(order, (i) => data.instrument[i])
  const A: Float64Array[] = []
  for (let k = 0; k < nInst; k++) A.push(Float64Array.from(inst, (v) => (v === k ? 1 : 0)))
  if (nTrend >= 1) A.push(Float64Array.from(t, (v) => v - epoch))
  if (nTrend >= 2) A.push(Float64Array.from(t, (v) => (v - epoch) ** 2))

  // Starting values
  const medErr = median(dy)
  const ampStart = g.amplitude?.value ?? [Math.max(medErr, 1)]
  const shapeStart = g.shape?.value ?? (g.kernel === 'rotation' ? 0.5 : 1)
  const decayStart = g.decayTime?.value ?? 2 * g.period.value
  const jitStart = Array.isArray(opts.jitter) ? opts.jitter : opts.jitterStart ?? new Array<number>(nInst).fill(Math.max(0.1 * medErr, 0.01))
  const periodSigma = g.period.sigma ?? 0.1 * g.period.value
  // Planets: the white layout's start, P and K as logs, Tc as given (not moved to the revolution nearest the epoch).
  const x0: number[] = Array.from(planetLayout.x0)
  const step: number[] = new Array<number>(nPlanetFree).fill(0.1)
  for (const pl of PL.layouts) {
    const P = pl.base.period
    if (pl.iP >= 0) { x0[pl.iP] = Math.log(P); step[pl.iP] = Math.max(0.2 * P / Math.max(span, P), 1e-4) }
    if (pl.iK >= 0) x0[pl.iK] = Math.log(Math.max(pl.base.K, 0.01))
    if (pl.ecc === 'omega') step[pl.iA] = 0.5
    if (pl.iTc >= 0) { x0[pl.iTc] = pl.base.tc; step[pl.iTc] = 0.05 * P }
  }
  /** The white layout's vector from the planets' part of x (P and K from their logs), into `out`. */
  const planetVector = (x: ArrayLike<number>, out: Float64Array): Float64Array => {
    for (let i = 0; i < nPlanetFree; i++) out[i] = x[i]
    for (const pl of PL.layouts) {
      if (pl.iP >= 0) out[pl.iP] = Math.exp(x[pl.iP])
      if (pl.iK >= 0) out[pl.iK] = Math.exp(x[pl.iK])
    }
    return out
  }
  const xw = new Float64Array(nPlanetFree)
  if (L.freeAmp) for (let k = 0; k < L.nAmp; k++) { x0.push(Math.log(ampStart.length === 1 ? ampStart[0] : ampStart[k])); step.push(0.3) }
  if (L.freeDecay) { x0.push(Math.log(decayStart)); step.push(0.3) }
  if (L.freePeriod) { x0.push(Math.log(g.period.start ?? g.period.value)); step.push(Math.min(0.05, periodSigma / g.period.value)) }
  if (L.freeShape) { x0.push(g.kernel === 'rotation' ? shapeStart : Math.log(shapeStart)); step.push(g.kernel === 'rotation' ? 0.1 : 0.3) }
  if (L.freeJitter) for (let k = 0; k < nInst; k++) { x0.push(Math.log(Math.max(jitStart[k], 0.01))); step.push(0.5) }

  interface Unpacked { orbits: Keplerian[]; amp: number[]; decay: number; period: number; shape: number; jit: number[]; lnPrior: number; ok: boolean }
  const unpack = (x: ArrayLike<number>): Unpacked => {
    let ok = true, lnPrior = 0
    const orbits: Keplerian[] = []
    planetVector(x, xw)
    for (let k = 0; k < L.np; k++) {
      const el = unpackPlanet(PL, xw, k)
      if (!(el.e < E_LIMIT) || !(el.K < 1e5) || !(el.K >= 0) || !(el.period > 0)) ok = false
      orbits.push({ period: el.period, K: el.K, e: el.e, omega: el.omega, tp: ok ? el.tp : el.tc })
    }
    if (PL.priors.length) {
      if (!insideUniformPriors(PL, xw)) ok = false
      else lnPrior += planetLogPrior(PL, xw)
    }
    let j = nPlanetFree
    const amp: number[] = []
    if (L.freeAmp) for (let k = 0; k < L.nAmp; k++) { if (!clampLn(x[j], 0.01, 1000)) ok = false; amp.push(Math.exp(x[j++])) }
    else amp.push(...ampStart)
    const period = L.freePeriod ? Math.exp(x[nPlanetFree + (L.freeAmp ? L.nAmp : 0) + (L.freeDecay ? 1 : 0)]) : g.period.value
    let decay = decayStart
    if (L.freeDecay) { decay = Math.exp(x[j]); j++ }
    if (L.freePeriod) j++
    if (!(decay > period / 2 && decay < 10 * Math.max(span, period))) ok = false
    let shape = shapeStart
    if (L.freeShape) {
      shape = g.kernel === 'rotation' ? x[j] : Math.exp(x[j])
      if (g.kernel === 'rotation' ? !(shape >= 0 && shape <= 1) : !clampLn(x[j], 0.05, 20)) ok = false
      j++
    }
    const jit: number[] = []
    if (L.freeJitter) for (let k = 0; k < nInst; k++) { if (!clampLn(x[j], 0.001, 1000)) ok = false; jit.push(Math.exp(x[j++])) }
    else jit.push(...jitStart)
    if (L.freePeriod) lnPrior += -0.5 * ((period - g.period.value) / periodSigma) ** 2
    return { orbits, amp, decay, period, shape, jit, lnPrior, ok }
  }
  const kernelOf = (u: Unpacked): KernelShape => g.kernel === 'rotation'
    ? { kind: 'rotation', period: u.period, decayTime: u.decay, shape: u.shape }
    : { kind: 'quasi-periodic', period: u.period, decayTime: u.decay, roughness: u.shape }

  const scale = new Float64Array(n), noise = new Float64Array(n), r0 = new Float64Array(n)
  /** ln L profiled over offsets and trend; also returns θ and the residual when asked. */
  const evaluate = (u: Unpacked, keep = false): { lnL: number; theta: Float64Array; resid: Float64Array | null } => {
    const kep = radialVelocity(t, u.orbits)
    for (let i = 0; i < n; i++) {
      r0[i] = y[i] - kep[i]
      scale[i] = u.amp.length === 1 ? u.amp[0] : u.amp[inst[i]]
      noise[i] = dy[i] * dy[i] + u.jit[inst[i]] ** 2
    }
    const kern = kernelOf(u)
    checkKernelShape(kern)
    // Inner products with C⁻¹: [r0, A_0 … A_m] — one fused O(N) pass on the fast path.
    const M = new Float64Array(nLin * nLin), bv = new Float64Array(nLin)
    let rr: number, logDet: number
    if (kern.kind === 'rotation') {
      const g = semiseparableGram(t, scale, noise, rotationTerms(kern), [r0, ...A])
      const R = nLin + 1
      logDet = g.logDet; rr = g.gram[0]
      for (let p = 0; p < nLin; p++) {
        bv[p] = g.gram[p + 1]
        for (let q = 0; q < nLin; q++) M[p * nLin + q] = g.gram[(p + 1) * R + q + 1]
      }
    } else {
      const f = denseFactor(t, scale, noise, (tau) => kernelValue(tau, kern))
      logDet = f.logDet
      const cr = denseSolve(f, r0)
      rr = 0
      for (let i = 0; i < n; i++) rr += r0[i] * cr[i]
      const CA = A.map((col) => denseSolve(f, col))
      for (let p = 0; p < nLin; p++) {
        for (let i = 0; i < n; i++) bv[p] += A[p][i] * cr[i]
        for (let q = 0; q <= p; q++) {
          let sum = 0
          for (let i = 0; i < n; i++) sum += A[p][i] * CA[q][i]
          M[p * nLin + q] = sum; M[q * nLin + p] = sum
        }
      }
    }
    const { inv } = invertSymmetric(M, nLin)
    const theta = new Float64Array(nLin)
    for (let p = 0; p < nLin; p++) for (let q = 0; q < nLin; q++) theta[p] += inv[p * nLin + q] * bv[q]
    let quad = rr
    for (let p = 0; p < nLin; p++) quad -= theta[p] * bv[p]
    const lnL = -0.5 * (quad + logDet + n * Math.log(2 * Math.PI))
    let resid: Float64Array | null = null
    if (keep) {
      resid = Float64Array.from(r0)
      for (let p = 0; p < nLin; p++) for (let i = 0; i < n; i++) resid[i] -= theta[p] * A[p][i]
    }
    return { lnL, theta, resid }
  }
  const cost = (x: Float64Array): number => {
    try {
      // (a step to e ≥ 1 makes the planet's elements throw: outside the support as well)
      const u = unpack(x)
      if (!u.ok) return Infinity
      const v = evaluate(u).lnL + u.lnPrior
      return Number.isFinite(v) ? -v : Infinity
    } catch {
      return Infinity
    }
  }

  return { g, n, span, trend, epoch, jitterFree, L, nInst, nTrend, nLin, order, x0, step, periodSigma, unpack, kernelOf, evaluate, cost, planetVector }
}

/** Fits Keplerians + offsets + trend with a GP noise model; see the module comment. */
export function fitWithGp(data: RvData, opts: GpFitOptions): GpFitResult {
  const { g, n, span, trend, epoch, jitterFree, L, nInst, nTrend, nLin, order, x0, step, periodSigma, unpack, kernelOf, evaluate, cost, planetVector } = buildPosterior(data, opts)
  const priors = [...describePriors(g, periodSigma, span, jitterFree), ...describePlanets(opts.planets, L.planet)]
  const maxEval = opts.maxEvaluations ?? 4000 * Math.max(1, L.nFree)
  let x = Float64Array.from(x0), evaluations = 0, converged = true
  if (L.nFree > 0) {
    if (!Number.isFinite(cost(x))) {
      return failed(data, opts, priors, 'the starting point is outside the priors or gives no likelihood (check the starting orbit, the rotation period and the decay time)')
    }
    for (let run = 0; run < 2; run++) {
      const r = nelderMead(cost, x, { step, maxEvaluations: maxEval, fTolerance: 1e-8 })
      evaluations += r.evaluations
      x = Float64Array.from(r.x)
      converged = r.converged
    }
  }
  const u = unpack(x)
  const best = evaluate(u, true)

  // Errors from the Hessian of −ln posterior in the free coordinates (Laplace approximation).
  const errs = new Float64Array(L.nFree).fill(NaN)
  /** Covariance of the free coordinates (row-major nFree × nFree; NaN where not computed). */
  const cov = new Float64Array(L.nFree * L.nFree).fill(NaN)
  let hessNote = ''
  if (!opts.skipUncertainties && L.nFree > 0) {
    const h = step.map((s) => s * 1e-2)
    const f0 = cost(x)
    const xp = Float64Array.from(x)
    const at = (i: number, di: number, j: number, dj: number): number => {
      xp.set(x); xp[i] += di; xp[j] += dj
      return cost(xp)
    }
    // Parameters at a prior bound (a jitter at its floor, say) are held there: errors NaN, noted.
    const free = Array.from({ length: L.nFree }, (_, i) => i).filter((i) => Number.isFinite(at(i, h[i], i, 0)) && Number.isFinite(at(i, -h[i], i, 0)))
    const m = free.length
    const H = new Float64Array(m * m)
    for (let a = 0; a < m; a++) {
      const i = free[a]
      H[a * m + a] = (at(i, h[i], i, 0) - 2 * f0 + at(i, -h[i], i, 0)) / (h[i] * h[i])
      for (let b = 0; b < a; b++) {
        const j = free[b]
        const v = (at(i, h[i], j, h[j]) - at(i, h[i], j, -h[j]) - at(i, -h[i], j, h[j]) + at(i, -h[i], j, -h[j])) / (4 * h[i] * h[j])
        H[a * m + b] = v; H[b * m + a] = v
      }
    }
    if (m < L.nFree) hessNote += `; ${L.nFree - m} parameter(s) at a prior bound, held there for the errors`
    if (H.every(Number.isFinite)) {
      const { inv, singular } = invertSymmetric(H, m)
      for (let a = 0; a < m; a++) errs[free[a]] = inv[a * m + a] > 0 ? Math.sqrt(inv[a * m + a]) : NaN
      for (let a = 0; a < m; a++) for (let b = 0; b < m; b++) cov[free[a] * L.nFree + free[b]] = inv[a * m + b]
      if (singular) hessNote += '; some parameters are not constrained by the data (their errors are infinite)'
    } else hessNote += '; the errors could not be computed (the posterior is not smooth at the optimum)'
  }

  const planets = planetsWithErrors(L.planet, planetVector(x, new Float64Array(L.planet.nFree)), errs, cov, L.nFree)
  let j = L.planet.nFree
  const ampErr: number[] = []
  if (L.freeAmp) for (let k = 0; k < L.nAmp; k++) { ampErr.push(u.amp[k] * errs[j]); j++ }
  else ampErr.push(...u.amp.map(() => NaN))
  const decayErr = L.freeDecay ? u.decay * errs[j++] : NaN
  const periodErr = L.freePeriod ? u.period * errs[j++] : NaN
  const shapeErr = L.freeShape ? (g.kernel === 'rotation' ? errs[j] : u.shape * errs[j]) : NaN

  const noiseModel: GpNoiseModel = { kernel: kernelOf(u), amplitude: u.amp, jitter: u.jit }
  const residuals = new Float64Array(n)
  best.resid!.forEach((v, k) => { residuals[order[k]] = v })
  const activity = gpActivityAtData(gpFactor(data, noiseModel), residuals)
  const nParams = L.nFree + nLin
  const lnPost = best.lnL + u.lnPrior
  const status = !Number.isFinite(best.lnL) ? 'failed' : converged ? 'converged' : 'max-evaluations'
  return {
    success: status === 'converged',
    status,
    message: status === 'converged' ? `converged after ${evaluations} likelihood evaluations${hessNote}`
      : status === 'failed' ? 'no finite likelihood at the optimum' : `stopped after ${evaluations} evaluations without meeting the tolerance${hessNote}`,
    planets,
    instruments: data.instrumentNames.map((name, k) => ({ name, offset: best.theta[k], jitter: u.jit[k], amplitude: u.amp.length === 1 ? u.amp[0] : u.amp[k] })),
    trend: { kind: trend, slope: nTrend >= 1 ? best.theta[nInst] : 0, curvature: nTrend >= 2 ? best.theta[nInst + 1] : 0, epoch },
    noise: noiseModel,
    noiseUncertainty: { period: periodErr, decayTime: decayErr, shape: shapeErr, amplitude: ampErr },
    priors,
    stats: { nPoints: n, nParams, lnL: best.lnL, lnPosterior: lnPost, bic: nParams * Math.log(n) - 2 * best.lnL, aic: 2 * nParams - 2 * best.lnL },
    residuals, activity, evaluations,
  }
}

/**
 * The planets' elements with errors: the Laplace covariance of the planets' coordinates, taken from ln P
 * and ln K to P and K (C_PP = P² C_lnP lnP, …), propagated to the elements by the white fitter's
 * `planetWithErrors`. Values are the fitted ones (Tc and Tp on the revolution the fit found them, not moved
 * to the epoch). A fixed parameter's error is exactly 0; a coordinate resting on a bound is held there for
 * the errors (no variance, as for the hyperparameters), and an element left with no error at all is NaN.
 */
function planetsWithErrors(PL: FitLayout, xw: Float64Array, errs: Float64Array, cov: Float64Array, nFree: number): GpPlanetFit[] {
  const m = PL.nFree
  const scale = new Float64Array(m).fill(1)
  for (const pl of PL.layouts) {
    if (pl.iP >= 0) scale[pl.iP] = xw[pl.iP]
    if (pl.iK >= 0) scale[pl.iK] = xw[pl.iK]
  }
  const c = new Float64Array(m * m)
  let any = false
  for (let a = 0; a < m; a++) {
    if (!Number.isFinite(errs[a])) continue
    any = true
    for (let b = 0; b < m; b++) if (Number.isFinite(errs[b])) c[a * m + b] = scale[a] * scale[b] * cov[a * nFree + b]
  }
  return PL.layouts.map((pl, k) => {
    const el = unpackPlanet(PL, xw, k)
    const w = planetWithErrors(PL, xw, k, { cov: c, np: m, ok: true }, !any)
    const fixed = {
      period: pl.iP < 0, K: pl.iK < 0, e: pl.ecc === 'none' || pl.ecc === 'omega', omegaDeg: pl.ecc === 'none' || pl.ecc === 'sqrte',
      tc: pl.phaseFixed === 'tc', tp: pl.phaseFixed === 'tp',
    }
    const err = (q: keyof typeof fixed): number => (fixed[q] ? 0 : w.uncertainty[q] > 0 ? w.uncertainty[q] : NaN)
    return {
      period: el.period, K: el.K, e: el.e, omegaDeg: ((el.omega / DEG) % 360 + 360) % 360, tc: el.tc, tp: el.tp,
      uncertainty: { period: err('period'), K: err('K'), e: err('e'), tc: err('tc'), omegaDeg: err('omegaDeg'), tp: err('tp') },
      covPKe: any ? w.covPKe : undefined,
    }
  })
}

const PARAM_WORDS: Record<PlanetParam, { name: string; unit: string }> = {
  period: { name: 'period', unit: ' d' }, K: { name: 'K', unit: ' m/s' }, e: { name: 'e', unit: '' },
  omegaDeg: { name: 'ω', unit: '°' }, tc: { name: 'Tc', unit: ' d' }, tp: { name: 'Tp', unit: ' d' },
}

/** The planets' fixed parameters and stated priors, in words (planets numbered from 1). */
function describePlanets(planets: PlanetStart[], PL: FitLayout): string[] {
  const out: string[] = []
  const DEG_PER_RAD = 1 / DEG
  planets.forEach((p, k) => {
    const base = PL.layouts[k].base
    // the values as given (ω not through radians and back); a phase given the other way as computed
    const value: Record<PlanetParam, number> = {
      period: p.period, K: p.K, e: p.e ?? 0, omegaDeg: p.omegaDeg ?? base.omega * DEG_PER_RAD, tc: p.tc ?? base.tc, tp: p.tp ?? base.tp,
    }
    for (const f of new Set(p.fix ?? [])) out.push(`planet ${k + 1} ${PARAM_WORDS[f].name} fixed at ${value[f]}${PARAM_WORDS[f].unit}`)
  })
  for (const pr of PL.priors) {
    const wd = PARAM_WORDS[pr.param]
    if (pr.gaussian) out.push(`planet ${pr.planet + 1} ${wd.name} ~ N(${pr.gaussian.mu}, ${pr.gaussian.sigma}²)${wd.unit}`)
    if (pr.uniform) out.push(`planet ${pr.planet + 1} ${wd.name} uniform on [${pr.uniform.min}, ${pr.uniform.max}]${wd.unit}`)
  }
  return out
}

function describePriors(g: GpHyperSpec, periodSigma: number, span: number, jitterFree: boolean): string[] {
  const out: string[] = []
  const src = g.period.source ? ` (from ${g.period.source})` : ''
  out.push(g.period.fixed ? `rotation period fixed at ${g.period.value} d${src}` : `rotation period ~ N(${g.period.value}, ${periodSigma.toPrecision(3)}²) d${src}`)
  out.push(g.decayTime?.fixed ? `decay time fixed at ${g.decayTime.value} d` : `decay time flat in ln between half the rotation period and ${(10 * span).toFixed(0)} d`)
  if (g.kernel === 'rotation') out.push(g.shape?.fixed ? `shape factor fixed at ${g.shape.value}` : 'shape factor (P/2 harmonic share) flat on [0, 1]')
  else out.push(g.shape?.fixed ? `Γ fixed at ${g.shape.value}` : 'Γ flat in ln on [0.05, 20]')
  out.push(g.amplitude?.fixed ? `GP amplitude fixed at ${g.amplitude.value?.join(', ')}` : `GP amplitude${g.amplitude?.perInstrument ? ' per instrument' : ''} flat in ln on [0.01, 1000]`)
  if (jitterFree) out.push('jitter per instrument flat in ln on [0.001, 1000] m/s')
  return out
}

function failed(data: RvData, opts: GpFitOptions, priors: string[], message: string): GpFitResult {
  const n = data.t.length
  return {
    success: false, status: 'failed', message, planets: [], instruments: [], priors,
    trend: { kind: opts.trend ?? 'none', slope: NaN, curvature: NaN, epoch: NaN },
    noise: { kernel: { kind: 'rotation', period: opts.gp.period.value, decayTime: opts.gp.period.value, shape: 0 }, amplitude: [0], jitter: [0] },
    noiseUncertainty: { period: NaN, decayTime: NaN, shape: NaN, amplitude: [] },
    stats: { nPoints: n, nParams: 0, lnL: NaN, lnPosterior: NaN, bic: NaN, aic: NaN },
    residuals: new Float64Array(n), activity: new Float64Array(n), evaluations: 0,
  }
}

/**
 * "Train on an indicator first": fits the GP alone (no planets; a mean per instrument) to an activity
 * indicator and returns the fit; its `noise.kernel` is the shape to reuse for the velocities (fixed, or
 * as the centre of the priors). `error` may be omitted (unit weights, with a fitted jitter taking the
 * scatter). The amplitude is in the indicator's units and is not reused.
 */
export function trainGpOnIndicator(
  data: Pick<RvData, 't' | 'instrument' | 'instrumentNames'>, value: Float64Array, error: Float64Array | null, gp: GpHyperSpec,
): GpFitResult {
  const n = data.t.length
  if (value.length !== n) throw new RangeError(`indicator has ${value.length} values, the data have ${n} rows`)
  const keep: number[] = []
  for (let i = 0; i < n; i++) if (Number.isFinite(value[i]) && (!error || error[i] > 0)) keep.push(i)
  const mean = keep.reduce((s, i) => s + value[i], 0) / Math.max(1, keep.length)
  const sd = Math.sqrt(keep.reduce((s, i) => s + (value[i] - mean) ** 2, 0) / Math.max(1, keep.length))
  if (!(sd > 0)) throw new RangeError('the indicator is constant; there is nothing to train the GP on')
  // Fitted in units of the indicator's standard deviation (the amplitude and jitter priors are in
  // m/s-like ranges), then scaled back.
  const sub: RvData = {
    t: Float64Array.from(keep, (i) => data.t[i]), y: Float64Array.from(keep, (i) => (value[i] - mean) / sd),
    dy: Float64Array.from(keep, (i) => (error ? error[i] / sd : 1e-3)),
    instrument: Int32Array.from(keep, (i) => data.instrument[i]), instrumentNames: data.instrumentNames,
  }
  const amp = gp.amplitude?.value?.map((a) => a / sd) ?? [1]
  const fit = fitWithGp(sub, { planets: [], gp: { ...gp, amplitude: { ...gp.amplitude, value: amp } } })
  const back = (v: number): number => v * sd
  fit.noise = { ...fit.noise, amplitude: fit.noise.amplitude.map(back), jitter: fit.noise.jitter.map(back) }
  fit.noiseUncertainty.amplitude = fit.noiseUncertainty.amplitude.map(back)
  fit.instruments = fit.instruments.map((ins) => ({ ...ins, offset: mean + back(ins.offset), jitter: back(ins.jitter), amplitude: back(ins.amplitude) }))
  fit.residuals = fit.residuals.map(back)
  fit.activity = fit.activity.map(back)
  fit.priors = fit.priors.map((p) => p.replace('m/s', 'indicator standard deviations').replace('flat in ln on [0.01, 1000]', 'flat in ln on [0.01, 1000] indicator standard deviations'))
  return fit
}

/** What an ensemble sampler needs to sample the "planets + GP" posterior. */
export interface GpPosterior {
  /** ln L + ln prior (profiled over offsets and trend) at a free vector; −Infinity outside the priors. */
  logProb: (x: Float64Array) => number
  /** Free coordinates: per planet ln P, ln K, √e cos ω, √e sin ω, Tc (the free ones; ω in radians alone when e is fixed, √e alone when ω is); then ln amplitude(s), ln decay, ln P_rot, shape, ln jitter(s) (the free ones). */
  names: string[]
  /** The starting vector from the options, and a scale per coordinate for spreading walkers. */
  start: Float64Array
  scales: Float64Array
}

/**
 * The "planets + GP" log-posterior for a sampler (the same function `fitWithGp` maximises; offsets and
 * trend profiled out). Start a sampler around `fitWithGp`'s optimum by passing its values as the options'
 * starts.
 */
export function gpLogPosterior(data: RvData, opts: GpFitOptions): GpPosterior {
  const { g, L, nInst, x0, step, cost } = buildPosterior(data, opts)
  const names: string[] = []
  L.planet.layouts.forEach((pl, k) => {
    const s = `${k + 1}`
    if (pl.iP >= 0) names.push(`ln P${s}`)
    if (pl.iK >= 0) names.push(`ln K${s}`)
    if (pl.ecc === 'both') names.push(`√e cos ω${s}`, `√e sin ω${s}`)
    else if (pl.ecc === 'omega') names.push(`ω${s} (rad)`)
    else if (pl.ecc === 'sqrte') names.push(`√e${s}`)
    if (pl.iTc >= 0) names.push(`Tc${s}`)
  })
  if (L.freeAmp) for (let k = 0; k < L.nAmp; k++) names.push(L.nAmp > 1 ? `ln amplitude ${data.instrumentNames[k]}` : 'ln amplitude')
  if (L.freeDecay) names.push('ln decay time')
  if (L.freePeriod) names.push('ln rotation period')
  if (L.freeShape) names.push(g.kernel === 'rotation' ? 'shape' : 'ln Γ')
  if (L.freeJitter) for (let k = 0; k < nInst; k++) names.push(`ln jitter ${data.instrumentNames[k]}`)
  return { logProb: (x) => -cost(x), names, start: Float64Array.from(x0), scales: Float64Array.from(step) }
}

/**
 * Posterior sampling of a fitted RV model: the log-posterior of `posterior.ts` explored by the
 * ensemble sampler of `sampler.ts` (Goodman & Weare 2010), started in a small ball around the
 * maximum-likelihood fit scaled by its covariance errors, followed by burn-in removal, thinning,
 * convergence diagnostics (`diagnostics.ts`: autocorrelation time with the N > 50 τ rule of
 * Foreman-Mackey et al. 2013, rank-normalised split-R̂ of Vehtari et al. 2021, acceptance) and
 * summaries (median, 16th and 84th percentiles, mean, sd) of every fitted and derived quantity:
 * M sin i and a with the stellar mass drawn from its error for every draw.
 */
import { fitKeplerians, type FitOptions, type FitResult } from './orbit-fit.ts'
import type { RvData } from './orbit-data.ts'
import { nearestEpoch, tcToTp } from './model.ts'
import { minimumMass, semiMajorAxis } from './derived.ts'
import { createLogPosterior, specFromFit, samplingScales, planetLabel, type SamplingPrior } from './posterior.ts'
import { createRandom } from '../math/random.ts'
import { runEnsemble, type ProgressCallback, type SamplerState } from './sampler.ts'
import { integratedTime, splitRhat, acceptanceFraction } from './diagnostics.ts'

const DEG = Math.PI / 180

export interface SampleOptions {
  /** Walkers (even, ≥ 2 × number of sampled parameters); default 32. */
  walkers?: number
  /** Steps per walker; default 5000. */
  steps?: number
  /** Steps dropped at the start; default a quarter of the steps. */
  burn?: number
  /** Keep every thin-th step for the summaries; default 1. */
  thin?: number
  /** Seed of the run; default 1. */
  seed?: number
  /** Stellar mass (solar masses) and its 1σ error, for M sin i and a. */
  mstar?: { value: number; err: number }
  /** Extra priors on physical parameters (multiplied into the defaults of posterior.ts). */
  priors?: SamplingPrior[]
  /** Hard upper bound on e (default 0.99). */
  eMax?: number
  /** Called every `progressEvery` steps; return 'stop' to end the run early (the result says so). */
  onProgress?: ProgressCallback
  progressEvery?: number
  /** Most rows in the kept sample for plots (default 2000). */
  maxSampleRows?: number
  /** Size of the starting ball in units of the fit's errors (default 0.1). */
  ballScale?: number
  /** Walker groups for split-R̂ (default 4; must divide walkers). */
  rhatGroups?: number
  /**
   * Continue an interrupted run: the state and the kept chain (and ln p) handed to `onProgress`
   * (copied), with the same data, model, seed and options. The result equals that of the
   * uninterrupted run.
   */
  resume?: { state: SamplerState; chain: ArrayLike<number>; lnProb: ArrayLike<number> }
}

export interface ParameterSummary {
  name: string
  unit: string
  median: number
  /** 16th percentile. */
  lo: number
  /** 84th percentile. */
  hi: number
  mean: number
  sd: number
}

export interface SampleDiagnostics {
  /** Sampling coordinates the diagnostics refer to (ln P b, ln K b, √e cos ω b, …). */
  names: string[]
  /** Integrated autocorrelation time per sampling coordinate, in steps. */
  tau: number[]
  /** Steps after burn-in divided by τ (at least 50 wanted). */
  nOverTau: number[]
  /** Rank-normalised split-R̂ across walker groups (below 1.01 wanted). */
  rhat: number[]
  /** Mean acceptance fraction, and the lowest and highest of the walkers. */
  acceptance: number
  acceptanceMin: number
  acceptanceMax: number
  converged: boolean
  warnings: string[]
}

export interface SampleResult {
  parameters: ParameterSummary[]
  /** Thinned draws for plots: every walker at evenly spaced steps after burn-in, column per name. */
  sample: { names: string[]; units: string[]; step: number[]; walker: number[]; columns: number[][] }
  diagnostics: SampleDiagnostics
  settings: { seed: number; walkers: number; steps: number; burn: number; thin: number; stepsDone: number; stopped: boolean }
  /** The maximum-likelihood fit the walkers started from. */
  start: { lnPosterior: number; fitStatus: FitResult['status'] }
}

function isFitResult(v: FitResult | FitOptions): v is FitResult {
  return (v as FitResult).stats !== undefined && Array.isArray((v as FitResult).instruments)
}

function intOpt(name: string, v: number | undefined, dflt: number, min: number): number {
  const x = v ?? dflt
  if (!(Number.isInteger(x) && x >= min)) throw new RangeError(`${name} must be an integer ≥ ${min}, got ${v}`)
  return x
}

/** Percentile p ∈ [0, 1] of sorted values, linear interpolation between order statistics (numpy's default). */
function quantileSorted(s: Float64Array, p: number): number {
  const h = (s.length - 1) * p
  const i = Math.floor(h)
  return i + 1 < s.length ? s[i] + (h - i) * (s[i + 1] - s[i]) : s[i]
}

function summarise(name: string, unit: string, v: Float64Array): ParameterSummary {
  let m = 0
  for (let i = 0; i < v.length; i++) m += v[i]
  m /= v.length
  let ss = 0
  for (let i = 0; i < v.length; i++) ss += (v[i] - m) ** 2
  const s = Float64Array.from(v).sort()
  return {
    name, unit, median: quantileSorted(s, 0.5), lo: quantileSorted(s, 0.16), hi: quantileSorted(s, 0.84),
    mean: m, sd: v.length > 1 ? Math.sqrt(ss / (v.length - 1)) : NaN,
  }
}

const fmt = (v: number, d = 2): string => (Number.isFinite(v) ? v.toFixed(d) : String(v))

/**
 * Samples the posterior of the model of `model` (a fit, or fit options from which the maximum-
 * likelihood fit is computed first). Throws a RangeError naming the option on misuse; a run that
 * has not converged (or was stopped) returns normally with `diagnostics.converged: false` and
 * plain-language warnings.
 */
export function samplePosterior(data: RvData, model: FitResult | FitOptions, options: SampleOptions = {}): SampleResult {
  const steps = intOpt('steps', options.steps, 5000, 4)
  const thin = intOpt('thin', options.thin, 1, 1)
  const burn = intOpt('burn', options.burn, Math.floor(steps / 4), 0)
  if (burn > steps - 4 * thin) throw new RangeError(`burn must leave at least ${4 * thin} steps (steps ${steps}, thin ${thin}), got ${burn}`)
  const seed = options.seed ?? 1
  if (!Number.isFinite(seed)) throw new RangeError(`seed must be a finite number, got ${seed}`)
  const maxRows = intOpt('maxSampleRows', options.maxSampleRows, 2000, 1)
  const ballScale = options.ballScale ?? 0.1
  if (!(ballScale > 0)) throw new RangeError(`ballScale must be > 0, got ${ballScale}`)
  if (options.mstar && !(options.mstar.value > 0 && options.mstar.err >= 0)) throw new RangeError('mstar needs value > 0 and err ≥ 0')

  const fit = isFitResult(model) ? model : fitKeplerians(data, model)
  const fitPriors = isFitResult(model) ? [] : (model.priors ?? [])
  const spec = specFromFit(fit, { priors: [...fitPriors, ...(options.priors ?? [])], eMax: options.eMax })
  // A zero ML jitter is a poor centre for ln s: start at a tenth of the typical error instead.
  let meanErr = 0
  for (let i = 0; i < data.dy.length; i++) meanErr += data.dy[i]
  meanErr /= Math.max(data.dy.length, 1)
  spec.jitters = spec.jitters?.map((s) => Math.max(s, 0.1 * meanErr))
  const post = createLogPosterior(data, spec)
  const nDim = post.nDim
  const walkers = intOpt('walkers', options.walkers, Math.max(32, 2 * nDim + (nDim % 2)), 2)
  if (walkers < 2 * nDim || walkers % 2) throw new RangeError(`walkers must be even and ≥ 2 × ${nDim} sampled parameters, got ${walkers}`)
  const groups = options.rhatGroups ?? 4
  if (!(Number.isInteger(groups) && groups >= 1 && walkers % groups === 0)) throw new RangeError(`rhatGroups must divide walkers (${walkers}), got ${groups}`)

  // ---- starting ball
  const rng = createRandom(seed)
  const scales = samplingScales(fit, post)
  const start = new Float64Array(walkers * nDim)
  const x = new Float64Array(nDim)
  if (!Number.isFinite(post.logProb(post.centre))) throw new RangeError('model: the fitted point lies outside the support of the posterior (check priors and eMax)')
  for (let w = 0; w < walkers; w++) {
    let shrink = 1
    for (let tries = 0; ; tries++) {
      for (let d = 0; d < nDim; d++) x[d] = post.centre[d] + shrink * ballScale * scales[d] * rng.normal()
      if (Number.isFinite(post.logProb(x))) break
      if (tries % 20 === 19) shrink /= 2
    }
    start.set(x, w * nDim)
  }

  let run
  const resume = options.resume
  if (resume) {
    const st = resume.state
    if (!st || st.nWalkers !== walkers || st.nDim !== nDim) throw new RangeError(`resume.state must be ${walkers} walkers × ${nDim} parameters`)
    if (!(Number.isInteger(st.step) && st.step >= 0 && st.step <= steps)) throw new RangeError(`resume.state.step must be in [0, steps], got ${st.step}`)
    const keptBefore = Math.floor(st.step / thin)
    if (resume.chain.length !== keptBefore * walkers * nDim || resume.lnProb.length !== keptBefore * walkers) {
      throw new RangeError(`resume.chain must hold the ${keptBefore} kept steps of the state (thin ${thin})`)
    }
    if (st.step % thin) throw new RangeError('resume.state.step must be a multiple of thin')
    const rest = runEnsemble({
      logProb: post.logProb, nDim, nWalkers: walkers, start: st, steps: steps - st.step, random: rng, thin,
      onProgress: options.onProgress, progressEvery: options.progressEvery,
    })
    const chainAll = new Float64Array((keptBefore + rest.nKept) * walkers * nDim)
    chainAll.set(resume.chain); chainAll.set(rest.chain, keptBefore * walkers * nDim)
    const lnpAll = new Float64Array((keptBefore + rest.nKept) * walkers)
    lnpAll.set(resume.lnProb); lnpAll.set(rest.lnProb, keptBefore * walkers)
    run = { ...rest, chain: chainAll, lnProb: lnpAll, nKept: keptBefore + rest.nKept, nSteps: st.step + rest.nSteps }
  } else {
    run = runEnsemble({
      logProb: post.logProb, nDim, nWalkers: walkers, start, steps, random: rng, thin,
      onProgress: options.onProgress, progressEvery: options.progressEvery,
    })
  }

  // ---- post-burn chain (kept steps are steps thin, 2·thin, …)
  const warnings: string[] = []
  let burnKept = Math.ceil(burn / thin)
  if (run.stopped) warnings.push(`The run was stopped after ${run.nSteps} of ${steps} steps; the results use the steps done so far.`)
  if (run.nKept - burnKept < 4) {
    burnKept = Math.floor(run.nKept / 2)
    warnings.push(`The run ended before the burn-in was over; the first half of the ${run.nSteps} steps done was dropped instead.`)
  }
  const nPost = run.nKept - burnKept
  const chain = run.chain.subarray(burnKept * walkers * nDim, run.nKept * walkers * nDim)
  const lnp = run.lnProb.subarray(burnKept * walkers, run.nKept * walkers)
  const shape = { nSteps: nPost, nWalkers: walkers, nDim }
  const tauKept = nPost >= 4 ? integratedTime(chain, shape) : new Float64Array(nDim).fill(NaN)
  const tau = Array.from(tauKept, (v) => v * thin)
  const postSteps = nPost * thin
  const nOverTau = tau.map((v) => postSteps / v)
  const rhat = nPost >= 4 ? Array.from(splitRhat(chain, shape, { groups })) : new Array(nDim).fill(NaN)
  const acc = acceptanceFraction(run.acceptance)
  let accMin = Infinity, accMax = -Infinity
  for (const a of run.acceptance) { accMin = Math.min(accMin, a); accMax = Math.max(accMax, a) }

  const shortOnes = post.names.filter((_, d) => !(nOverTau[d] >= 50))
  if (shortOnes.length) {
    const worst = Math.max(...tau.filter(Number.isFinite))
    warnings.push(
      `The run is too short to trust: after burn-in it lasted ${postSteps} steps, only ${fmt(Math.min(...nOverTau), 0)} autocorrelation times ` +
      `(at least 50 are needed) for ${shortOnes.join(', ')}. About ${Math.ceil((50 * worst + burn) / 100) * 100} steps would do.`,
    )
  }
  const badRhat = post.names.filter((_, d) => !(rhat[d] < 1.01))
  if (badRhat.length) {
    warnings.push(`Groups of walkers disagree about ${badRhat.join(', ')} (split-R̂ up to ${fmt(Math.max(...rhat.filter(Number.isFinite)), 3)}; below 1.01 is expected): the walkers may sit in different modes or still be drifting.`)
  }
  const maxTau = Math.max(...tau.filter(Number.isFinite), 0)
  if (burn < 2 * maxTau) warnings.push(`The burn-in (${burn} steps) is shorter than twice the longest autocorrelation time (${fmt(maxTau, 0)} steps): the first steps kept may still remember the starting point.`)
  if (acc < 0.15) warnings.push(`Few proposed moves were accepted (${fmt(100 * acc, 0)} %); the posterior may have several separate modes or a very narrow ridge.`)
  if (acc > 0.2 && accMin < 0.05) {
    const stuck = Array.from(run.acceptance).map((a, w) => (a < 0.05 ? w : -1)).filter((w) => w >= 0)
    warnings.push(`Some walkers barely moved (${stuck.length} of ${walkers} accepted under 5 % of their moves); they may be stuck in a region of low probability.`)
  }
  const fixedNames = fit.planets.flatMap((p, k) => {
    const fixedHere = isFitResult(model) ? [] : (model.planets[k]?.fix ?? [])
    const u = p.uncertainty
    const zero = (['period', 'K', 'e', 'omegaDeg', 'tc'] as const).filter((q) => u[q] === 0 && !(q === 'omegaDeg' && p.e === 0))
    const all = [...new Set([...fixedHere, ...zero])]
    return all.length ? [`${all.join(', ')} of planet ${planetLabel(k)}`] : []
  })
  if (fixedNames.length) warnings.push(`The fit held ${fixedNames.join('; ')} fixed; the sampler does not fix parameters and sampled them all.`)
  if (!fit.success) warnings.push(`The starting fit did not converge (${fit.message}); the walkers started from its last point.`)
  const converged = !run.stopped && shortOnes.length === 0 && badRhat.length === 0 && acc >= 0.15 && !(acc > 0.2 && accMin < 0.05)

  // ---- physical and derived values per draw
  const nDraw = nPost * walkers
  const L = post.layout
  const cols: Array<{ name: string; unit: string; v: Float64Array }> = []
  const col = (name: string, unit: string): Float64Array => { const v = new Float64Array(nDraw); cols.push({ name, unit, v }); return v }
  const mst = options.mstar
  const mRng = createRandom((seed ^ 0x5bd1e995) >>> 0)
  const mDraw = new Float64Array(nDraw)
  if (mst) {
    for (let i = 0; i < nDraw; i++) {
      let m = 0
      for (let k = 0; k < 1000 && !(m > 0); k++) m = mst.value + mst.err * mRng.normal()
      mDraw[i] = m > 0 ? m : mst.value
    }
  }
  for (let k = 0; k < L.nPlanets; k++) {
    const lab = planetLabel(k)
    const fp = fit.planets[k]
    const cP = col(`P ${lab}`, 'd'), cK = col(`K ${lab}`, 'm/s'), cE = col(`e ${lab}`, ''), cW = col(`ω ${lab}`, 'deg')
    const cTc = col(`Tc ${lab}`, 'd'), cTp = col(`Tp ${lab}`, 'd')
    const cMj = mst ? col(`M sin i ${lab}`, 'M_Jup') : null
    const cMe = mst ? col(`M sin i ${lab} (Earth masses)`, 'M_Earth') : null
    const cA = mst ? col(`a ${lab}`, 'au') : null
    const o = 5 * k
    for (let i = 0; i < nDraw; i++) {
      const q = i * nDim
      const P = Math.exp(chain[q + o]), K = Math.exp(chain[q + o + 1])
      const h = chain[q + o + 2], kk = chain[q + o + 3], tc = chain[q + o + 4]
      const e = h * h + kk * kk
      const w = e > 0 ? Math.atan2(kk, h) : 0
      cP[i] = P; cK[i] = K; cE[i] = e
      cW[i] = fp.omegaDeg + ((((w / DEG - fp.omegaDeg) % 360) + 540) % 360) - 180
      cTc[i] = tc
      cTp[i] = nearestEpoch(tcToTp(tc, P, e, w), P, fp.tp)
      if (mst) {
        const m = minimumMass(P, K, e, mDraw[i])
        cMj![i] = m.msiniMjup; cMe![i] = m.msiniMearth
        cA![i] = semiMajorAxis(P, mDraw[i], m.msiniMsun)
      }
    }
  }
  for (let k = 0; k < L.nInst; k++) {
    const c = col(`offset ${data.instrumentNames[k]}`, 'm/s')
    for (let i = 0; i < nDraw; i++) c[i] = chain[i * nDim + L.iOffset + k]
  }
  if (L.iJitter >= 0) {
    for (let k = 0; k < L.nInst; k++) {
      const c = col(`jitter ${data.instrumentNames[k]}`, 'm/s')
      for (let i = 0; i < nDraw; i++) c[i] = Math.exp(chain[i * nDim + L.iJitter + k])
    }
  }
  if (L.iSlope >= 0) { const c = col('slope', 'm/s/d'); for (let i = 0; i < nDraw; i++) c[i] = chain[i * nDim + L.iSlope] }
  if (L.iCurvature >= 0) { const c = col('curvature', 'm/s/d²'); for (let i = 0; i < nDraw; i++) c[i] = chain[i * nDim + L.iCurvature] }

  // summaries use every thin-th step after burn-in
  const parameters = cols.map((c) => {
    const s = summarise(c.name, c.unit, c.v)
    if (c.unit === 'deg') {
      // report ω with its median in [0°, 360°), interval shifted with it
      const shift = 360 * Math.floor(s.median / 360)
      s.median -= shift; s.lo -= shift; s.hi -= shift; s.mean -= shift
    }
    return s
  })

  // thinned plot sample: all walkers at evenly spaced kept steps
  const every = Math.max(1, Math.ceil((nPost * walkers) / maxRows))
  const stepIdx: number[] = [], walkerIdx: number[] = []
  const rows: number[] = []
  for (let s = 0; s < nPost; s += every) {
    for (let w = 0; w < walkers; w++) { rows.push(s * walkers + w); stepIdx.push((burnKept + s + 1) * thin); walkerIdx.push(w) }
    if (rows.length + walkers > maxRows) break
  }
  const sample = {
    names: [...cols.map((c) => c.name), 'ln posterior'],
    units: [...cols.map((c) => c.unit), ''],
    step: stepIdx, walker: walkerIdx,
    columns: [...cols.map((c) => rows.map((r) => c.v[r])), rows.map((r) => lnp[r])],
  }
  return {
    parameters, sample,
    diagnostics: { names: post.names, tau, nOverTau, rhat, acceptance: acc, acceptanceMin: accMin, acceptanceMax: accMax, converged, warnings },
    settings: { seed, walkers, steps, burn, thin, stepsDone: run.nSteps, stopped: run.stopped },
    start: { lnPosterior: fit.stats.lnPosterior, fitStatus: fit.status },
  }
}

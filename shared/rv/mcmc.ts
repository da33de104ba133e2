/**
 * Posterior sampling of a fitted RV model: the log-posterior of `posterior.ts` explored by the
 * ensemble sampler of `sampler.ts` (Goodman & Weare 2010), started in a small ball around the
 * maximum-likelihood fit scaled by its covariance errors. Parameters the model fixes are held at
 * their values (not sampled).
 *
 * By default the run stops by itself once it has converged, within a budget of steps: every
 * sampling coordinate must have N > 50 τ (N the steps after burn-in, τ the integrated
 * autocorrelation time; Foreman-Mackey et al. 2013, PASP 125, 306) and rank-normalised split-R̂
 * below 1.01 (Vehtari et al. 2021, Bayesian Analysis 16, 667). The rule is checked on a bounded,
 * thinned copy of the chain (`chain-store.ts`) at steps fixed in advance, so the work per step does
 * not grow with the chain and a resumed run checks (and stops) exactly where an uninterrupted one
 * would. Burn-in: a quarter of the steps done unless given.
 *
 * Then summaries (median, 16th and 84th percentiles, mean, sd) of every fitted and derived
 * quantity: M sin i and a with the stellar mass drawn from its error for every draw.
 *
 * With a GP noise model (`options.noise`, the model spec's `noise`), the walkers start around the MAP
 * of "planets + GP" (`fitWithGp`, started from the white-noise fit) and the GP hyperparameters are
 * sampled too (posterior-gp.ts); their summaries carry units (GP amplitude m/s, decay time and
 * rotation period d, shape dimensionless).
 */
import { fitKeplerians, type FitOptions, type FitResult, type PlanetParam } from './orbit-fit.ts'
import type { RvData } from './orbit-data.ts'
import { nearestEpoch, tcToTp, tpToTc } from './model.ts'
import { minimumMass, semiMajorAxis } from './derived.ts'
import { createLogPosterior, specFromFit, samplingScales, planetLabel, fixedInFit, type SamplingPrior, type LogPosterior } from './posterior.ts'
import { createRandom } from '../math/random.ts'
import { fitWithGp, type GpFitResult, type GpHyperSpec } from './gp-fit.ts'
import { runEnsemble, type SamplerState } from './sampler.ts'
import { integratedTime, splitRhat, acceptanceFraction } from './diagnostics.ts'
import { ChainStore, type ChainRows } from './chain-store.ts'

const DEG = Math.PI / 180

/** The convergence rule: N > 50 τ for every coordinate (Foreman-Mackey et al. 2013) … */
export const MIN_N_OVER_TAU = 50
/** … and split-R̂ below 1.01 (Vehtari et al. 2021). */
export const MAX_RHAT = 1.01
/** Default budget of a run that stops when converged, and default length of a fixed-length run. */
export const DEFAULT_MAX_STEPS = 100_000
export const DEFAULT_FIXED_STEPS = 5000
/** Rows of the kept, thinned copy of the chain (see chain-store.ts). */
export const DEFAULT_KEPT_ROWS = 1024

export interface ConvergenceCheck {
  /** Step at which the check was made and the burn-in it used. */
  step: number
  burn: number
  /** Integrated autocorrelation time per coordinate, steps (τ of the thinned copy × its thinning). */
  tau: number[]
  nOverTau: number[]
  rhat: number[]
  /** Every coordinate passes both parts of the rule. */
  passed: boolean
}

/** What `onProgress` receives. */
export interface SampleProgress {
  /** Steps done since the start of the whole run. */
  step: number
  /** The budget (or the fixed length). */
  maxSteps: number
  /** Resumable state (a copy). */
  state: SamplerState
  /** Mean acceptance fraction so far. */
  acceptance: number
  /** The latest convergence check (null before the first). */
  check: ConvergenceCheck | null
  /** The kept copy of the chain: `takePending()` gives the rows kept since the last call, for a checkpoint. */
  store: ChainStore
}

export interface SampleOptions {
  /** Walkers (even, ≥ 2 × number of sampled parameters); default max(32, 2 × sampled parameters). */
  walkers?: number
  /** Most steps per walker: the budget when stopping at convergence (default 100 000), else the length (default 5000). */
  steps?: number
  /** Stop as soon as the convergence rule passes (default true). */
  untilConverged?: boolean
  /** Steps dropped at the start; default a quarter of the steps done. */
  burn?: number
  /** Thinning of the kept copy at the start (it doubles as the chain grows); default 1. */
  thin?: number
  /** Rows of the kept copy (default 1024). */
  keptRows?: number
  /** Seed of the run; default 1. */
  seed?: number
  /** Stellar mass (solar masses) and its 1σ error, for M sin i and a. */
  starMass?: { value: number; err: number }
  /** Extra priors on physical parameters (multiplied into the defaults of posterior.ts). */
  priors?: SamplingPrior[]
  /** Parameters held fixed, per planet (default: the model's `fix` lists, or for a FitResult `fixedInFit`). */
  fix?: ReadonlyArray<readonly PlanetParam[] | undefined>
  /** Hard upper bound on e (default 0.99). */
  eMax?: number
  /** GP noise model (the model spec's `noise` of kind 'gp'); absent or null: white noise. */
  noise?: GpHyperSpec | null
  /** Called every `progressEvery` steps; return 'stop' to end the run early (the result says so). */
  onProgress?: (p: SampleProgress) => void | 'stop'
  progressEvery?: number
  /** Most rows in the kept sample for plots (default 2000). */
  maxSampleRows?: number
  /** Size of the starting ball in units of the fit's errors (default 0.1). */
  ballScale?: number
  /** Walker groups for split-R̂ (default: `defaultRhatGroups(walkers)`; must divide walkers). */
  rhatGroups?: number
  /**
   * Continue an interrupted run: the state from `onProgress` and every row the store's
   * `takePending()` returned until then (in order), with the same data, model, seed and options.
   * The result equals that of the uninterrupted run.
   */
  resume?: { state: SamplerState; rows: ChainRows }
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
  /** Held fixed by the model (median = lo = hi = its value, sd 0). */
  fixed?: boolean
}

export interface SampleDiagnostics {
  /** Sampling coordinates the diagnostics refer to (ln P b, ln K b, √e cos ω b, …): the free parameters. */
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
  settings: {
    seed: number; walkers: number; steps: number; burn: number; thin: number; stepsDone: number; stopped: boolean
    /** Stopped by the convergence rule (true) or ran to its steps; false for a fixed-length run. */
    untilConverged: boolean
    /** Thinning and rows of the kept copy at the end; walker groups of split-R̂. */
    keptThin: number; keptRows: number; rhatGroups: number
    /** Parameters held fixed, per planet. */
    fixed: PlanetParam[][]
  }
  /** The maximum-likelihood fit the walkers started from (with a GP: the planets + GP MAP). */
  start: { lnPosterior: number; fitStatus: FitResult['status'] }
  /** The GP hyperparameters' priors in words (empty for white noise). */
  noisePriors: string[]
}

/**
 * Walker groups for split-R̂: the divisor of `walkers` between 2 and 8 nearest to 4 (the larger on
 * a tie). Every even walker count has one: 34 walkers → 2 groups of 17, 30 → 5 groups of 6 (a tie
 * with 3, the larger wins), 36 → 4 groups of 9.
 */
export function defaultRhatGroups(walkers: number): number {
  if (!(Number.isInteger(walkers) && walkers >= 2)) throw new RangeError(`walkers must be an integer ≥ 2, got ${walkers}`)
  let best = 1
  for (let g = 2; g <= 8; g++) {
    if (walkers % g !== 0 || walkers / g < 2) continue
    if (best === 1 || Math.abs(g - 4) < Math.abs(best - 4) || (Math.abs(g - 4) === Math.abs(best - 4) && g > best)) best = g
  }
  return best
}

/**
 * The convergence rule on the kept copy after `burn` steps: τ per coordinate from the thinned
 * rows (× the thinning, as `get_autocorr_time(thin=k)` of Foreman-Mackey et al.'s emcee does),
 * N/τ with N the steps done after burn-in, split-R̂ over `groups` walker groups. With `lazy`,
 * split-R̂ (the costlier part: ranks of every draw) is computed only once the τ part passes, and is
 * NaN before (the rule cannot pass then anyway).
 */
export function checkConvergence(store: ChainStore, step: number, burn: number, groups: number, lazy = false): ConvergenceCheck {
  const from = store.firstRowAfter(burn)
  const nRows = store.rows - from
  const D = store.nDim
  if (nRows < 8) {
    const nan = new Array<number>(D).fill(NaN)
    return { step, burn, tau: nan, nOverTau: nan.slice(), rhat: nan.slice(), passed: false }
  }
  const v = store.view(from)
  const shape = { nSteps: nRows, nWalkers: store.nWalkers, nDim: D }
  const tau = Array.from(integratedTime(v.chain, shape), (t) => t * store.thin)
  const post = step - burn
  const nOverTau = tau.map((t) => post / t)
  const tauPasses = nOverTau.every((q) => q > MIN_N_OVER_TAU)
  const rhat = lazy && !tauPasses ? new Array<number>(D).fill(NaN) : Array.from(splitRhat(v.chain, shape, { groups }))
  const passed = tauPasses && rhat.every((r) => r < MAX_RHAT)
  return { step, burn, tau, nOverTau, rhat, passed }
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

/** Steps between convergence checks at thinning k: an eighth of the kept copy's rows. */
function checkEvery(store: ChainStore): number {
  return store.thin * (store.capacity / 8)
}

/**
 * Samples the posterior of the model of `model` (a fit, or fit options from which the maximum-
 * likelihood fit is computed first). Throws a RangeError naming the option on misuse; a run that
 * has not converged (or was stopped) returns normally with `diagnostics.converged: false` and
 * plain-language warnings.
 */
export function samplePosterior(data: RvData, model: FitResult | FitOptions, options: SampleOptions = {}): SampleResult {
  const untilConverged = options.untilConverged ?? true
  const steps = intOpt('steps', options.steps, untilConverged ? DEFAULT_MAX_STEPS : DEFAULT_FIXED_STEPS, 4)
  const thin = intOpt('thin', options.thin, 1, 1)
  const keptRows = intOpt('keptRows', options.keptRows, DEFAULT_KEPT_ROWS, 8)
  if (options.burn !== undefined) {
    intOpt('burn', options.burn, 0, 0)
    if (options.burn > steps - 4 * thin) throw new RangeError(`burn must leave at least ${4 * thin} steps (steps ${steps}, thin ${thin}), got ${options.burn}`)
  }
  const burnAt = (done: number): number => options.burn ?? Math.floor(done / 4)
  const seed = options.seed ?? 1
  if (!Number.isFinite(seed)) throw new RangeError(`seed must be a finite number, got ${seed}`)
  const maxRows = intOpt('maxSampleRows', options.maxSampleRows, 2000, 1)
  const ballScale = options.ballScale ?? 0.1
  if (!(ballScale > 0)) throw new RangeError(`ballScale must be > 0, got ${ballScale}`)
  if (options.starMass && !(options.starMass.value > 0 && options.starMass.err >= 0)) throw new RangeError('starMass needs value > 0 and err ≥ 0')

  const fit = isFitResult(model) ? model : fitKeplerians(data, model)
  const fitPriors = isFitResult(model) ? [] : (model.priors ?? [])
  const fixed: PlanetParam[][] = fit.planets.map((_, k) => [...(options.fix ? (options.fix[k] ?? []) : isFitResult(model) ? fixedInFit(fit)[k] : (model.planets[k]?.fix ?? []))])
  // e fixed at 0 leaves ω without meaning: held too
  fit.planets.forEach((p, k) => { if (fixed[k].includes('e') && p.e === 0 && !fixed[k].includes('omegaDeg')) fixed[k].push('omegaDeg') })
  const spec = specFromFit(fit, { priors: [...fitPriors, ...(options.priors ?? [])], eMax: options.eMax, fix: fixed })
  // A zero ML jitter is a poor centre for ln s: start at a tenth of the typical error instead.
  let meanErr = 0
  for (let i = 0; i < data.dy.length; i++) meanErr += data.dy[i]
  meanErr /= Math.max(data.dy.length, 1)
  spec.jitters = spec.jitters?.map((s) => Math.max(s, 0.1 * meanErr))
  const gpFit = options.noise ? gpCentre(data, fit, spec, options.noise, fixed, 0.1 * meanErr) : null
  const post = createLogPosterior(data, spec)
  const nDim = post.nDim
  const walkers = intOpt('walkers', options.walkers, Math.max(32, 2 * nDim), 2)
  if (walkers < 2 * nDim || walkers % 2) throw new RangeError(`walkers must be even and ≥ 2 × ${nDim} sampled parameters, got ${walkers}`)
  const groups = options.rhatGroups ?? defaultRhatGroups(walkers)
  if (!(Number.isInteger(groups) && groups >= 2 && walkers % groups === 0)) throw new RangeError(`rhatGroups must be ≥ 2 and divide walkers (${walkers}), got ${groups}`)

  // ---- starting ball
  const rng = createRandom(seed)
  const scales = samplingScales(fit, post)
  if (gpFit) gpScales(gpFit, post, scales)
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

  // ---- the run: every step offered to the kept copy; the rule checked at multiples of checkEvery
  const store = new ChainStore(walkers, nDim, { capacity: keptRows, thin })
  let startFrom: Float64Array | SamplerState = start
  const resume = options.resume
  if (resume) {
    const st = resume.state
    if (!st || st.nWalkers !== walkers || st.nDim !== nDim) throw new RangeError(`resume.state must be ${walkers} walkers × ${nDim} parameters`)
    if (!(Number.isInteger(st.step) && st.step >= 0 && st.step <= steps)) throw new RangeError(`resume.state.step must be in [0, steps], got ${st.step}`)
    store.replay(resume.rows)
    if (store.lastStep() > st.step) throw new RangeError('resume.rows go beyond resume.state.step')
    store.syncTo(st.step)
    startFrom = st
  }
  const step0 = resume ? resume.state.step : 0
  let check: ConvergenceCheck | null = null
  let convergedStop = false
  const every = options.progressEvery ?? Math.max(1, Math.floor(steps / 100))
  const run = runEnsemble({
    logProb: post.logProb, nDim, nWalkers: walkers, start: startFrom, steps: steps - step0, random: rng, keepChain: false,
    onStep: (step, pos, lp) => {
      store.push(step, pos, lp)
      if (step % checkEvery(store) !== 0) return undefined
      check = checkConvergence(store, step, burnAt(step), groups, true)
      if (untilConverged && check.passed) { convergedStop = true; return 'stop' }
      return undefined
    },
    progressEvery: every,
    onProgress: options.onProgress
      ? (_done, _total, state) => {
          let acc = 0
          for (let w = 0; w < walkers; w++) acc += state.accepted[w]
          return options.onProgress!({ step: state.step, maxSteps: steps, state, acceptance: state.step > 0 ? acc / (walkers * state.step) : NaN, check, store })
        }
      : undefined,
  })
  const stepsDone = step0 + run.nSteps
  const userStopped = run.stopped && !convergedStop

  // ---- post-burn chain: the kept rows after the burn-in
  const warnings: string[] = []
  let burn = burnAt(stepsDone)
  if (burn >= stepsDone || store.rows - store.firstRowAfter(burn) < 4) {
    burn = Math.floor(stepsDone / 2)
    warnings.push(`The run ended before the burn-in was over; the first half of the ${stepsDone} steps done was dropped instead.`)
  }
  const from = store.firstRowAfter(burn)
  const nPost = store.rows - from
  if (nPost < 4) throw new RangeError(`steps: the run kept only ${nPost} rows after burn-in; run at least ${8 * thin} steps`)
  const kept = store.view(from)
  const chain = kept.chain
  const lnp = kept.lnProb
  const final = check !== null && (check as ConvergenceCheck).step === stepsDone && (check as ConvergenceCheck).burn === burn && (check as ConvergenceCheck).rhat.every(Number.isFinite)
    ? (check as ConvergenceCheck)
    : checkConvergence(store, stepsDone, burn, groups)
  const { tau, nOverTau, rhat } = final
  const postSteps = stepsDone - burn
  const acc = acceptanceFraction(run.acceptance)
  let accMin = Infinity, accMax = -Infinity
  for (const a of run.acceptance) { accMin = Math.min(accMin, a); accMax = Math.max(accMax, a) }

  if (userStopped) warnings.push(`The run was stopped after ${stepsDone} of ${steps} steps; the results use the steps done so far.`)
  const shortOnes = post.names.filter((_, d) => !(nOverTau[d] > MIN_N_OVER_TAU))
  if (shortOnes.length) {
    const worst = Math.max(...tau.filter(Number.isFinite), 1)
    const need = Math.ceil((MIN_N_OVER_TAU * worst * 4 / 3) / 100) * 100
    warnings.push(
      `The run is too short to trust: after burn-in it lasted ${postSteps} steps, only ${fmt(Math.min(...nOverTau), 0)} autocorrelation times ` +
      `(more than ${MIN_N_OVER_TAU} are needed) for ${shortOnes.join(', ')}. About ${need} steps would do` +
      (untilConverged && !userStopped && stepsDone >= steps ? `; the budget of ${steps} steps ran out: raise it.` : '.'),
    )
  }
  const badRhat = post.names.filter((_, d) => !(rhat[d] < MAX_RHAT))
  if (badRhat.length) {
    warnings.push(`Groups of walkers disagree about ${badRhat.join(', ')} (split-R̂ up to ${fmt(Math.max(...rhat.filter(Number.isFinite)), 3)} over ${groups} groups; below ${MAX_RHAT} is expected): the walkers may sit in different modes or still be drifting.`)
  }
  const maxTau = Math.max(...tau.filter(Number.isFinite), 0)
  if (burn < 2 * maxTau) warnings.push(`The burn-in (${burn} steps) is shorter than twice the longest autocorrelation time (${fmt(maxTau, 0)} steps): the first steps kept may still remember the starting point.`)
  if (acc < 0.15) warnings.push(`Few proposed moves were accepted (${fmt(100 * acc, 0)} %); the posterior may have several separate modes or a very narrow ridge.`)
  if (acc > 0.2 && accMin < 0.05) {
    const stuck = Array.from(run.acceptance).filter((a) => a < 0.05).length
    warnings.push(`Some walkers barely moved (${stuck} of ${walkers} accepted under 5 % of their moves); they may be stuck in a region of low probability.`)
  }
  if (!fit.success) warnings.push(`The starting fit did not converge (${fit.message}); the walkers started from its last point.`)
  if (gpFit && !gpFit.success) warnings.push(`The planets + GP fit the walkers started from did not converge (${gpFit.message}).`)
  const converged = !userStopped && shortOnes.length === 0 && badRhat.length === 0 && acc >= 0.15 && !(acc > 0.2 && accMin < 0.05)

  const { cols, fixedCols } = physicalColumns(data, fit, post, chain, nPost * walkers, options.starMass, seed)
  const parameters = cols.map((c) => {
    if (fixedCols.has(c.name)) {
      const v = c.v[0]
      return { name: c.name, unit: c.unit, median: v, lo: v, hi: v, mean: v, sd: 0, fixed: true }
    }
    const q = summarise(c.name, c.unit, c.v)
    if (c.unit === 'deg') {
      // report ω with its median in [0°, 360°), interval shifted with it
      const shift = 360 * Math.floor(q.median / 360)
      q.median -= shift; q.lo -= shift; q.hi -= shift; q.mean -= shift
    }
    return q
  })

  // thinned plot sample: all walkers at evenly spaced kept rows
  const stride = Math.max(1, Math.ceil((nPost * walkers) / maxRows))
  const stepIdx: number[] = [], walkerIdx: number[] = []
  const rows: number[] = []
  for (let r = 0; r < nPost; r += stride) {
    if (rows.length + walkers > maxRows) break
    for (let w = 0; w < walkers; w++) { rows.push(r * walkers + w); stepIdx.push(kept.steps[r]); walkerIdx.push(w) }
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
    settings: {
      seed, walkers, steps, burn, thin, stepsDone, stopped: userStopped, untilConverged,
      keptThin: store.thin, keptRows: store.rows, rhatGroups: groups, fixed,
    },
    start: gpFit
      ? { lnPosterior: gpFit.stats.lnPosterior, fitStatus: gpFit.status === 'failed' ? 'failed' : gpFit.success ? 'converged' : 'max-iterations' }
      : { lnPosterior: fit.stats.lnPosterior, fitStatus: fit.status },
    noisePriors: post.noisePriors,
  }
}

/**
 * Physical and derived values per draw of `chain` (draws × coordinates): P, K, e, ω, Tc, Tp per
 * planet (ω and Tp left out for an orbit held circular), M sin i and a when the star's mass is
 * given (its own draw per row), offsets, jitters, trend. Parameters held fixed give constant
 * columns, named in `fixedCols`.
 */
export function physicalColumns(
  data: RvData, fit: FitResult, post: LogPosterior, chain: ArrayLike<number>, nDraw: number,
  mst: { value: number; err: number } | undefined, seed: number,
): { cols: Array<{ name: string; unit: string; v: Float64Array }>; fixedCols: Set<string> } {
  const nDim = post.nDim
  const L = post.layout
  const cols: Array<{ name: string; unit: string; v: Float64Array }> = []
  const fixedCols = new Set<string>()
  const col = (name: string, unit: string, isFixed = false): Float64Array => {
    const v = new Float64Array(nDraw); cols.push({ name, unit, v }); if (isFixed) fixedCols.add(name); return v
  }
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
    const c = L.planets[k]
    const circular = c.h < 0 && c.e < 0 && c.omega < 0 && c.fixed.e === 0
    const eFree = c.h >= 0 || c.e >= 0, wFree = c.h >= 0 || c.omega >= 0
    const phaseFree = c.tc >= 0
    const cP = col(`P ${lab}`, 'd', c.lnP < 0), cK = col(`K ${lab}`, 'm/s', c.lnK < 0), cE = col(`e ${lab}`, '', !eFree)
    const cW = circular ? null : col(`ω ${lab}`, 'deg', !wFree)
    const cTc = col(`Tc ${lab}`, 'd', !phaseFree && c.fixed.tp === null)
    const cTp = circular ? null : col(`Tp ${lab}`, 'd', !phaseFree && c.fixed.tp !== null)
    const cMj = mst ? col(`M sin i ${lab}`, 'M_Jup') : null
    const cMe = mst ? col(`M sin i ${lab} (Earth masses)`, 'M_Earth') : null
    const cA = mst ? col(`a ${lab}`, 'au') : null
    for (let i = 0; i < nDraw; i++) {
      const q = i * nDim
      const P = c.lnP >= 0 ? Math.exp(chain[q + c.lnP]) : c.fixed.period
      const K = c.lnK >= 0 ? Math.exp(chain[q + c.lnK]) : c.fixed.K
      let e = c.fixed.e, w = c.fixed.omega
      if (c.h >= 0) {
        const h = chain[q + c.h], kk = chain[q + c.k]
        e = h * h + kk * kk
        w = e > 0 ? Math.atan2(kk, h) : 0
      } else if (c.e >= 0) e = chain[q + c.e]
      else if (c.omega >= 0) w = chain[q + c.omega]
      let tc: number, tp: number
      if (c.tc >= 0) { tc = chain[q + c.tc]; tp = tcToTp(tc, P, e, w) }
      else if (c.fixed.tp !== null) { tp = c.fixed.tp; tc = nearestEpoch(tpToTc(tp, P, e, w), P, fp.tc) }
      else { tc = c.fixed.tc; tp = tcToTp(tc, P, e, w) }
      cP[i] = P; cK[i] = K; cE[i] = e
      if (cW) cW[i] = fp.omegaDeg + ((((w / DEG - fp.omegaDeg) % 360) + 540) % 360) - 180
      cTc[i] = tc
      if (cTp) cTp[i] = c.fixed.tp !== null && c.tc < 0 ? tp : nearestEpoch(tp, P, fp.tp)
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
  const g = L.gp
  if (g) {
    const put = (name: string, unit: string, idx: number, held: number, map: (v: number) => number): void => {
      const c = col(name, unit, idx < 0)
      for (let i = 0; i < nDraw; i++) c[i] = idx < 0 ? held : map(chain[i * nDim + idx])
    }
    for (let k = 0; k < g.nAmp; k++) put(g.nAmp > 1 ? `GP amplitude ${data.instrumentNames[k]}` : 'GP amplitude', 'm/s', g.iAmp < 0 ? -1 : g.iAmp + k, g.fixed.amplitude[k], Math.exp)
    put('GP decay time', 'd', g.iDecay, g.fixed.decayTime, Math.exp)
    put('rotation period', 'd', g.iPeriod, g.fixed.period, (v) => v)
    if (g.kernel === 'rotation') put('GP shape', '', g.iShape, g.fixed.shape, (v) => v)
    else put('GP Γ', '', g.iShape, g.fixed.shape, Math.exp)
  }
  return { cols, fixedCols }
}

/**
 * The planets + GP MAP from the white-noise fit, written into `spec` as the sampler's centre (free
 * planet parameters, offsets, jitters, trend, the hyperparameters' values; fixed ones stay).
 */
function gpCentre(data: RvData, fit: FitResult, spec: ReturnType<typeof specFromFit>, noise: GpHyperSpec, fixed: PlanetParam[][], jitterFloor: number): GpFitResult {
  const jitter = Array.isArray(spec.jitter) ? spec.jitter : 'fit'
  const g = fitWithGp(data, {
    // the sampled parameters' centre: the held ones stay at their values (the sampler holds them too)
    planets: fit.planets.map((p, k) => ({
      period: p.period, K: p.K, e: p.e, omegaDeg: p.omegaDeg, ...(fixed[k]!.includes('tp') ? { tp: p.tp } : { tc: p.tc }), fix: fixed[k],
    })),
    gp: noise, trend: spec.trend, epoch: spec.epoch, jitter, ...(jitter === 'fit' ? { jitterStart: spec.jitters } : {}),
  })
  if (g.status === 'failed') return g
  spec.planets = spec.planets.map((p, k) => {
    const q = g.planets[k], fx = new Set(fixed[k])
    return {
      ...p,
      ...(fx.has('period') ? {} : { period: q.period }), ...(fx.has('K') ? {} : { K: q.K }),
      ...(fx.has('e') ? {} : { e: q.e }), ...(fx.has('omegaDeg') ? {} : { omegaDeg: q.omegaDeg }),
      ...(fx.has('tc') || fx.has('tp') ? {} : { tc: q.tc, tp: q.tp }),
    }
  })
  spec.offsets = g.instruments.map((s) => s.offset)
  // the white fit's jitters took up the activity: the GP fit's, floored as for white noise, are the centre
  if (jitter === 'fit') spec.jitters = g.noise.jitter.map((s) => Math.max(s, jitterFloor, 0.01))
  spec.slope = g.trend.slope
  spec.curvature = g.trend.curvature
  const k = g.noise.kernel
  spec.noise = {
    ...noise,
    period: { ...noise.period, ...(noise.period.fixed ? {} : { start: k.period }) },
    decayTime: { ...noise.decayTime, value: noise.decayTime?.fixed ? noise.decayTime.value : k.decayTime },
    shape: { ...noise.shape, value: noise.shape?.fixed ? noise.shape.value : k.kind === 'rotation' ? k.shape : k.roughness },
    amplitude: { ...noise.amplitude, value: noise.amplitude?.fixed ? noise.amplitude.value : g.noise.amplitude },
  }
  return g
}

/** Starting-ball scales of the GP coordinates from the MAP's Laplace errors (fallbacks where NaN). */
function gpScales(g: GpFitResult, post: LogPosterior, sc: Float64Array): void {
  const c = post.layout.gp
  if (!c) return
  const ok = (v: number, fb: number): number => (Number.isFinite(v) && v > 0 ? v : fb)
  const u = g.noiseUncertainty, k = g.noise.kernel
  if (c.iAmp >= 0) for (let j = 0; j < c.nAmp; j++) sc[c.iAmp + j] = ok((u.amplitude[j] ?? NaN) / g.noise.amplitude[j], 0.1)
  if (c.iDecay >= 0) sc[c.iDecay] = ok(u.decayTime / k.decayTime, 0.2)
  if (c.iPeriod >= 0) sc[c.iPeriod] = ok(u.period, 0.02 * k.period)
  if (c.iShape >= 0) sc[c.iShape] = k.kind === 'rotation' ? ok(u.shape, 0.05) : ok(u.shape / k.roughness, 0.2)
}

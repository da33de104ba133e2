// The merged result of a parallel sampling run: its ensembles' kept rows merged and checked by
// shared/rv/ensemble-merge.ts, then the same summaries, plot sample and warnings a single run
// stores (physical columns from shared/rv/mcmc.ts). Pure: called in a worker thread
// (merge-thread.ts) by the coordinator, and directly by tests.
import { fitKeplerians, type PlanetParam, type PlanetStart, type Prior } from '../../shared/rv/index.ts'
import { createLogPosterior, specFromFit } from '../../shared/rv/posterior.ts'
import { physicalColumns, MAX_RHAT, MIN_N_OVER_TAU } from '../../shared/rv/mcmc.ts'
import { mergeEnsembles, summariseDraws } from '../../shared/rv/ensemble-merge.ts'
import type { ChainRows } from '../../shared/rv/chain-store.ts'
import type { SamplingInput } from '../db/models-sampling.ts'
import type { SamplingResult, SamplingSettings } from '../../shared/api/sampling.ts'
import { rvDataOf } from './input.ts'

export interface MergeRequest {
  input: SamplingInput
  /** The parallel run's settings (walkers per ensemble, budget, thin, burn, seed, ensembles). */
  settings: SamplingSettings
  /** Each ensemble's rows in the order they were kept. */
  parts: ChainRows[]
  /** Build the result (else only the check). */
  build: boolean
  /** Each ensemble's acceptance fraction per walker when known (finished ensembles), else its mean. */
  acceptance: Array<{ mean: number | null; min: number | null; max: number | null }>
  /** The run was cancelled or stopped before the rule passed, or an ensemble's budget ran out. */
  stopped: boolean
}

export interface MergeCheck { step: number; burn: number; tau: number[]; nOverTau: number[]; rhat: number[]; passed: boolean; names: string[] }
export interface MergeOutcome { check: MergeCheck; result: SamplingResult | null; chunk: ChainRows | null }

/** Fixed parameters of each planet as the sampler holds them (an orbit fixed circular also holds ω: mcmc.ts). */
export function fixedOf(input: SamplingInput): PlanetParam[][] {
  return input.model.planets.map((p) => {
    const f = [...((p.fix ?? []) as PlanetParam[])]
    if (f.includes('e') && (p.e ?? 0) === 0 && !f.includes('omegaDeg')) f.push('omegaDeg')
    return f
  })
}

const fmt = (v: number, d = 2): string => (Number.isFinite(v) ? v.toFixed(d) : String(v))
const finite = (v: number[]) => v.filter(Number.isFinite)

export function mergeRun(req: MergeRequest): MergeOutcome {
  const { input, settings, parts } = req
  const data = rvDataOf(input)
  const planets = input.model.planets as PlanetStart[]
  const fixed = fixedOf(input)
  const W = settings.walkers
  const nDim = parts[0] && parts[0].steps.length ? parts[0].chain.length / (parts[0].steps.length * W) : NaN
  // the fit is only needed for the physical columns of the result; the check needs the layout's names
  const jitter = input.model.jitter ?? undefined
  const fit = fitKeplerians(data, { planets, trend: input.model.trend, epoch: input.model.epoch, priors: input.model.priors as Prior[], ...(jitter ? { jitter } : {}) })
  const post = createLogPosterior(data, specFromFit(fit, { fix: fixed }))
  if (Number.isFinite(nDim) && nDim !== post.nDim) throw new Error(`the ensembles' rows have ${nDim} coordinates, the model ${post.nDim}`)
  const m = mergeEnsembles(parts, { nWalkers: W, nDim: post.nDim, thin: settings.thin, burn: settings.burn })
  const check: MergeCheck = { step: m.step, burn: m.burn, tau: m.tau, nOverTau: m.nOverTau, rhat: m.rhat, passed: m.passed, names: post.names }
  if (!req.build) return { check, result: null, chunk: null }

  const K = m.nEnsembles, WK = m.nWalkers
  const nPost = m.rows.steps.length - m.from
  if (nPost < 4) throw new Error(`the ensembles kept only ${nPost} common rows after burn-in: nothing to merge yet`)
  const chain = m.rows.chain.subarray(m.from * WK * post.nDim)
  const lnp = m.rows.lnProb.subarray(m.from * WK)
  const { cols, fixedCols } = physicalColumns(data, fit, post, chain, nPost * WK, input.starMass ?? undefined, settings.seed)
  const parameters = cols.map((c) => {
    if (fixedCols.has(c.name)) { const v = c.v[0]!; return { name: c.name, unit: c.unit, median: v, lo: v, hi: v, mean: v, sd: 0, fixed: true } }
    const q = { name: c.name, unit: c.unit, ...summariseDraws(c.v) }
    if (c.unit === 'deg') { const sh = 360 * Math.floor(q.median / 360); q.median -= sh; q.lo -= sh; q.hi -= sh; q.mean -= sh }
    return q
  })
  const maxRows = 2000
  const stride = Math.max(1, Math.ceil((nPost * WK) / maxRows))
  const stepIdx: number[] = [], walkerIdx: number[] = [], rowsIdx: number[] = []
  for (let r = 0; r < nPost; r += stride) {
    if (rowsIdx.length + WK > maxRows) break
    for (let w = 0; w < WK; w++) { rowsIdx.push(r * WK + w); stepIdx.push(m.rows.steps[m.from + r]!); walkerIdx.push(w) }
  }
  const sample = {
    names: [...cols.map((c) => c.name), 'ln posterior'], units: [...cols.map((c) => c.unit), ''], step: stepIdx, walker: walkerIdx,
    columns: [...cols.map((c) => rowsIdx.map((r) => (Number.isFinite(c.v[r]!) ? c.v[r]! : null))), rowsIdx.map((r) => (Number.isFinite(lnp[r]!) ? lnp[r]! : null))],
  }
  const accs = req.acceptance.filter((a) => a.mean !== null)
  const acc = accs.length ? accs.reduce((n, a) => n + a.mean!, 0) / accs.length : NaN
  const accMin = Math.min(...accs.map((a) => a.min ?? a.mean!)), accMax = Math.max(...accs.map((a) => a.max ?? a.mean!))
  const warnings: string[] = []
  if (req.stopped && !m.passed) warnings.push(`The parallel run was stopped after ${m.step} common steps of each of its ${K} ensembles; the results use the steps done so far.`)
  const short = post.names.filter((_, d) => !(m.nOverTau[d]! > MIN_N_OVER_TAU))
  if (short.length) {
    warnings.push(`The ${K} ensembles together are too short to trust: after burn-in they hold ${m.pooledSteps} steps, only ${fmt(Math.min(...m.nOverTau), 0)} autocorrelation times ` +
      `(more than ${MIN_N_OVER_TAU} are needed) for ${short.join(', ')}.`)
  }
  const bad = post.names.filter((_, d) => !(m.rhat[d]! < MAX_RHAT))
  if (bad.length) {
    warnings.push(`The ensembles disagree about ${bad.join(', ')} (split-R̂ across the ${K} ensembles up to ${fmt(Math.max(...finite(m.rhat), NaN), 3)}; below ${MAX_RHAT} is expected): they may sit in different modes or still be drifting.`)
  }
  const maxTau = Math.max(...finite(m.tau), 0)
  if (m.burn < 2 * maxTau) warnings.push(`The burn-in (${m.burn} steps of each ensemble) is shorter than twice the longest autocorrelation time (${fmt(maxTau, 0)} steps).`)
  if (acc < 0.15) warnings.push(`Few proposed moves were accepted (${fmt(100 * acc, 0)} %); the posterior may have several separate modes or a very narrow ridge.`)
  if (!fit.success) warnings.push(`The starting fit did not converge (${fit.message}); the walkers started from its last point.`)
  const converged = m.passed && !(acc < 0.15)
  const result: SamplingResult = {
    parameters, sample,
    diagnostics: {
      names: post.names, tau: m.tau.map((v) => (Number.isFinite(v) ? v : null)), nOverTau: m.nOverTau.map((v) => (Number.isFinite(v) ? v : null)),
      rhat: m.rhat.map((v) => (Number.isFinite(v) ? v : null)), acceptance: Number.isFinite(acc) ? acc : 0,
      acceptanceMin: Number.isFinite(accMin) ? accMin : 0, acceptanceMax: Number.isFinite(accMax) ? accMax : 0, converged, warnings,
    },
    settings: {
      seed: settings.seed, walkers: WK, steps: settings.steps, burn: m.burn, thin: settings.thin, stepsDone: m.step, stopped: req.stopped && !m.passed,
      untilConverged: settings.untilConverged ?? true, keptThin: m.thin, keptRows: m.rows.steps.length, rhatGroups: K, fixed,
    },
    start: { lnPosterior: fit.stats.lnPosterior, fitStatus: fit.status },
  }
  return { check, result, chunk: m.rows }
}

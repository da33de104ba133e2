// Worker-thread side of one sampling run: rebuilds the data and the maximum-likelihood fit from
// the frozen input, runs samplePosterior (shared/rv/mcmc.ts) and reports to the job handler:
// progress (every ~250 ms), append-only checkpoints (the walkers' state and the kept rows since
// the previous checkpoint, every `checkpointEvery` steps) and the result, preceded by the last
// rows. The handler stops it through a shared flag, read every 10 steps (the sampler's loop never
// yields to messages).
import { parentPort, workerData } from 'node:worker_threads'
import { fitKeplerians, type PlanetParam, type PlanetStart, type Prior } from '../../shared/rv/index.ts'
import { samplePosterior, MIN_N_OVER_TAU, type SampleOptions, type SampleResult } from '../../shared/rv/mcmc.ts'
import { stateFromJson, stateToJson } from '../../shared/rv/sampler.ts'
import type { ChainRows } from '../../shared/rv/chain-store.ts'
import type { SamplingInput } from '../db/models-sampling.ts'
import type { SamplingSettings } from '../../shared/api/sampling.ts'
import { rvDataOf } from './input.ts'
import { lowerThreadPriority } from '../compute/thread-priority.ts'

lowerThreadPriority() // below the API's main thread (thread-priority.ts)

export interface ThreadData {
  input: SamplingInput
  settings: SamplingSettings
  /** The checkpoint's state and every chunk's rows up to it, in order. */
  resume: { state: Record<string, unknown>; rows: ChainRows } | null
  /** Int32Array view: 0 = run, 1 = stop (cancelled), 2 = stop after a checkpoint (shutting down). */
  stop: SharedArrayBuffer
  checkpointEvery: number
  checkpointMinMs: number
}

export interface ThreadProgress {
  stepsDone: number; stepsTotal: number; acceptance: number | null
  /** Longest τ, least N/τ and largest split-R̂ of the latest convergence check (steps; null before it). */
  tau: number | null; minNOverTau: number | null; maxRhat: number | null
  /** Steps the run is expected to need in all (from τ: burn-in + 50 τ), null before the first check. */
  expectedSteps: number | null
}

export type ThreadMessage =
  | ({ type: 'progress' } & ThreadProgress)
  | { type: 'checkpoint'; step: number; state: Record<string, unknown>; keptThin: number; rows: ChainRows }
  | { type: 'rows'; step: number; rows: ChainRows }
  | { type: 'done'; result: unknown }
  | { type: 'error'; message: string }

export const STOP_CANCEL = 1
export const STOP_SHUTDOWN = 2

export { rvDataOf }

/**
 * One sampling run of a frozen input: the maximum-likelihood fit from the stored fitted values
 * (deterministic, so a resumed run starts from the same fit) with the model's fixed parameters,
 * then samplePosterior with the run's settings (those parameters held fixed). The same call with
 * `resume` continues an interrupted run exactly.
 */
export function sampleInput(input: SamplingInput, settings: SamplingSettings, extra: Pick<SampleOptions, 'onProgress' | 'progressEvery' | 'resume'> = {}): SampleResult {
  const data = rvDataOf(input)
  const priors = input.model.priors as Prior[]
  const planets = input.model.planets as PlanetStart[]
  const jitter = input.model.jitter ?? undefined
  const fit = fitKeplerians(data, { planets, trend: input.model.trend, epoch: input.model.epoch, priors, ...(jitter ? { jitter } : {}) })
  return samplePosterior(data, fit, {
    walkers: settings.walkers, steps: settings.steps, burn: settings.burn ?? undefined, thin: settings.thin, seed: settings.seed,
    untilConverged: settings.untilConverged ?? false,
    fix: planets.map((p) => (p.fix ?? []) as PlanetParam[]),
    starMass: input.starMass ?? undefined, priors, noise: input.model.noise ?? null, ...extra,
  })
}

/** Progress figures of a convergence check; expected steps: a quarter burn-in plus 50 τ (the rule). */
export function progressOf(step: number, maxSteps: number, acceptance: number, check: { tau: number[]; nOverTau: number[]; rhat: number[] } | null): ThreadProgress {
  const fin = (v: number[]) => v.filter(Number.isFinite)
  const tau = check && fin(check.tau).length ? Math.max(...fin(check.tau)) : null
  const q = check && fin(check.nOverTau).length === check.nOverTau.length ? Math.min(...check.nOverTau) : null
  // split-R̂ is only computed once the τ part of the rule passes: the last value known is kept
  const r = check && fin(check.rhat).length === check.rhat.length ? Math.max(...check.rhat) : null
  return {
    stepsDone: step, stepsTotal: maxSteps, acceptance: Number.isFinite(acceptance) ? acceptance : null,
    tau, minNOverTau: q, maxRhat: r,
    expectedSteps: tau === null ? null : Math.min(maxSteps, Math.max(step, Math.ceil((MIN_N_OVER_TAU * tau * 4) / 3))),
  }
}

function run(port: NonNullable<typeof parentPort>, wd: ThreadData): void {
  const { input, settings } = wd
  const stop = new Int32Array(wd.stop)
  const checkpointEvery = Math.max(1, wd.checkpointEvery)
  let lastPost = 0
  let lastCheckpoint = wd.resume ? Number(wd.resume.state.step) : 0
  let lastCheckpointAt = Date.now()
  const resume = wd.resume ? { state: stateFromJson(wd.resume.state), rows: wd.resume.rows } : undefined
  let lastStore: Parameters<NonNullable<SampleOptions['onProgress']>>[0]['store'] | null = null
  let lastStep = 0

  const result = sampleInput(input, settings, {
    progressEvery: 10, resume,
    onProgress: (p) => {
      const { step, state, store } = p
      lastStore = store; lastStep = step
      const flag = Atomics.load(stop, 0)
      const now = Date.now()
      if (now - lastPost > 250 || step === settings.steps) {
        lastPost = now
        const msg: ThreadMessage = { type: 'progress', ...progressOf(step, settings.steps, p.acceptance, p.check) }
        port.postMessage(msg)
      }
      const due = (step - lastCheckpoint >= checkpointEvery && now - lastCheckpointAt >= wd.checkpointMinMs) || flag === STOP_SHUTDOWN
      if (due && step < settings.steps) {
        lastCheckpoint = step
        lastCheckpointAt = now
        const msg: ThreadMessage = { type: 'checkpoint', step, state: stateToJson(state), keptThin: store.thin, rows: store.takePending() }
        port.postMessage(msg)
      }
      return flag ? 'stop' : undefined
    },
  })
  // the rows kept after the last checkpoint: the stored chain then ends where the result does
  const store = lastStore as { takePending(): ChainRows } | null
  if (store) {
    const rows: ThreadMessage = { type: 'rows', step: Math.max(lastStep, result.settings.stepsDone), rows: store.takePending() }
    port.postMessage(rows)
  }
  const done: ThreadMessage = { type: 'done', result }
  port.postMessage(done)
}

if (parentPort) {
  const port = parentPort
  try { run(port, workerData as ThreadData) } catch (err) {
    const msg: ThreadMessage = { type: 'error', message: err instanceof Error ? err.message : String(err) }
    port.postMessage(msg)
  }
}

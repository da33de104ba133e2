// Worker-thread side of one sampling run: rebuilds the data and the maximum-likelihood fit from
// the frozen input, runs samplePosterior (shared/rv/mcmc.ts) and reports to the job handler:
// progress (every ~250 ms), checkpoints (every `checkpointEvery` steps) and the result. The
// handler stops it through a shared flag (the sampler's loop never yields to messages).
import { parentPort, workerData } from 'node:worker_threads'
import { fitKeplerians, type PlanetStart, type Prior, type RvData } from '../../shared/rv/index.ts'
import { samplePosterior, type SampleOptions, type SampleResult } from '../../shared/rv/mcmc.ts'
import { stateFromJson, stateToJson } from '../../shared/rv/sampler.ts'
import { integratedTime } from '../../shared/rv/diagnostics.ts'
import type { SamplingInput } from '../db/models-sampling.ts'
import type { SamplingSettings } from '../../shared/api/sampling.ts'

export interface ThreadData {
  input: SamplingInput
  settings: SamplingSettings
  resume: { state: Record<string, unknown>; chain: Float64Array; lnProb: Float64Array } | null
  /** Int32Array view: 0 = run, 1 = stop (cancelled), 2 = stop after a checkpoint (shutting down). */
  stop: SharedArrayBuffer
  checkpointEvery: number
  checkpointMinMs: number
}

export type ThreadMessage =
  | { type: 'progress'; stepsDone: number; stepsTotal: number; acceptance: number | null; tau: number | null }
  | { type: 'checkpoint'; step: number; state: Record<string, unknown>; nKept: number; chain: Float64Array; lnProb: Float64Array }
  | { type: 'done'; result: unknown }
  | { type: 'error'; message: string }

export const STOP_CANCEL = 1
export const STOP_SHUTDOWN = 2

export function rvDataOf(input: SamplingInput): RvData {
  const d = input.data
  return {
    t: Float64Array.from(d.t), y: Float64Array.from(d.y), dy: Float64Array.from(d.dy),
    instrument: Int32Array.from(d.instrument), instrumentNames: d.instrumentNames,
  }
}

/**
 * One sampling run of a frozen input: the maximum-likelihood fit from the stored fitted values
 * (deterministic, so a resumed run starts from the same fit), then samplePosterior with the run's
 * settings. The same call with `resume` continues an interrupted run exactly.
 */
export function sampleInput(input: SamplingInput, settings: SamplingSettings, extra: Pick<SampleOptions, 'onProgress' | 'progressEvery' | 'resume'> = {}): SampleResult {
  const data = rvDataOf(input)
  const priors = input.model.priors as Prior[]
  const fit = fitKeplerians(data, {
    planets: input.model.planets as PlanetStart[], trend: input.model.trend, epoch: input.model.epoch, priors,
  })
  return samplePosterior(data, fit, {
    walkers: settings.walkers, steps: settings.steps, burn: settings.burn, thin: settings.thin, seed: settings.seed,
    mstar: input.mstar ?? undefined, priors, ...extra,
  })
}

function run(port: NonNullable<typeof parentPort>, wd: ThreadData): void {
  const { input, settings } = wd
  const stop = new Int32Array(wd.stop)
  const thin = settings.thin
  const progressEvery = thin * Math.max(1, Math.ceil(10 / thin))
  const checkpointEvery = thin * Math.max(1, Math.round(wd.checkpointEvery / thin))
  let lastPost = 0, lastTau = 0
  let tau: number | null = null
  let lastCheckpoint = wd.resume ? Number(wd.resume.state.step) : 0
  let lastCheckpointAt = Date.now()
  const resume = wd.resume ? { state: stateFromJson(wd.resume.state), chain: wd.resume.chain, lnProb: wd.resume.lnProb } : undefined

  const result = sampleInput(input, settings, {
    progressEvery, resume,
    onProgress: (_done, total, state, kept) => {
      const step = state.step
      const flag = Atomics.load(stop, 0)
      const now = Date.now()
      const nW = state.nWalkers, nD = state.nDim
      if (now - lastTau > 2000 && kept.nKept >= 40) {
        lastTau = now
        const t = integratedTime(kept.chain.subarray(0, kept.nKept * nW * nD), { nSteps: kept.nKept, nWalkers: nW, nDim: nD })
        const finite = Array.from(t).filter(Number.isFinite)
        tau = finite.length ? Math.max(...finite) * thin : null
      }
      if (now - lastPost > 250 || step === settings.steps) {
        lastPost = now
        let acc = 0
        for (const a of state.accepted) acc += a
        const msg: ThreadMessage = { type: 'progress', stepsDone: step, stepsTotal: settings.steps, acceptance: step > 0 ? acc / (nW * step) : null, tau }
        port.postMessage(msg)
      }
      void total
      const due = (step - lastCheckpoint >= checkpointEvery && now - lastCheckpointAt >= wd.checkpointMinMs) || flag === STOP_SHUTDOWN
      if (due && step < settings.steps && step % thin === 0) {
        lastCheckpoint = step
        lastCheckpointAt = now
        const msg: ThreadMessage = {
          type: 'checkpoint', step, state: stateToJson(state), nKept: kept.nKept,
          chain: kept.chain.slice(0, kept.nKept * nW * nD), lnProb: kept.lnProb.slice(0, kept.nKept * nW),
        }
        port.postMessage(msg)
      }
      return flag ? 'stop' : undefined
    },
  })
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

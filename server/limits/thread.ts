// The thread side of threads.ts: a detection-limit chunk, a plan or a star's triage search, computed
// by shared/limits, shared/plan and the core's planet search from plain input.
import { parentPort } from 'node:worker_threads'
import { prepareLimits, runChunk } from '../../shared/limits/index.ts'
import { plan, predictiveBand, drawsFromSample, type PlanResult, type NamedSample, type PlanOptions } from '../../shared/plan/index.ts'
import { problemOf, type LimitsInput, type LimitsSettingsStored } from './problem.ts'
import { triageSearch, type TriageInput } from '../triage/summary.ts'
import type { TriageSummary } from '../../shared/api/survey.ts'
import { lowerThreadPriority } from '../compute/thread-priority.ts'

lowerThreadPriority() // below the API's main thread (thread-priority.ts)

export interface ChunkTaskInput { input: LimitsInput; settings: LimitsSettingsStored; seed: number; start: number; end: number }
export interface PlanTaskInput {
  sample: NamedSample
  instrument?: string
  epoch?: number
  options: PlanOptions
  /** Instants of the predicted curve (JD UTC). */
  curveFrom: number
  curveTo: number
  curvePoints: number
}
export interface PlanTaskOutput {
  plan: Omit<PlanResult, 'slots'> & { slots: Array<{ jdUtc: number; observable: boolean; reasons: string[]; information: number; starAltDeg: number }> }
  curve: { jd: number[]; lo: number[]; mid: number[]; hi: number[] }
}

interface Tasks {
  chunk: { input: ChunkTaskInput; output: number[] }
  plan: { input: PlanTaskInput; output: PlanTaskOutput }
  /** Survey triage: the automatic search of one star (server/triage). */
  triage: { input: TriageInput; output: TriageSummary }
}
export type ThreadTask = keyof Tasks
export type ThreadInput<T extends ThreadTask> = Tasks[T]['input']
export type ThreadOutput<T extends ThreadTask> = Tasks[T]['output']

function chunk(i: ChunkTaskInput): number[] {
  const prep = prepareLimits(problemOf(i.input, i.settings, i.seed))
  return Array.from(runChunk(prep, i.start, i.end).recovered)
}

function planTask(i: PlanTaskInput): PlanTaskOutput {
  const draws = drawsFromSample(i.sample, { instrument: i.instrument, epoch: i.epoch })
  const r = plan(draws, i.options)
  const n = i.curvePoints
  const times = Float64Array.from({ length: n }, (_, k) => i.curveFrom + (i.curveTo - i.curveFrom) * k / (n - 1))
  const [lo, mid, hi] = predictiveBand(draws, times)
  return {
    plan: {
      ...r,
      slots: r.slots.map((s) => ({ jdUtc: s.jdUtc, observable: s.observable, reasons: s.reasons, information: s.information, starAltDeg: s.starAltDeg })),
    },
    curve: { jd: Array.from(times), lo: Array.from(lo), mid: Array.from(mid), hi: Array.from(hi) },
  }
}

parentPort?.on('message', (msg: { id: number; task: ThreadTask; input: unknown }) => {
  try {
    const out = msg.task === 'chunk' ? chunk(msg.input as ChunkTaskInput)
      : msg.task === 'triage' ? triageSearch(msg.input as TriageInput) : planTask(msg.input as PlanTaskInput)
    parentPort!.postMessage({ id: msg.id, ok: true, out })
  } catch (e) {
    parentPort!.postMessage({ id: msg.id, ok: false, error: e instanceof Error ? e.message : String(e) })
  }
})

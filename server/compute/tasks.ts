// The computations the compute pool runs in its worker threads: thin wrappers around the numerical
// core (shared/rv) that take and return structured-clonable plain data.
import {
  periodogramReport, downsampleCurve, searchPlanets, searchSummary, CURVE_POINTS, FAP_LEVELS,
  type RvData, type TrendKind, type SearchOptions, type SearchStep, type PeriodogramReport, type SearchSummary,
} from '../../shared/rv/index.ts'
import { activitySearchTask, rotationGuessTask } from './search-activity.ts'
import { fitWithNoise, type NoiseFitInput, type NoiseFitOutput, type PlainFit } from './fit-noise.ts'
import { UPLOAD_TASKS } from '../uploads/tasks.ts'

export { downsampleCurve, CURVE_POINTS, FAP_LEVELS }

export interface PeriodogramInput {
  t: Float64Array; y: Float64Array; dy: Float64Array
  /** Days; defaults of the core (`defaultMinPeriod`, `defaultMaxPeriod`). */
  minPeriod?: number; maxPeriod?: number; oversample?: number
  /**
   * Instrument index per point: each instrument's weighted mean (quoted errors, no jitter) is
   * removed first, as in the CLI (`centreByInstrument`). Omit for residuals.
   */
  instrument?: Int32Array
  /** Also the Keplerian periodogram (velocities: needs `instrument`). */
  keplerian?: boolean
  /** Also every computed power (for storage, `PeriodogramReport.full`). */
  full?: boolean
}

/** The core's periodogram report (`periodogramReport`): the same function and defaults as the CLI. */
export function periodogramTask(inp: PeriodogramInput): PeriodogramReport {
  return periodogramReport({
    t: inp.t, y: inp.y, dy: inp.dy, instrument: inp.instrument, minPeriod: inp.minPeriod, maxPeriod: inp.maxPeriod, oversample: inp.oversample,
    keplerian: inp.keplerian, full: inp.full,
  })
}

export type FitInput = NoiseFitInput
export type { PlainFit }
export type FitOutput = NoiseFitOutput

/**
 * Fits a model spec under its noise model (`fit-noise.ts`): white noise with the core's `fitSpec`
 * (starts from the exact linear scan for planets given without a phase or K, per-planet priors
 * flattened, one ML/MAP fit — as the CLI does; pinned jitters honoured), or planets + GP with `fitWithGp`.
 */
export function fitTask(inp: FitInput): FitOutput {
  return fitWithNoise(inp)
}

export interface SearchInput { data: RvData; options: SearchOptions }
export interface SearchOutput {
  fit: PlainFit; planets: number; trend: TrendKind; steps: SearchStep[]
  /** Flags, alias partners, alternatives (without their fits) and the settings used. */
  report: SearchSummary
}

/** The core's planet search (`searchPlanets`, defaults SEARCH_DEFAULTS), as the CLI runs it. */
export function searchTask(inp: SearchInput): SearchOutput {
  const r = searchPlanets(inp.data, inp.options)
  const { history: _h, ...fit } = r.fit
  return { fit, planets: r.planets, trend: r.trend, steps: r.steps, report: searchSummary(r) }
}

/** Busy-waits `ms` milliseconds (for tests of the pool: time limits, the free event loop). */
export function spinTask(inp: { ms: number; fail?: string }): { spun: number } {
  const end = Date.now() + inp.ms
  let x = 0
  while (Date.now() < end) x++
  if (inp.fail) throw new RangeError(inp.fail)
  return { spun: x }
}

export const TASKS = {
  periodogram: periodogramTask,
  fit: fitTask,
  search: searchTask,
  activitySearch: activitySearchTask,
  rotationGuess: rotationGuessTask,
  spin: spinTask,
  ...UPLOAD_TASKS,
}
export type TaskName = keyof typeof TASKS
export type TaskInput<K extends TaskName> = Parameters<(typeof TASKS)[K]>[0]
export type TaskOutput<K extends TaskName> = ReturnType<(typeof TASKS)[K]>

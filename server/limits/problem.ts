// The frozen input of a detection-limit run and the shared/limits problem built from it (the same
// on the API side, which checks it, and on the threads, which run it).
import type { LimitsProblem } from '../../shared/limits/index.ts'
import type { LimitsSettings } from '../../shared/api/limits.ts'

/** What a run injects into, frozen when it was requested. */
export interface LimitsInput {
  measurementIds: number[]
  t: number[]
  residuals: number[]
  /** Errors with the model's jitters added in quadrature, m/s. */
  dy: number[]
  starMass: number
  /** The model's planets for the chart: label, period (d), M sin i (Earth masses). */
  planets: Array<{ label: string; period: number; massEarth: number }>
}
export type LimitsSettingsStored = LimitsSettings

export function problemOf(input: LimitsInput, settings: LimitsSettings, seed: number): LimitsProblem {
  return {
    data: { t: Float64Array.from(input.t), residuals: Float64Array.from(input.residuals), dy: Float64Array.from(input.dy) },
    starMass: input.starMass,
    seed,
    grid: {
      periods: settings.periods, masses: settings.masses, phases: settings.phases, eccentricities: settings.eccentricities,
      minPeriod: settings.minPeriod ?? undefined, maxPeriod: settings.maxPeriod ?? undefined,
      minMassEarth: settings.minMassEarth ?? undefined, maxMassEarth: settings.maxMassEarth ?? undefined,
    },
    recovery: { criterion: settings.criterion, fapThreshold: settings.fapThreshold },
  }
}

/**
 * The recommended list: the observable instants of the coming weeks ranked by expected information,
 * picked greedily with a minimum spacing between picks. Greedy picking scores each instant as if it
 * were the only new velocity; the spacing keeps two picks from landing on the same stretch of the
 * curve, where the second would add far less than its score says (Ford 2008, AJ 135, 1008
 * discusses choosing observations one at a time).
 */
import { expectedInformation, predictiveSpread, type PosteriorDraws } from './information.ts'
import { observabilitySlots, type ObservingLimits, type Slot, type SlotGrid } from './observability.ts'
import type { Site, StarPosition } from './sky.ts'

export interface PlanOptions {
  star: StarPosition
  site: Site
  grid: SlotGrid
  limits?: ObservingLimits
  /** Error of the new velocity, jitter included (m/s). */
  noise: number
  /** How many instants to recommend (default 10, at most 200). */
  count?: number
  /** Least time between two recommended instants, days (default 1). */
  minSpacingDays?: number
}

export interface Recommendation {
  jdUtc: number
  /** Expected information, nats. */
  information: number
  /** Standard deviation of the predicted velocity across draws, m/s. */
  spread: number
  /** Mean predicted velocity, m/s. */
  predicted: number
  starAltDeg: number
  airmass: number
  moonSeparationDeg: number
  moonIllumination: number
  sunAltDeg: number
}

export interface PlanResult {
  recommendations: Recommendation[]
  /** Every instant of the grid with its verdict, information and spread (for the plot). */
  slots: Array<Slot & { information: number; spread: number; predicted: number }>
  observableCount: number
  /** Plain-language doubts to show beside the list. */
  warnings: string[]
  /** What the times mean (shown under the list). */
  timeNote: string
}

export const TIME_NOTE = 'Times are Julian days and dates in UTC at the telescope; the velocities are predicted at those instants on the data\'s own time scale (the difference, at most 8.3 min of light travel plus about a minute of TDB − UTC, is far below the spacing of the instants).'

/**
 * Pick `count` instants from `scored` (time, score), best first, no two closer than `minSpacing`
 * days. Ties keep the earlier instant. Pure; `plan` calls it.
 */
export function pickSpaced(times: ArrayLike<number>, score: ArrayLike<number>, count: number, minSpacing: number): number[] {
  if (!(Number.isInteger(count) && count >= 1 && count <= 200)) throw new RangeError(`count must be an integer in [1, 200], got ${count}`)
  if (!(minSpacing >= 0 && Number.isFinite(minSpacing))) throw new RangeError(`minSpacingDays must be ≥ 0, got ${minSpacing}`)
  const order = Array.from({ length: times.length }, (_, i) => i)
    .filter((i) => Number.isFinite(score[i]))
    .sort((a, b) => score[b] - score[a] || times[a] - times[b])
  const chosen: number[] = []
  for (const i of order) {
    if (chosen.length >= count) break
    if (chosen.every((j) => Math.abs(times[i] - times[j]) >= minSpacing)) chosen.push(i)
  }
  return chosen
}

/** The next observations for one star: observability × expected information, spaced picks. */
export function plan(draws: PosteriorDraws, opts: PlanOptions): PlanResult {
  const count = opts.count ?? 10
  const spacing = opts.minSpacingDays ?? 1
  const slots = observabilitySlots(opts.star, opts.site, opts.grid, opts.limits)
  const times = Float64Array.from(slots, (s) => s.jdUtc)
  const info = expectedInformation(draws, times, opts.noise)
  const { mean, variance } = predictiveSpread(draws, times)
  const scored = slots.map((s, i) => ({ ...s, information: info[i], spread: Math.sqrt(variance[i]), predicted: mean[i] }))
  const observable = scored.map((s, i) => (s.observable ? i : -1)).filter((i) => i >= 0)
  const picks = pickSpaced(observable.map((i) => times[i]), observable.map((i) => info[i]), count, spacing).map((k) => observable[k])
  const warnings: string[] = []
  if (!observable.length) {
    warnings.push('The star cannot be observed from this site in this window under these limits (see the reasons per instant); widen the window or relax the altitude or Moon limits.')
  } else if (picks.length < count) {
    warnings.push(`Only ${picks.length} instants at least ${spacing} d apart are observable in this window (${count} asked for).`)
  }
  const best = Math.max(...info)
  if (Number.isFinite(best) && best < 0.05) {
    warnings.push(`The posterior predicts the velocity to within the measurement noise everywhere in this window (best spread ${Math.sqrt(Math.max(...variance)).toFixed(2)} m/s against ${opts.noise} m/s): a new point adds little; the choice of night hardly matters.`)
  }
  const recommendations = picks.sort((a, b) => times[a] - times[b]).map((i) => {
    const s = scored[i]
    return {
      jdUtc: s.jdUtc, information: s.information, spread: s.spread, predicted: s.predicted, starAltDeg: s.starAltDeg,
      airmass: s.airmass, moonSeparationDeg: s.moonSeparationDeg, moonIllumination: s.moonIllumination, sunAltDeg: s.sunAltDeg,
    }
  })
  return { recommendations, slots: scored, observableCount: observable.length, warnings, timeNote: TIME_NOTE }
}

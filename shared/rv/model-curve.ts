/**
 * The model velocity curve for plots, the one home for the browser, the server's reports and the
 * CLI: where to sample it so that every orbit is drawn faithfully, and its value there.
 *
 * A regular grid that resolves the shortest orbit (≥ {@link CURVE_DEFAULTS}.samplesPerPeriod
 * samples a period) is used when it fits in the budget. Otherwise (a 4-d orbit over 20 years
 * needs ~73 000 samples; drawn with fewer it aliases into a solid block) the curve is drawn in
 * segments around the data: a fine grid over ± half the shortest period around each measurement,
 * overlapping windows merged, with a break (NaN) between segments so that no line is drawn across
 * the unobserved gaps. The data's own times are always among the samples. Sampling theory: a
 * curve sampled at ≥ 2 points per period is not aliased (Nyquist); 40 points a period also look
 * smooth at e ≲ 0.8 (common practice), and eccentric orbits get more by the budget when room.
 */
import { addKeplerian } from './model.ts'
import { keplerianOf, type PlanetElements } from './planet-elements.ts'

export const CURVE_DEFAULTS = Object.freeze({ samplesPerPeriod: 40, maxSamples: 20000, minSamples: 2000 })

export interface CurveTrend { slope: number; curvature: number; epoch: number }

export interface CurveSampling {
  /** Sample times (full JD), increasing; NaN marks a break between segments. */
  time: Float64Array
  /** 'regular' grid over [start, end], or 'segments' around the measurements. */
  mode: 'regular' | 'segments'
}

/**
 * Times at which to draw the model over [start, end] for data at `dataTimes` and orbits whose
 * shortest period is `shortestPeriod` (Infinity or NaN: no orbit, a plain grid).
 */
export function curveTimes(
  dataTimes: ArrayLike<number>, start: number, end: number, shortestPeriod: number,
  opts: { samplesPerPeriod?: number; maxSamples?: number; minSamples?: number } = {},
): CurveSampling {
  const perPeriod = opts.samplesPerPeriod ?? CURVE_DEFAULTS.samplesPerPeriod
  const budget = opts.maxSamples ?? CURVE_DEFAULTS.maxSamples
  const minSamples = Math.max(2, opts.minSamples ?? CURVE_DEFAULTS.minSamples)
  if (!(end >= start)) throw new RangeError(`end (${end}) must not be before start (${start})`)
  const span = Math.max(end - start, 1e-6)
  const regular = (n: number): CurveSampling => {
    const t = new Float64Array(n)
    for (let i = 0; i < n; i++) t[i] = start + (span * i) / (n - 1)
    return { time: mergeTimes(t, dataTimes, start, end), mode: 'regular' }
  }
  if (!(shortestPeriod > 0) || !Number.isFinite(shortestPeriod)) return regular(minSamples)
  const needed = Math.ceil((perPeriod * span) / shortestPeriod) + 1
  if (needed <= budget) return regular(Math.max(minSamples, needed))
  // Segments: windows of ± half a period around each measurement, merged where they overlap.
  const sorted = Float64Array.from(dataTimes).filter((v) => v >= start && v <= end).sort()
  const half = shortestPeriod / 2
  const windows: Array<[number, number]> = []
  for (const v of sorted) {
    const a = Math.max(start, v - half), b = Math.min(end, v + half)
    const last = windows[windows.length - 1]
    if (last && a <= last[1]) last[1] = Math.max(last[1], b)
    else windows.push([a, b])
  }
  let covered = 0
  for (const [a, b] of windows) covered += b - a
  // samples per period lowered (never below 8, well above Nyquist) if the windows need more than the budget
  const step = Math.max(shortestPeriod / perPeriod, covered / Math.max(budget - 2 * windows.length, 1), 0)
  const stepUsed = Math.min(step, shortestPeriod / 8)
  const out: number[] = []
  windows.forEach(([a, b], w) => {
    if (w > 0) out.push(NaN)
    const n = Math.max(2, Math.ceil((b - a) / stepUsed) + 1)
    for (let i = 0; i < n; i++) out.push(a + ((b - a) * i) / (n - 1))
  })
  return { time: mergeTimes(Float64Array.from(out), sorted, start, end), mode: 'segments' }
}

/** Inserts the data's times (within [start, end]) into a sorted grid that may contain NaN breaks. */
function mergeTimes(grid: Float64Array, dataTimes: ArrayLike<number>, start: number, end: number): Float64Array {
  const extra = Array.from(dataTimes).filter((v) => v >= start && v <= end).sort((a, b) => a - b)
  const out: number[] = []
  let j = 0
  for (let i = 0; i < grid.length; i++) {
    const g = grid[i]
    if (Number.isNaN(g)) { out.push(NaN); continue }
    while (j < extra.length && extra[j] < g) {
      // a data time before this grid point: only inside the current segment (after a real sample)
      const prev = out.length ? out[out.length - 1] : NaN
      if (!Number.isNaN(prev)) out.push(extra[j])
      j++
    }
    if (j < extra.length && extra[j] === g) j++
    out.push(g)
  }
  return Float64Array.from(out)
}

/** Model velocity (planets and trend, no instrument offset) at the given times; NaN stays NaN. */
export function modelVelocity(planets: PlanetElements[], trend: CurveTrend | null, time: Float64Array): Float64Array {
  const v = new Float64Array(time.length)
  const finite = time.map((x) => (Number.isNaN(x) ? 0 : x))
  for (const p of planets) addKeplerian(finite, keplerianOf(p), v)
  for (let i = 0; i < time.length; i++) {
    if (Number.isNaN(time[i])) { v[i] = NaN; continue }
    if (trend) { const dt = time[i] - trend.epoch; v[i] += trend.slope * dt + trend.curvature * dt * dt }
  }
  return v
}

/** Phase of `time` from the reference conjunction, in [−0.5, 0.5). */
export function phaseOf(time: number, period: number, tc: number): number {
  const x = (time - tc) / period
  return x - Math.floor(x + 0.5)
}

/** One planet's curve over one orbit: [phase from Tc in −0.5…0.5, velocity] at `samples` + 1 points. */
export function phaseCurve(p: PlanetElements, samples = 400): Array<[number, number]> {
  const ct = new Float64Array(samples + 1)
  for (let i = 0; i <= samples; i++) ct[i] = p.tc + p.period * (i / samples - 0.5)
  const cv = new Float64Array(samples + 1)
  addKeplerian(ct, keplerianOf(p), cv)
  return Array.from(cv, (value, i): [number, number] => [i / samples - 0.5, value])
}

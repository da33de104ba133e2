/**
 * The injection grid of a detection-limit map: log-spaced periods (default 0.5 d … 5 × the
 * baseline, the search's own period range), log-spaced minimum masses, phases and optional
 * eccentricities. Every injection ("trial") has a flat index k; a chunk is a range [start, end) of
 * k, so any worker can take any slice and the slices merge into the same map however the grid was
 * cut.
 *
 * Order of k (fastest last): period, mass, eccentricity, phase:
 *   k = ((iP · nM + iM) · nE + iE) · nPhase + iPhase
 */
import { GM_EARTH, GM_JUPITER } from '../rv/index.ts'

export interface LimitGridInput {
  /** Shortest injected period, days (default 0.5). */
  minPeriod?: number
  /** Longest injected period, days (default 5 × the baseline). */
  maxPeriod?: number
  /** Periods on the grid (default 30). */
  periods?: number
  /** Smallest and largest M sin i, Earth masses (defaults from the data's noise, see `defaultMassRange`). */
  minMassEarth?: number
  maxMassEarth?: number
  /** Masses on the grid (default 30). */
  masses?: number
  /** Injections per (period, mass, e) cell at evenly spread phases (default 10). */
  phases?: number
  /** Eccentricities injected (default [0], circular); ω is drawn per injection when e > 0. */
  eccentricities?: number[]
}

export interface LimitGrid {
  periods: Float64Array
  massesEarth: Float64Array
  eccentricities: Float64Array
  phases: number
  /** Number of trials = periods × masses × eccentricities × phases. */
  trials: number
}

/** Most injections one map may hold. */
export const MAX_TRIALS = 2_000_000

/** n log-spaced values from lo to hi inclusive. */
export function logSpace(lo: number, hi: number, n: number): Float64Array {
  if (n === 1) return Float64Array.of(Math.sqrt(lo * hi))
  const a = Math.log(lo), b = Math.log(hi)
  return Float64Array.from({ length: n }, (_, i) => Math.exp(a + (b - a) * i / (n - 1)))
}

function intIn(name: string, v: number, lo: number, hi: number): number {
  if (!(Number.isInteger(v) && v >= lo && v <= hi)) throw new RangeError(`${name} must be an integer in [${lo}, ${hi}], got ${v}`)
  return v
}

/**
 * The grid for data of `baseline` days; `massRange` supplies the mass defaults. Throws a
 * RangeError naming the field on misuse.
 */
export function makeGrid(input: LimitGridInput, baseline: number, massRange: { minMassEarth: number; maxMassEarth: number }): LimitGrid {
  if (!(baseline > 0)) throw new RangeError(`the data must span a baseline > 0 d, got ${baseline}`)
  const minP = input.minPeriod ?? 0.5
  const maxP = input.maxPeriod ?? 5 * baseline
  if (!(minP > 0 && Number.isFinite(minP))) throw new RangeError(`minPeriod must be > 0, got ${minP}`)
  if (!(maxP > minP && Number.isFinite(maxP))) throw new RangeError(`maxPeriod (${maxP}) must exceed minPeriod (${minP})`)
  const minM = input.minMassEarth ?? massRange.minMassEarth
  const maxM = input.maxMassEarth ?? massRange.maxMassEarth
  if (!(minM > 0 && Number.isFinite(minM))) throw new RangeError(`minMassEarth must be > 0, got ${minM}`)
  if (!(maxM > minM && Number.isFinite(maxM))) throw new RangeError(`maxMassEarth (${maxM}) must exceed minMassEarth (${minM})`)
  const nP = intIn('periods', input.periods ?? 30, 1, 500)
  const nM = intIn('masses', input.masses ?? 30, 1, 500)
  const phases = intIn('phases', input.phases ?? 10, 1, 1000)
  const ecc = Float64Array.from(input.eccentricities ?? [0])
  if (!ecc.length || ecc.length > 20) throw new RangeError(`eccentricities must hold 1 to 20 values, got ${ecc.length}`)
  ecc.forEach((e, i) => { if (!(e >= 0 && e <= 0.95)) throw new RangeError(`eccentricities[${i}] must be in [0, 0.95], got ${e}`) })
  const trials = nP * nM * ecc.length * phases
  if (trials > MAX_TRIALS) throw new RangeError(`the grid holds ${trials} injections; at most ${MAX_TRIALS}`)
  return { periods: logSpace(minP, maxP, nP), massesEarth: logSpace(minM, maxM, nM), eccentricities: ecc, phases, trials }
}

/** Grid indices of trial k. */
export function trialIndices(grid: LimitGrid, k: number): { iP: number; iM: number; iE: number; iPhase: number } {
  if (!(Number.isInteger(k) && k >= 0 && k < grid.trials)) throw new RangeError(`trial index must be in [0, ${grid.trials}), got ${k}`)
  const nPh = grid.phases, nE = grid.eccentricities.length, nM = grid.massesEarth.length
  const iPhase = k % nPh
  let r = (k - iPhase) / nPh
  const iE = r % nE
  r = (r - iE) / nE
  const iM = r % nM
  return { iP: (r - iM) / nM, iM, iE, iPhase }
}

/** Cell (period, mass) of trial k: iP · nM + iM. */
export function cellOf(grid: LimitGrid, k: number): number {
  return Math.floor(k / (grid.phases * grid.eccentricities.length))
}

/** Splits [0, trials) into `count` contiguous chunks of nearly equal size. */
export function chunkRanges(trials: number, count: number): Array<{ start: number; end: number }> {
  intIn('chunk count', count, 1, Math.max(1, trials))
  return Array.from({ length: count }, (_, i) => ({ start: Math.floor(i * trials / count), end: Math.floor((i + 1) * trials / count) }))
}

/** Earth masses → Jupiter masses (IAU 2015 B3 nominal GM values). */
export function earthToJupiter(mEarth: number): number {
  return mEarth * GM_EARTH / GM_JUPITER
}

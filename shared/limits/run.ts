/**
 * Running a slice of the grid and merging slices into the map. A chunk's result is the outcome of
 * each of its trials, so merged chunks give the same map bit for bit however the grid was cut and
 * whichever worker ran each part (the injected signals depend only on (seed, k), see inject.ts).
 */
import { makeGrid, cellOf, type LimitGrid, type LimitGridInput } from './grid.ts'
import { injectionOf, injectInto } from './inject.ts'
import { prepareRecovery, recoverInjected, checkLimitsData, type LimitsData, type Recovery, type RecoveryOptions } from './recovery.ts'
import { defaultMassRange } from './mass-range.ts'

/** Everything that fixes a map: the data, the star, the grid, the criterion and the seed. */
export interface LimitsProblem {
  data: LimitsData
  /** Stellar mass, M☉ (the map is in M sin i for this mass). */
  starMass: number
  grid?: LimitGridInput
  recovery?: RecoveryOptions
  /** Seed of the run (recorded; the same seed gives the same map). */
  seed: number
}

/** A problem with its grid and criterion fixed (cheap to build; build once per worker). */
export interface PreparedLimits {
  problem: LimitsProblem
  grid: LimitGrid
  recovery: Recovery
  tRef: number
}

export function prepareLimits(problem: LimitsProblem): PreparedLimits {
  checkLimitsData(problem.data)
  if (!(problem.starMass > 0 && problem.starMass < 100)) throw new RangeError(`starMass must be in (0, 100) solar masses, got ${problem.starMass}`)
  if (!(Number.isInteger(problem.seed) && problem.seed >= 0 && problem.seed <= 0xffffffff)) throw new RangeError(`seed must be an integer in [0, 2³²), got ${problem.seed}`)
  const t = problem.data.t
  let tmin = Infinity, tmax = -Infinity
  for (const v of t) { if (v < tmin) tmin = v; if (v > tmax) tmax = v }
  const baseline = tmax - tmin
  const gi = problem.grid ?? {}
  const minP = gi.minPeriod ?? 0.5, maxP = gi.maxPeriod ?? 5 * baseline
  const grid = makeGrid(gi, baseline, defaultMassRange(problem.data, problem.starMass, minP, maxP))
  const recovery = prepareRecovery(problem.data, problem.recovery, { minPeriod: grid.periods[0], maxPeriod: grid.periods[grid.periods.length - 1] })
  return { problem, grid, recovery, tRef: tmin }
}

/** Outcomes of trials start … end − 1. */
export interface ChunkResult {
  start: number
  end: number
  /** 1 = recovered, per trial in order. */
  recovered: Uint8Array
}

/**
 * Runs trials [start, end). `onProgress(done)` is called every `every` trials (default 50) and may
 * return 'stop' to end early; the result then covers [start, start + done).
 */
export function runChunk(
  prep: PreparedLimits, start: number, end: number,
  onProgress?: (done: number) => void | 'stop', every = 50,
): ChunkResult {
  const { grid, recovery, tRef, problem } = prep
  if (!(Number.isInteger(start) && Number.isInteger(end) && start >= 0 && end <= grid.trials && start < end)) {
    throw new RangeError(`chunk must satisfy 0 ≤ start < end ≤ ${grid.trials}, got [${start}, ${end})`)
  }
  const { t, residuals, dy } = problem.data
  const y = new Float64Array(t.length)
  const out = new Uint8Array(end - start)
  for (let k = start; k < end; k++) {
    const o = injectionOf(grid, k, problem.seed, problem.starMass, tRef)
    injectInto(t, residuals, o, y)
    out[k - start] = recoverInjected(recovery, t, y, dy, 1 / o.period).recovered ? 1 : 0
    const done = k - start + 1
    if (onProgress && done % every === 0 && done < end - start && onProgress(done) === 'stop') {
      return { start, end: k + 1, recovered: out.slice(0, done) }
    }
  }
  return { start, end, recovered: out }
}

/** The merged map: per (period, mass) cell, row-major by period (cell = iP · nMasses + iM). */
export interface LimitMap {
  grid: LimitGrid
  /** Trials recovered per cell. */
  recovered: Int32Array
  /** Trials per cell (eccentricities × phases). */
  perCell: number
  /** recovered / perCell. */
  fraction: Float64Array
}

/** Merges chunks that together cover every trial exactly once; throws naming a gap or an overlap. */
export function mergeChunks(grid: LimitGrid, chunks: readonly ChunkResult[]): LimitMap {
  const sorted = [...chunks].sort((a, b) => a.start - b.start)
  let next = 0
  for (const c of sorted) {
    if (c.recovered.length !== c.end - c.start) throw new RangeError(`chunk [${c.start}, ${c.end}) holds ${c.recovered.length} outcomes`)
    if (c.start > next) throw new RangeError(`trials [${next}, ${c.start}) are missing`)
    if (c.start < next) throw new RangeError(`trials [${c.start}, ${Math.min(next, c.end)}) are covered twice`)
    next = c.end
  }
  if (next !== grid.trials) throw new RangeError(`trials [${next}, ${grid.trials}) are missing`)
  const nCells = grid.periods.length * grid.massesEarth.length
  const perCell = grid.phases * grid.eccentricities.length
  const recovered = new Int32Array(nCells)
  for (const c of sorted) for (let i = 0; i < c.recovered.length; i++) if (c.recovered[i]) recovered[cellOf(grid, c.start + i)]++
  return { grid, recovered, perCell, fraction: Float64Array.from(recovered, (r) => r / perCell) }
}

/** The whole map in one go (one worker). */
export function computeLimitMap(problem: LimitsProblem): LimitMap {
  const prep = prepareLimits(problem)
  return mergeChunks(prep.grid, [runChunk(prep, 0, prep.grid.trials)])
}

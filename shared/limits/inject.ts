/**
 * The signal injected in trial k: period, minimum mass and eccentricity from the grid, K from the
 * mass function (`semiAmplitude` of shared/rv), phase spread evenly over the cell's injections
 * with a seeded offset, ω uniform when e > 0. Each trial draws from its own generator seeded by
 * (seed, k), so a trial's signal does not depend on which chunk ran it.
 */
import { createRandom } from '../math/index.ts'
import { addKeplerian, semiAmplitude, type Keplerian } from '../rv/index.ts'
import { earthToJupiter, trialIndices, type LimitGrid } from './grid.ts'

/** 32-bit mix of the run's seed and the trial index (murmur3 finaliser; common practice). */
export function trialSeed(seed: number, k: number): number {
  let h = (Math.imul(seed >>> 0, 0x9e3779b1) ^ Math.imul(k >>> 0, 0x85ebca6b) ^ Math.floor(k / 4294967296)) >>> 0
  h ^= h >>> 16; h = Math.imul(h, 0x85ebca6b)
  h ^= h >>> 13; h = Math.imul(h, 0xc2b2ae35)
  h ^= h >>> 16
  return h >>> 0
}

export interface Injection extends Keplerian {
  massEarth: number
  /** Phase of periastron passage relative to tRef, 0…1. */
  phase: number
}

/** The orbit of trial k around a star of `starMass` solar masses; tRef anchors the phases (e.g. the first time). */
export function injectionOf(grid: LimitGrid, k: number, seed: number, starMass: number, tRef: number): Injection {
  const { iP, iM, iE, iPhase } = trialIndices(grid, k)
  const rng = createRandom(trialSeed(seed, k))
  const period = grid.periods[iP], massEarth = grid.massesEarth[iM], e = grid.eccentricities[iE]
  const phase = (iPhase + rng.next()) / grid.phases
  const omega = e > 0 ? 2 * Math.PI * rng.next() : 0
  const K = semiAmplitude(period, earthToJupiter(massEarth), e, starMass)
  return { period, K, e, omega, tp: tRef + phase * period, massEarth, phase }
}

/** residuals + signal, written into `out`. */
export function injectInto(t: Float64Array, residuals: Float64Array, o: Keplerian, out: Float64Array): Float64Array {
  out.set(residuals)
  return addKeplerian(t, o, out)
}

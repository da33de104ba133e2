/**
 * One planet-elements shape for every edge (API JSON, plots, starts, reports) and its converters.
 * Angles in degrees (ω of the star), times as full JD, period in days, K in m/s. Inside the core
 * a `Keplerian` (ω in radians, Tp) is what the model evaluates.
 */
import { tcToTp, tpToTc, type Keplerian } from './model.ts'
import type { PlanetFit, PlanetStart } from './orbit-fit-types.ts'

const DEG = Math.PI / 180

export interface PlanetElements {
  period: number
  K: number
  e: number
  /** Argument of periastron of the star, degrees. */
  omegaDeg: number
  /** Time of periastron and of conjunction (full JD); both always given. */
  tp: number
  tc: number
}

/** Elements as the core's model takes them. */
export function keplerianOf(p: Pick<PlanetElements, 'period' | 'K' | 'e' | 'omegaDeg' | 'tp'>): Keplerian {
  return { period: p.period, K: p.K, e: p.e, omega: p.omegaDeg * DEG, tp: p.tp }
}

/** Elements of a fitted planet. */
export function elementsOfFit(p: PlanetFit): PlanetElements {
  return { period: p.period, K: p.K, e: p.e, omegaDeg: p.omegaDeg, tp: p.tp, tc: p.tc }
}

/** A start for the fitter from full elements (phase as Tc). */
export function startOfElements(p: PlanetElements, fix?: PlanetStart['fix']): PlanetStart {
  return { period: p.period, K: p.K, e: p.e, omegaDeg: p.omegaDeg, tc: p.tc, ...(fix ? { fix } : {}) }
}

/** Default ω of a start that gives none: 0°, the core's default (`fitKeplerians`). */
export const OMEGA_START_DEG = 0

/**
 * Full elements of a start, or null when it has no phase or no finite K. e defaults to 0 and ω to
 * {@link OMEGA_START_DEG}; Tc wins over Tp when both are given (as in the fitter).
 */
export function elementsOfStart(p: PlanetStart): PlanetElements | null {
  if ((p.tc === undefined && p.tp === undefined) || !Number.isFinite(p.K)) return null
  const e = p.e ?? 0, omegaDeg = p.omegaDeg ?? OMEGA_START_DEG
  const omega = omegaDeg * DEG
  const tc = p.tc ?? tpToTc(p.tp!, p.period, e, omega)
  const tp = p.tc !== undefined ? tcToTp(p.tc, p.period, e, omega) : p.tp!
  return { period: p.period, K: p.K, e, omegaDeg, tp, tc }
}

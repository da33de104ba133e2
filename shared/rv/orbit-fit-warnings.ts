/**
 * Plain-word warnings about a fit, the one home for the CLI, the server and the browser: the
 * doubts shown beside the numbers where the judgement is made.
 */
import type { FitResult } from './orbit-fit-types.ts'

/** Eccentricity above which a warning is given (common practice: fits this eccentric are often spurious or poorly sampled). */
export const E_WARN = 0.9

export type FitWarningCode = 'not_converged' | 'e_near_1' | 'k_below_noise' | 'period_beyond_baseline' | 'failed'

export interface FitWarningItem {
  code: FitWarningCode
  /** Index into the fit's planets, when the warning is about one. */
  planet: number | null
  message: string
}

/** 'b', 'c', … for planet index 0, 1, … */
export function planetLetter(k: number): string { return String.fromCharCode(98 + k) }

/**
 * Not converged / failed; e above {@link E_WARN}; K less than 3σ from zero (the signal is not
 * clearly above the noise — common practice); a period longer than the data's baseline.
 */
export function fitWarnings(fit: Pick<FitResult, 'status' | 'converged' | 'message' | 'planets'>, baselineDays: number): FitWarningItem[] {
  const w: FitWarningItem[] = []
  if (fit.status === 'failed') w.push({ code: 'failed', planet: null, message: `The fit failed: ${fit.message}.` })
  else if (!fit.converged) w.push({ code: 'not_converged', planet: null, message: `The fit did not converge: ${fit.message}. Treat the values as provisional; refit from these values.` })
  fit.planets.forEach((p, k) => {
    const name = `Planet ${planetLetter(k)}`
    if (p.e > E_WARN) w.push({ code: 'e_near_1', planet: k, message: `${name}: e = ${p.e.toFixed(3)} is close to 1; such orbits are often an artefact of sparse phase coverage.` })
    const sK = p.uncertainty.K
    if (Number.isFinite(sK) && sK > 0 && p.K < 3 * sK) {
      w.push({ code: 'k_below_noise', planet: k, message: `${name}: K = ${p.K.toFixed(2)} ± ${sK.toFixed(2)} m/s is less than 3σ from zero: the signal is not clearly above the noise.` })
    }
    if (p.period > baselineDays) {
      w.push({ code: 'period_beyond_baseline', planet: k, message: `${name}: P = ${p.period.toFixed(1)} d is longer than the ${baselineDays.toFixed(0)} d the data cover; the orbit is not closed by the data.` })
    }
  })
  return w
}

/**
 * False-alarm probability of a new Keplerian signal from its likelihood gain, with the number of
 * independent frequencies searched (the "look-elsewhere" effect that a BIC per model ignores).
 *
 * Form: Cumming 2004, MNRAS 354, 1165, §2: FAP = 1 − (1 − p₁)^M, with M independent frequencies,
 * M ≈ T·(f_max − f_min) for a baseline T, and p₁ the single-trial tail of 2ΔlnL as χ² with ν
 * degrees of freedom.
 *
 * Calibrated by simulation, not taken from the analytic count: the nominal choice (ν = 4, the two
 * linear amplitudes plus e and the periastron time, as O'Toole et al. 2009, MNRAS 392, 641 count them
 * for their Keplerian periodogram; M trials) let 2 % of pure-noise data sets through at FAP ≤ 0.001
 * (400 simulated noise sets in four sampling designs). The search's gain is larger than one
 * periodogram cell's: the orbit's five nonlinear parameters are fitted from the best cells, jitters
 * are refitted, and the eccentric cells multiply the trials. `scripts/calibrate-false-alarm.ts`
 * simulates noise sets, runs the search's one-planet step on each and picks (ν, trials factor) so
 * that the fraction of noise sets at FAP ≤ α matches α at α = 0.01 … 0.1 (the 0.001 tail is
 * extrapolated by the same law); its result is fixtures/search/false-alarm-calibration.json and
 * tests/shared/rv/planet-search/false-alarm.spec.ts holds these constants to it.
 */

/** The calibrated law: χ²_ν tail per trial and the trials' factor over T·Δf (see the module comment). */
export const FALSE_ALARM_LAW = Object.freeze({ dof: 6, trialsFactor: 2 })

/** Independent frequencies between 1/maxPeriod and 1/minPeriod for a baseline (Cumming 2004 §2), before the trials' factor. */
export function independentFrequencies(baseline: number, minPeriod: number, maxPeriod: number): number {
  if (!(baseline > 0 && minPeriod > 0 && maxPeriod > minPeriod)) throw new RangeError('baseline, minPeriod > 0 and maxPeriod > minPeriod are required')
  return Math.max(1, baseline * (1 / minPeriod - 1 / maxPeriod))
}

/** P(χ²_ν > 2z) for even ν: e^{−z} Σ_{j < ν/2} z^j / j! (the Poisson sum; common practice). */
export function chiSquareTailEven(z: number, dof: number): number {
  if (!(Number.isInteger(dof) && dof >= 2 && dof % 2 === 0)) throw new RangeError(`dof must be an even integer >= 2 (got ${dof})`)
  if (!(z > 0)) return 1
  let term = 1, sum = 1
  for (let j = 1; j < dof / 2; j++) { term *= z / j; sum += term }
  return Math.min(1, sum * Math.exp(-z))
}

/**
 * FAP of a Keplerian likelihood gain `dLnL` searched over `m` independent frequencies (before the
 * trials' factor), by the calibrated law unless another is given (see the module comment).
 */
export function keplerianFap(dLnL: number, m: number, law: { dof: number; trialsFactor: number } = FALSE_ALARM_LAW): number {
  if (!(m >= 1)) throw new RangeError(`m must be >= 1 (got ${m})`)
  if (!(law.trialsFactor > 0)) throw new RangeError(`trialsFactor must be > 0 (got ${law.trialsFactor})`)
  if (!(dLnL > 0)) return 1
  const p1 = chiSquareTailEven(dLnL, law.dof)
  if (p1 >= 1) return 1
  return -Math.expm1(law.trialsFactor * m * Math.log1p(-p1))
}

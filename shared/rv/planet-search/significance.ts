/**
 * False-alarm probability of a new Keplerian signal from its likelihood gain, with the number of
 * independent frequencies searched (the "look-elsewhere" effect that a BIC per model ignores).
 *
 * Cumming 2004, MNRAS 354, 1165, §2: FAP = 1 − (1 − p₁)^M, M ≈ T·(f_max − f_min) independent
 * frequencies for a baseline T. For the single-trial tail p₁ we treat 2ΔlnL of the nested model as
 * χ² with 4 degrees of freedom (the two linear amplitudes plus e and the periastron time of the
 * eccentric orbit; O'Toole et al. 2009, MNRAS 392, 641 use the same count for their Keplerian
 * periodogram): p₁ = P(χ²₄ > 2z) = (1 + z)e^{−z}, z = ΔlnL. An analytic level, not calibrated by
 * simulation here; it is a second gate beside the BIC rule, so that noise peaks found among
 * tens of thousands of trial periods (ΔlnL ≈ 15–20) are not kept.
 */

/** Independent frequencies between 1/maxPeriod and 1/minPeriod for a baseline (Cumming 2004 §2). */
export function independentFrequencies(baseline: number, minPeriod: number, maxPeriod: number): number {
  if (!(baseline > 0 && minPeriod > 0 && maxPeriod > minPeriod)) throw new RangeError('baseline, minPeriod > 0 and maxPeriod > minPeriod are required')
  return Math.max(1, baseline * (1 / minPeriod - 1 / maxPeriod))
}

/** FAP of a Keplerian likelihood gain `dLnL` searched over `m` independent frequencies (see the module comment). */
export function keplerianFap(dLnL: number, m: number): number {
  if (!(m >= 1)) throw new RangeError(`m must be >= 1 (got ${m})`)
  if (!(dLnL > 0)) return 1
  const p1 = Math.min(1, (1 + dLnL) * Math.exp(-dLnL))
  if (p1 >= 1) return 1
  return -Math.expm1(m * Math.log1p(-p1))
}

/**
 * Peak heuristics that judge a velocity peak against the activity indicators, the one home for the
 * browser, the server and the CLI: a velocity peak shared by an indicator's periodogram is more
 * likely stellar activity or rotation than a planet (Queloz et al. 2001, A&A 379, 279; common
 * practice).
 */

/** Width of a periodogram peak in frequency: about one over the baseline (common practice). */
export function peakWidth(baseline: number): number {
  return baseline > 0 ? 1 / baseline : Infinity
}

export interface Coincidence {
  /** Period of the velocity peak (days). */
  period: number
  indicator: string
  indicatorPeriod: number
  indicatorFap: number
}

interface PeakLike { period: number; frequency: number; fap: number }

/** False-alarm probability below which an indicator's peak counts (default). */
export const COINCIDENCE_FAP = 0.1

/**
 * Velocity peaks that an activity indicator's periodogram shares: the indicator has a peak with FAP
 * below `fapLimit` within one peak width (1/baseline in frequency) of the velocity peak.
 */
export function coincidences(
  rvPeaks: Array<Pick<PeakLike, 'period' | 'frequency'>>, indicators: Array<{ name: string; peaks: PeakLike[] }>,
  baseline: number, fapLimit = COINCIDENCE_FAP,
): Coincidence[] {
  const width = peakWidth(baseline)
  const found: Coincidence[] = []
  for (const peak of rvPeaks) {
    for (const { name, peaks } of indicators) {
      const match = peaks.find((q) => q.fap < fapLimit && Math.abs(q.frequency - peak.frequency) <= width)
      if (match) found.push({ period: peak.period, indicator: name, indicatorPeriod: match.period, indicatorFap: match.fap })
    }
  }
  return found
}

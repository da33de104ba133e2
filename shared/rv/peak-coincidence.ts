/**
 * Period relations between a velocity signal and activity-indicator peaks — the one home for the
 * browser's shared-peak marks, the activity vetting and the GP search: a velocity peak shared by an
 * indicator's periodogram (or at a harmonic of its rotation peak) is more likely stellar activity or
 * rotation than a planet (Queloz et al. 2001, A&A 379, 279; Boisse et al. 2011, A&A 528, A4 for the
 * harmonics P/2, P/3; common practice).
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

/** Frequency ratios checked: signal frequency = ratio × peak frequency, with the words for each. */
export const PERIOD_RELATIONS: ReadonlyArray<{ ratio: number; text: string }> = [
  { ratio: 1, text: 'the same period as' },
  { ratio: 2, text: 'half the period of' },
  { ratio: 3, text: 'a third of the period of' },
  { ratio: 0.5, text: 'twice the period of' },
]

/**
 * The first relation (same period, then the harmonics, in `PERIOD_RELATIONS` order) linking a period to
 * one of the peaks within one peak width (1/span in frequency), or null. Only peaks with FAP below
 * `fapLimit` count; `relations` narrows the ratios tried (default all).
 */
export function periodRelation<P extends PeakLike>(
  period: number, peaks: readonly P[], span: number, fapLimit: number, relations: ReadonlyArray<{ ratio: number; text: string }> = PERIOD_RELATIONS,
): { peak: P; relation: string; ratio: number } | null {
  const f = 1 / period
  const width = peakWidth(span)
  for (const { ratio, text } of relations) {
    for (const peak of peaks) {
      if (!(peak.fap < fapLimit)) continue
      if (Math.abs(f - ratio * peak.frequency) <= width) return { peak, relation: text, ratio }
    }
  }
  return null
}

const SAME_PERIOD = PERIOD_RELATIONS.slice(0, 1)

/**
 * Velocity peaks that an activity indicator's periodogram shares: the indicator has a peak with FAP
 * below `fapLimit` within one peak width (1/baseline in frequency) of the velocity peak
 * (`periodRelation` at the same period).
 */
export function coincidences(
  rvPeaks: Array<Pick<PeakLike, 'period' | 'frequency'>>, indicators: Array<{ name: string; peaks: PeakLike[] }>,
  baseline: number, fapLimit = COINCIDENCE_FAP,
): Coincidence[] {
  const found: Coincidence[] = []
  for (const peak of rvPeaks) {
    for (const { name, peaks } of indicators) {
      const rel = periodRelation(1 / peak.frequency, peaks, baseline, fapLimit, SAME_PERIOD)
      if (rel) found.push({ period: peak.period, indicator: name, indicatorPeriod: rel.peak.period, indicatorFap: rel.peak.fap })
    }
  }
  return found
}

import { LEAP_SECONDS_KNOWN_UNTIL_JD, UTC_TABLE_START_JD } from './leap-seconds.ts'
import type { TimeScale } from './types.ts'

/**
 * Doubts about converting these times, one sentence each (empty when none): UTC after the last
 * date the leap-second table is known for (a leap second announced later would move them by 1 s),
 * UTC before 1972 (refused by the conversion).
 */
export function conversionWarnings(jd: ArrayLike<number>, scale: TimeScale): string[] {
  if (scale !== 'utc' && scale !== 'hjd-utc') return []
  let late = 0, early = 0
  for (let i = 0; i < jd.length; i++) {
    if (jd[i]! >= LEAP_SECONDS_KNOWN_UNTIL_JD) late++
    if (jd[i]! < UTC_TABLE_START_JD) early++
  }
  const out: string[] = []
  if (early) out.push(`${early} time(s) before 1972-01-01 cannot be converted from UTC (no leap-second table); give them as TT or TDB.`)
  if (late) out.push(`${late} time(s) fall after 2026-06-30, beyond the leap-second table this version knows: TAI − UTC = 37 s is assumed (a later leap second would move them by 1 s).`)
  return out
}

import { julianDay, SECONDS_PER_DAY } from './calendar.ts'

/**
 * TAI − UTC in whole seconds since 1972-01-01, the start of UTC with leap seconds.
 * Source: IERS Bulletin C (each entry the date from which the value holds, 0h UTC); the last
 * leap second was inserted at the end of 2016-12-31. From memory of IERS Bulletin C 70 (July 2025):
 * no leap second at the end of December 2025, so the table is certain up to 2026-06-30; later dates
 * keep 37 s and are reported by `utcWarnings`.
 */
const STEPS: [year: number, month: number, taiMinusUtc: number][] = [
  [1972, 1, 10], [1972, 7, 11], [1973, 1, 12], [1974, 1, 13], [1975, 1, 14], [1976, 1, 15], [1977, 1, 16],
  [1978, 1, 17], [1979, 1, 18], [1980, 1, 19], [1981, 7, 20], [1982, 7, 21], [1983, 7, 22], [1985, 7, 23],
  [1988, 1, 24], [1990, 1, 25], [1991, 1, 26], [1992, 7, 27], [1993, 7, 28], [1994, 7, 29], [1996, 1, 30],
  [1997, 7, 31], [1999, 1, 32], [2006, 1, 33], [2009, 1, 34], [2012, 7, 35], [2015, 7, 36], [2017, 1, 37],
]
const TABLE = STEPS.map(([y, m, s]) => ({ jd: julianDay(y, m, 1), seconds: s }))

/** First UTC Julian date the table covers (1972-01-01 0h UTC). */
export const UTC_TABLE_START_JD = TABLE[0]!.jd
/** Last UTC Julian date for which the table is known to be right (2026-07-01 0h UTC, exclusive). */
export const LEAP_SECONDS_KNOWN_UNTIL_JD = julianDay(2026, 7, 1)

/** TT − TAI, seconds (exact by definition; IAU 1991 Resolution A4). */
export const TT_MINUS_TAI = 32.184

/**
 * TAI − UTC (s) at a UTC Julian date. Throws for dates before 1972, when UTC ran with
 * fractional "rubber" seconds that this table does not model.
 */
export function taiMinusUtc(jdUtc: number): number {
  if (!(jdUtc >= UTC_TABLE_START_JD)) {
    throw new RangeError(`UTC time ${jdUtc} is before 1972-01-01 (JD ${UTC_TABLE_START_JD}); convert it to TT or TDB first`)
  }
  let lo = 0, hi = TABLE.length - 1
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1
    if (TABLE[mid]!.jd <= jdUtc) lo = mid; else hi = mid - 1
  }
  return TABLE[lo]!.seconds
}

/** UTC → TT (both full Julian dates): TT = UTC + (TAI − UTC) + 32.184 s. */
export function utcToTt(jdUtc: number): number {
  return jdUtc + (taiMinusUtc(jdUtc) + TT_MINUS_TAI) / SECONDS_PER_DAY
}

/**
 * Julian dates from calendar dates (proleptic Gregorian), for tables keyed by civil dates.
 * Meeus, *Astronomical Algorithms* (2nd ed. 1998), chapter 7, eq. 7.1 — valid for any Gregorian date.
 */
export function julianDay(year: number, month: number, day: number): number {
  let y = year, m = month
  if (m <= 2) { y -= 1; m += 12 }
  const a = Math.floor(y / 100)
  const b = 2 - a + Math.floor(a / 4)
  return Math.floor(365.25 * (y + 4716)) + Math.floor(30.6001 * (m + 1)) + day + b - 1524.5
}

/** J2000.0 as a Julian date (TT), the origin of the ephemeris time argument. */
export const J2000 = 2451545.0
/** Seconds per day. */
export const SECONDS_PER_DAY = 86400
/** Days per Julian year, the unit of proper motions (mas/yr). */
export const DAYS_PER_JULIAN_YEAR = 365.25

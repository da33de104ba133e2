import { J2000, SECONDS_PER_DAY } from './calendar.ts'

/**
 * TDB − TT in seconds at the geocentre (the "Einstein delay" of Eastman, Siverd & Gaudi 2010,
 * PASP 122, 935, §2.3), by the series of Kaplan 2005, USNO Circular 179, eq. 2.6 (an abridgement of
 * Fairhead & Bretagnon 1990; better than 10 µs over 1600–2200). The topocentric term (≤ 2 µs) is left out.
 */
export function tdbMinusTt(jdTt: number): number {
  const T = (jdTt - J2000) / 36525
  return 0.001657 * Math.sin(628.3076 * T + 6.2401)
    + 0.000022 * Math.sin(575.3385 * T + 4.2970)
    + 0.000014 * Math.sin(1256.6152 * T + 6.1969)
    + 0.000005 * Math.sin(606.9777 * T + 4.0212)
    + 0.000005 * Math.sin(52.9691 * T + 0.4444)
    + 0.000002 * Math.sin(21.3299 * T + 5.5431)
    + 0.000010 * T * Math.sin(628.3076 * T + 4.2490)
}

/** TT → TDB, full Julian dates. */
export function ttToTdb(jdTt: number): number {
  return jdTt + tdbMinusTt(jdTt) / SECONDS_PER_DAY
}

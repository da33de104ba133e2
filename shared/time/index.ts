/** Public API of Starsway's time systems (re-exports only; helpers stay private). */
export type { TimeScale, Target, Site } from './types.ts'
export { toBjdTdb, toBjdTdbDirect, roemerDelay, shapiroCorrection, AU_LIGHT_SECONDS } from './barycentric.ts'
export { utcToTt, taiMinusUtc, TT_MINUS_TAI, LEAP_SECONDS_KNOWN_UNTIL_JD, UTC_TABLE_START_JD } from './leap-seconds.ts'
export { tdbMinusTt, ttToTdb } from './tdb.ts'
export { starDirection, checkTarget } from './direction.ts'
export { directEphemeris, interpolatedEphemeris, type Ephemeris, type ObserverPosition } from './ephemeris.ts'
export { SITES, findSite, type NamedSite } from './sites.ts'
export { conversionWarnings } from './checks.ts'
export {
  type TimeScaleName, type TimeSystem, timeScaleName, isBarycentricTdb, timeScaleWarning, groupDigits,
  timeSystemOffset, timeSystemLabel, timeAxisTitle, formatTime, displayOffset,
} from './labels.ts'
export { julianDay, J2000 } from './calendar.ts'

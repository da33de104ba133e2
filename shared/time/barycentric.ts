import { SECONDS_PER_DAY } from './calendar.ts'
import { checkTarget, starDirection, type Vec3 } from './direction.ts'
import { directEphemeris, interpolatedEphemeris, type Ephemeris, type ObserverPosition } from './ephemeris.ts'
import { utcToTt } from './leap-seconds.ts'
import { ttToTdb } from './tdb.ts'
import type { Site, Target, TimeScale } from './types.ts'

/** Light time for one astronomical unit, s (IAU 2012 B2 au / SI speed of light). */
export const AU_LIGHT_SECONDS = 149597870700 / 299792458
/** 2 GM☉ / c³, s (IAU 2015 B3 nominal GM☉) — the scale of the Shapiro delay. */
const SHAPIRO_SCALE = (2 * 1.3271244e20) / 299792458 ** 3

/** Full Julian dates this module accepts: 1800-01-01 … 2200-01-01. */
const JD_MIN = 2378496.5, JD_MAX = 2524593.5

const dot = (a: Vec3, b: Vec3) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2]

/**
 * Rømer delay (s): the extra path from the observer to the solar-system barycentre along the line
 * of sight, r·n̂/c (Eastman, Siverd & Gaudi 2010, PASP 122, 935, eq. 6 for a star at infinite
 * distance; the wavefront-curvature term of their eq. 7 is ≤ 1 ms for stars beyond 1 pc and left out).
 */
export function roemerDelay(pos: ObserverPosition, n: Vec3): number {
  return dot(pos.observer, n) * AU_LIGHT_SECONDS
}

/**
 * Shapiro correction (s) added to the time: (2GM☉/c³) ln(1 + cos θ), θ the angle at the observer
 * between the star and the direction away from the Sun (Eastman et al. 2010, §2.5; light grazing
 * the Sun arrives late, so the correction is large and negative there). Under 10 µs away from the Sun.
 */
export function shapiroCorrection(pos: ObserverPosition, n: Vec3): number {
  const r: Vec3 = [pos.observer[0] - pos.sun[0], pos.observer[1] - pos.sun[1], pos.observer[2] - pos.sun[2]]
  const cosTheta = dot(r, n) / Math.hypot(r[0], r[1], r[2])
  return SHAPIRO_SCALE * Math.log(Math.max(1 + cosTheta, 1e-12))
}

/** Heliocentric light time (s) of the observer along the line of sight, for undoing HJD. */
function heliocentricDelay(pos: ObserverPosition, n: Vec3): number {
  return (dot(pos.observer, n) - dot(pos.sun, n)) * AU_LIGHT_SECONDS
}

function checkInputs(jd: Float64Array, scale: TimeScale, target: Target, site: Site): void {
  if (!['utc', 'tt', 'tdb', 'hjd-utc'].includes(scale)) throw new RangeError(`scale must be utc, tt, tdb or hjd-utc, got ${String(scale)}`)
  checkTarget(target)
  if (!Number.isFinite(site.lonDeg) || Math.abs(site.lonDeg) > 360) throw new RangeError(`site.lonDeg must be within ±360, got ${site.lonDeg}`)
  if (!Number.isFinite(site.latDeg) || Math.abs(site.latDeg) > 90) throw new RangeError(`site.latDeg must be in [-90, 90], got ${site.latDeg}`)
  if (!Number.isFinite(site.heightM) || site.heightM < -500 || site.heightM > 10000) throw new RangeError(`site.heightM must be in [-500, 10000] m, got ${site.heightM}`)
  for (let i = 0; i < jd.length; i++) {
    const t = jd[i]!
    if (!(t >= JD_MIN && t <= JD_MAX)) {
      throw new RangeError(`jd[${i}] = ${t} is not a full Julian date in 1800–2200; add the table's offset (e.g. 2400000 or 2457000) first`)
    }
  }
}

/** One time on the scale given → BJD_TDB, with a given ephemeris (direct or interpolated). */
function convertOne(t: number, scale: Exclude<TimeScale, 'tdb'>, target: Target, eph: Ephemeris): number {
  let jdUtcOrTt = t
  if (scale === 'hjd-utc') {
    // HJD_UTC = JD_UTC + heliocentric light time (Eastman et al. 2010 §4: HJD is referred to the
    // Sun's centre, in the UTC of the original table). Undo it by fixed-point iteration: the delay
    // changes by < 0.01 s per second, so three steps reach the microsecond.
    let utc = t
    for (let k = 0; k < 3; k++) {
      const tt = utcToTt(utc)
      utc = t - heliocentricDelay(eph(tt), starDirection(target, tt)) / SECONDS_PER_DAY
    }
    jdUtcOrTt = utc
  }
  const tt = scale === 'tt' ? jdUtcOrTt : utcToTt(jdUtcOrTt)
  const tdb = ttToTdb(tt)
  const pos = eph(tt)
  const n = starDirection(target, tdb)
  return tdb + (roemerDelay(pos, n) + shapiroCorrection(pos, n)) / SECONDS_PER_DAY
}

function convert(jd: Float64Array, scale: TimeScale, target: Target, site: Site, ephemerisOf: (site: Site) => Ephemeris): Float64Array {
  checkInputs(jd, scale, target, site)
  if (scale === 'tdb') return Float64Array.from(jd)
  const eph = ephemerisOf(site)
  const out = new Float64Array(jd.length)
  for (let i = 0; i < jd.length; i++) out[i] = convertOne(jd[i]!, scale, target, eph)
  return out
}

/**
 * Observation times → BJD_TDB (full Julian dates), following Eastman, Siverd & Gaudi 2010, PASP 122,
 * 935: UTC → TT by the leap-second table (eq. 1–2), TT → TDB (the Einstein delay, §2.3), plus the
 * Rømer delay from the site's barycentric position (astronomy-engine ephemeris) towards the star
 * moved by its proper motion, plus the Shapiro correction.
 * `scale`: `utc` JD_UTC at the site; `tt` JD_TT at the site; `hjd-utc` heliocentric JD in UTC
 * (undone to JD_UTC first); `tdb` times already BJD_TDB, returned unchanged (copied).
 * Misuse (reduced dates, UTC before 1972, bad coordinates) throws a RangeError naming the field.
 * Agrees with astropy's `Time.tdb + light_travel_time(kind='barycentric')` to well under 0.1 s
 * (tests/shared/time). Fast path: ephemeris interpolated per day; `toBjdTdbDirect` is the reference.
 */
export function toBjdTdb(jd: Float64Array, scale: TimeScale, target: Target, site: Site): Float64Array {
  return convert(jd, scale, target, site, interpolatedEphemeris)
}

/** The readable slow reference of `toBjdTdb`: the ephemeris evaluated at every time. */
export function toBjdTdbDirect(jd: Float64Array, scale: TimeScale, target: Target, site: Site): Float64Array {
  return convert(jd, scale, target, site, directEphemeris)
}

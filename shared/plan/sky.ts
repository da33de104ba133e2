/**
 * Where the star, the Sun and the Moon stand in an observatory's sky at one instant, from the
 * `astronomy-engine` ephemerides (Sun and Moon positions, precession, nutation, Earth rotation).
 *
 * Conventions: times are Julian days in UTC (the library takes UT1 ≈ UTC, < 0.9 s, i.e. < 0.004°
 * of altitude); the star's position is ICRS/J2000 right ascension and declination in degrees
 * (proper motion and annual aberration, ≤ 20″, are ignored); altitudes are geometric (no
 * refraction, as astropy's AltAz with pressure = 0); the Sun and Moon are topocentric. Checked
 * against astropy's `AltAz`, `get_sun`, `get_body('moon')` to 0.1° in tests/shared/plan/.
 */
import {
  AngleBetween, AstroTime, Body, Equator, HorizonFromVector, Observer, RotateVector, Rotation_EQJ_HOR,
  Spherical, VectorFromSphere, type Vector,
} from 'astronomy-engine'

/** A telescope site: longitude east-positive, geodetic latitude (degrees), height above the ellipsoid (m). */
export interface Site {
  lonDeg: number
  latDeg: number
  heightM: number
}

/** A star's ICRS (J2000) position, degrees. */
export interface StarPosition {
  raDeg: number
  decDeg: number
}

/** The sky at one instant for one star and site. Angles in degrees. */
export interface SkyState {
  jdUtc: number
  starAltDeg: number
  /** Azimuth from north through east. */
  starAzDeg: number
  sunAltDeg: number
  moonAltDeg: number
  /** Angle between the star and the (topocentric) Moon. */
  moonSeparationDeg: number
  /** Illuminated fraction of the Moon's disc, 0…1, from the Sun–Moon elongation (common practice). */
  moonIllumination: number
}

/** Julian day of the Unix epoch and of J2000 (both UTC here). */
const JD_UNIX = 2440587.5
const JD_J2000 = 2451545.0

/** Julian day (UTC) → JavaScript Date. */
export function jdToDate(jd: number): Date {
  return new Date(Math.round((jd - JD_UNIX) * 86400000))
}

/** JavaScript Date → Julian day (UTC). */
export function dateToJd(d: Date): number {
  return d.getTime() / 86400000 + JD_UNIX
}

function checkFinite(name: string, v: number, lo = -Infinity, hi = Infinity): void {
  if (!(Number.isFinite(v) && v >= lo && v <= hi)) throw new RangeError(`${name} must be a finite number in [${lo}, ${hi}], got ${v}`)
}

/** Throws a RangeError naming the field of a bad site. */
export function checkSite(site: Site): void {
  checkFinite('site.lonDeg', site.lonDeg, -180, 360)
  checkFinite('site.latDeg', site.latDeg, -90, 90)
  checkFinite('site.heightM', site.heightM, -500, 10000)
}

/** Throws a RangeError naming the field of a bad star position. */
export function checkStarPosition(star: StarPosition): void {
  checkFinite('star.raDeg', star.raDeg, 0, 360)
  checkFinite('star.decDeg', star.decDeg, -90, 90)
}

/** The astronomy-engine observer of a site (longitude folded to −180…180). */
export function observerOf(site: Site): Observer {
  checkSite(site)
  const lon = site.lonDeg > 180 ? site.lonDeg - 360 : site.lonDeg
  return new Observer(site.latDeg, lon, site.heightM)
}

function altAz(rot: ReturnType<typeof Rotation_EQJ_HOR>, vec: Vector): { alt: number; az: number } {
  const h = HorizonFromVector(RotateVector(rot, vec), '')
  return { alt: h.lat, az: h.lon }
}

/**
 * The star, Sun and Moon at `jdUtc` seen from `site` (see the module comment for conventions).
 * `observer` may be passed to avoid rebuilding it at every instant.
 */
export function skyAt(star: StarPosition, site: Site, jdUtc: number, observer: Observer = observerOf(site)): SkyState {
  checkStarPosition(star)
  checkFinite('jdUtc', jdUtc, 2000000, 3000000)
  const time = new AstroTime(jdUtc - JD_J2000)
  const rot = Rotation_EQJ_HOR(time, observer)
  const starVec = VectorFromSphere(new Spherical(star.decDeg, star.raDeg, 1), time)
  const sunVec = Equator(Body.Sun, time, observer, false, true).vec
  const moonVec = Equator(Body.Moon, time, observer, false, true).vec
  const s = altAz(rot, starVec)
  const elongation = AngleBetween(sunVec, moonVec) * Math.PI / 180
  return {
    jdUtc,
    starAltDeg: s.alt,
    starAzDeg: s.az,
    sunAltDeg: altAz(rot, sunVec).alt,
    moonAltDeg: altAz(rot, moonVec).alt,
    moonSeparationDeg: AngleBetween(starVec, moonVec),
    moonIllumination: 0.5 * (1 - Math.cos(elongation)),
  }
}

/**
 * Relative air mass at geometric altitude h (degrees), Kasten & Young 1989 (Applied Optics 28,
 * 4735, eq. 3): X = 1 / [sin h + 0.50572 (h + 6.07995°)^−1.6364]. Equal to sec z within 0.3 % above
 * 30°; finite down to the horizon (≈ 38 at 0°). Infinity below the horizon, where it has no meaning.
 */
export function airmass(altDeg: number): number {
  if (!Number.isFinite(altDeg)) throw new RangeError(`altDeg must be finite, got ${altDeg}`)
  if (altDeg < 0) return Infinity
  return 1 / (Math.sin(altDeg * Math.PI / 180) + 0.50572 * Math.pow(altDeg + 6.07995, -1.6364))
}

/** The lowest altitude (degrees) at which `airmass` stays at or below `maxAirmass` (bisection, 1e-9°). */
export function altitudeForAirmass(maxAirmass: number): number {
  if (!(Number.isFinite(maxAirmass) && maxAirmass >= 1)) throw new RangeError(`maxAirmass must be ≥ 1, got ${maxAirmass}`)
  let lo = 0, hi = 90
  if (airmass(lo) <= maxAirmass) return lo
  while (hi - lo > 1e-9) {
    const mid = 0.5 * (lo + hi)
    if (airmass(mid) > maxAirmass) lo = mid
    else hi = mid
  }
  return hi
}

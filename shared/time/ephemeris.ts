import { AstroTime, BaryState, Body, Observer, ObserverVector, RotateVector, Rotation_EQD_EQJ, Vector, type StateVector } from 'astronomy-engine'
import { J2000 } from './calendar.ts'
import type { Vec3 } from './direction.ts'
import type { Site } from './types.ts'

/** Positions relative to the solar-system barycentre (AU, J2000 mean equator ≈ ICRS to 0.02″). */
export interface ObserverPosition { observer: Vec3; sun: Vec3 }
/** Observer and Sun positions at a TT Julian date. */
export type Ephemeris = (jdTt: number) => ObserverPosition

function astroTime(jdTt: number): AstroTime {
  return AstroTime.FromTerrestrialTime(jdTt - J2000)
}

/** astronomy-engine's observer (latitude first; height in metres above the ellipsoid). */
function observerOf(site: Site): Observer {
  return new Observer(site.latDeg, site.lonDeg, site.heightM)
}

/**
 * The readable reference: the Earth's and the Sun's barycentric positions from astronomy-engine
 * (`BaryState`; VSOP87 Earth, the Sun's wobble from the giant planets) plus the site's geocentric
 * position (`ObserverVector`, J2000 equator) evaluated at every time.
 */
export function directEphemeris(site: Site): Ephemeris {
  const obs = observerOf(site)
  return (jdTt) => {
    const t = astroTime(jdTt)
    const earth = BaryState(Body.Earth, t), sun = BaryState(Body.Sun, t), geo = ObserverVector(t, obs, false)
    return { observer: [earth.x + geo.x, earth.y + geo.y, earth.z + geo.z], sun: [sun.x, sun.y, sun.z] }
  }
}

/** Cubic Hermite interpolation on [0, h] from values and derivatives (per day) at both ends; s in [0, 1]. */
function hermite(p0: number, v0: number, p1: number, v1: number, s: number, h: number): number {
  const s2 = s * s, s3 = s2 * s
  return (2 * s3 - 3 * s2 + 1) * p0 + (s3 - 2 * s2 + s) * h * v0 + (-2 * s3 + 3 * s2) * p1 + (s3 - s2) * h * v1
}

/** Node spacing (days) for the Earth (yearly orbit, monthly wobble about the Earth–Moon barycentre) and the Sun (giant planets). */
const EARTH_STEP = 3
const SUN_STEP = 16

/** One body's barycentric state on a grid of TT days, evaluated lazily and interpolated between nodes. */
function bodyTrack(body: Body, step: number): (jdTt: number) => Vec3 {
  const nodes = new Map<number, StateVector>()
  const node = (k: number): StateVector => {
    let n = nodes.get(k)
    if (!n) { n = BaryState(body, astroTime(J2000 + k * step)); nodes.set(k, n) }
    return n
  }
  return (jdTt) => {
    const x = (jdTt - J2000) / step
    const k = Math.floor(x), s = x - k
    const a = node(k), b = node(k + 1)
    return [
      hermite(a.x, a.vx, b.x, b.vx, s, step), hermite(a.y, a.vy, b.y, b.vy, s, step), hermite(a.z, a.vz, b.z, b.vz, s, step),
    ]
  }
}

/** Earth rotation angle rate, radians per day (IAU 2000 Resolution B1.8: 2π × 1.00273781191135448). */
const EARTH_ROTATION = 2 * Math.PI * 1.00273781191135448

/**
 * The site's geocentric position (J2000 equator) from one evaluation per whole TT day: the position
 * at the day's start turned about the celestial pole of that moment by the Earth rotation angle
 * since then (Rodrigues' formula). Precession and nutation move the pole by under 1″ in a day:
 * ≤ 30 m at the site, 0.1 µs of light time.
 */
function siteTrack(obs: Observer): (jdTt: number) => Vec3 {
  const days = new Map<number, { p: Vec3; k: Vec3 }>()
  return (jdTt) => {
    const d = Math.floor(jdTt - J2000)
    let n = days.get(d)
    if (!n) {
      const t = astroTime(J2000 + d)
      const geo = ObserverVector(t, obs, false)
      const pole = RotateVector(Rotation_EQD_EQJ(t), new Vector(0, 0, 1, t))
      n = { p: [geo.x, geo.y, geo.z], k: [pole.x, pole.y, pole.z] }
      days.set(d, n)
    }
    const th = EARTH_ROTATION * (jdTt - J2000 - d)
    const c = Math.cos(th), sn = Math.sin(th)
    const { p, k } = n
    const kxp: Vec3 = [k[1] * p[2] - k[2] * p[1], k[2] * p[0] - k[0] * p[2], k[0] * p[1] - k[1] * p[0]]
    const kdp = k[0] * p[0] + k[1] * p[1] + k[2] * p[2]
    return [0, 1, 2].map((i) => p[i]! * c + kxp[i]! * sn + k[i]! * kdp * (1 - c)) as Vec3
  }
}

/**
 * The fast path: the Earth's barycentric state computed once every 3 TT days that the data touch
 * (the Sun's every 16) and interpolated by cubic Hermite polynomials (positions and velocities at
 * both ends). Interpolation error ≤ h⁴/384 · max|x⁗|: a few km for the Earth's monthly motion about
 * the Earth–Moon barycentre (4 700 km, 27.3 d) and its yearly orbit (6.6 km measured over 1995–2030,
 * 22 µs of light time, against the ephemeris's own few thousand km); far less for the Sun. The site's geocentric position comes from `siteTrack`. Tested against
 * `directEphemeris`.
 */
export function interpolatedEphemeris(site: Site): Ephemeris {
  const earth = bodyTrack(Body.Earth, EARTH_STEP), sun = bodyTrack(Body.Sun, SUN_STEP), geo = siteTrack(observerOf(site))
  return (jdTt) => {
    const e = earth(jdTt), g = geo(jdTt)
    return { observer: [e[0] + g[0], e[1] + g[1], e[2] + g[2]], sun: sun(jdTt) }
  }
}

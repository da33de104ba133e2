import { AstroTime, BaryState, Body, Observer, ObserverVector, type StateVector } from 'astronomy-engine'
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

interface Node { earth: StateVector; sun: StateVector }

/** Cubic Hermite interpolation on a unit interval from values and derivatives (per day) at both ends. */
function hermite(p0: number, v0: number, p1: number, v1: number, s: number): number {
  const s2 = s * s, s3 = s2 * s
  return (2 * s3 - 3 * s2 + 1) * p0 + (s3 - 2 * s2 + s) * v0 + (-2 * s3 + 3 * s2) * p1 + (s3 - s2) * v1
}

/**
 * The fast path: the Earth's and the Sun's barycentric states computed once per whole TT day that
 * the data touch and interpolated by cubic Hermite polynomials (positions and velocities at both
 * ends). Interpolation error ≤ h⁴/384 · max|x⁗|: about 30 m for the yearly orbit and for the Earth's
 * monthly motion about the Earth–Moon barycentre (4 700 km, 27.3 d), i.e. 0.1 µs of light time.
 * The site's geocentric position is cheap and evaluated at every time. Tested against `directEphemeris`.
 */
export function interpolatedEphemeris(site: Site): Ephemeris {
  const obs = observerOf(site)
  const nodes = new Map<number, Node>()
  const node = (day: number): Node => {
    let n = nodes.get(day)
    if (!n) {
      const t = astroTime(J2000 + day)
      n = { earth: BaryState(Body.Earth, t), sun: BaryState(Body.Sun, t) }
      nodes.set(day, n)
    }
    return n
  }
  return (jdTt) => {
    const x = jdTt - J2000
    const day = Math.floor(x), s = x - day
    const a = node(day), b = node(day + 1)
    const at = (p: 'x' | 'y' | 'z', v: 'vx' | 'vy' | 'vz', which: 'earth' | 'sun') =>
      hermite(a[which][p], a[which][v], b[which][p], b[which][v], s)
    const geo = ObserverVector(astroTime(jdTt), obs, false)
    return {
      observer: [at('x', 'vx', 'earth') + geo.x, at('y', 'vy', 'earth') + geo.y, at('z', 'vz', 'earth') + geo.z],
      sun: [at('x', 'vx', 'sun'), at('y', 'vy', 'sun'), at('z', 'vz', 'sun')],
    }
  }
}

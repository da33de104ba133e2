/**
 * The Keplerian radial-velocity model (Murray & Dermott 1999, *Solar System Dynamics*, §2.4–2.5):
 *
 *   v(t) = K [cos(ν(t) + ω) + e cos ω]
 *
 * with ν the true anomaly of the star's orbit about the barycentre, ω the argument of periastron
 * of the STAR's orbit (the planet's is ω + π), positive velocities receding. Times in days, K in m/s,
 * angles in radians here (degrees only at the API/CLI edge).
 */
import { keplerUnchecked, keplerSinCosArray, eccentricFromTrue, wrapPi } from './kepler.ts'

// Local reference: module-namespace bindings can cost a getter call per access under some loaders.
const sinCosE = keplerSinCosArray

/** Scratch for mean anomalies and sin E, cos E of one Keplerian; grown (never shrunk) to the longest series. */
let bufM = new Float64Array(256), bufS = new Float64Array(256), bufC = new Float64Array(256)

const TWO_PI = 2 * Math.PI

/** One Keplerian signal. `omega` in radians (star's orbit), `tp` time of periastron (days). */
export interface Keplerian {
  period: number
  K: number
  e: number
  omega: number
  tp: number
}

function checkOrbit(o: Keplerian, label = 'orbit'): void {
  if (!(o.period > 0)) throw new RangeError(`${label}.period must be > 0, got ${o.period}`)
  if (!(o.e >= 0 && o.e < 1)) throw new RangeError(`${label}.e must be in [0, 1), got ${o.e}`)
  if (!Number.isFinite(o.K)) throw new RangeError(`${label}.K must be finite`)
  if (!Number.isFinite(o.omega)) throw new RangeError(`${label}.omega must be finite`)
  if (!Number.isFinite(o.tp)) throw new RangeError(`${label}.tp must be finite`)
}

/**
 * Adds the velocity of one Keplerian at times `t` into `out` (out[i] += v(t[i])). No allocation.
 * cos ν and sin ν come from E directly (Murray & Dermott 1999, eqs. 2.43–2.44), avoiding atan.
 */
export function addKeplerian(t: Float64Array, o: Keplerian, out: Float64Array): Float64Array {
  const { period, K, e, omega, tp } = o
  const n = TWO_PI / period
  const cw = Math.cos(omega), sw = Math.sin(omega)
  const ecw = e * cw
  const sq = Math.sqrt(1 - e * e)
  if (e === 0) {
    for (let i = 0; i < t.length; i++) {
      const M = n * (t[i] - tp)
      out[i] += K * Math.cos(M + omega)
    }
    return out
  }
  // v = K [cos ν cos ω − sin ν sin ω + e cos ω] with cos ν = (cos E − e)/(1 − e cos E) and
  // sin ν = √(1−e²) sin E/(1 − e cos E): one division per time
  const Kecw = K * ecw, Kcw = K * cw, Ksqsw = K * sq * sw
  const len = t.length
  if (bufM.length < len) { bufM = new Float64Array(len); bufS = new Float64Array(len); bufC = new Float64Array(len) }
  const Ms = bufM, sinE = bufS, cosE = bufC
  for (let i = 0; i < len; i++) Ms[i] = n * (t[i] - tp)
  sinCosE(Ms, len, e, sinE, cosE)
  for (let i = 0; i < len; i++) {
    const cE = cosE[i]
    out[i] += ((cE - e) * Kcw - sinE[i] * Ksqsw) / (1 - e * cE) + Kecw
  }
  return out
}

/** Radial velocity (m/s) of the sum of Keplerians at times t; writes into `out` if given. */
export function radialVelocity(t: Float64Array, orbits: readonly Keplerian[], out?: Float64Array): Float64Array {
  const v = out ?? new Float64Array(t.length)
  if (v.length < t.length) throw new RangeError('out must be at least as long as t')
  v.fill(0, 0, t.length)
  orbits.forEach((o, k) => { checkOrbit(o, `orbits[${k}]`); addKeplerian(t, o, v) })
  return v
}

/** Velocity of one Keplerian at a single time (convenience; the array form is faster). */
export function radialVelocityAt(time: number, o: Keplerian): number {
  checkOrbit(o)
  const E = keplerUnchecked(TWO_PI * (time - o.tp) / o.period, o.e)
  const h = 0.5 * E
  const nu = 2 * Math.atan2(Math.sqrt(1 + o.e) * Math.sin(h), Math.sqrt(1 - o.e) * Math.cos(h))
  return o.K * (Math.cos(nu + o.omega) + o.e * Math.cos(o.omega))
}

/**
 * Mean anomaly at inferior conjunction of the planet (the planet in front of the star, a transit
 * if the orbit is edge-on). There the star's true anomaly satisfies ν + ω = π/2 (common practice
 * for the star's ω in v = K[cos(ν+ω) + e cos ω]; the star's velocity then falls through its mean).
 */
function conjunctionMeanAnomaly(e: number, omega: number): number {
  const nu = wrapPi(Math.PI / 2 - omega)
  const E = eccentricFromTrue(nu, e)
  return E - e * Math.sin(E)
}

/** Time of inferior conjunction Tc from the time of periastron Tp (the Tc nearest after-or-at Tp's revolution). */
export function tpToTc(tp: number, period: number, e: number, omega: number): number {
  if (!(period > 0)) throw new RangeError(`period must be > 0, got ${period}`)
  if (!(e >= 0 && e < 1)) throw new RangeError(`e must be in [0, 1), got ${e}`)
  return tp + period * conjunctionMeanAnomaly(e, omega) / TWO_PI
}

/** Time of periastron Tp from the time of inferior conjunction Tc (inverse of `tpToTc`). */
export function tcToTp(tc: number, period: number, e: number, omega: number): number {
  if (!(period > 0)) throw new RangeError(`period must be > 0, got ${period}`)
  if (!(e >= 0 && e < 1)) throw new RangeError(`e must be in [0, 1), got ${e}`)
  return tc - period * conjunctionMeanAnomaly(e, omega) / TWO_PI
}

/** Shifts a reference time by whole periods to the one nearest `epoch`. */
export function nearestEpoch(time: number, period: number, epoch: number): number {
  return time + period * Math.round((epoch - time) / period)
}

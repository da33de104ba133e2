/**
 * Quantities derived from a Keplerian orbit and the stellar mass: minimum mass M sin i from the
 * full mass function (no m ≪ M★ assumption) and the semi-major axis from Kepler's third law with
 * the total mass M★ + m. Masses are carried as GM (IAU 2015 Resolution B3 nominal values), so the
 * poorly known G never enters.
 */
import { GM_SUN, GM_JUPITER, GM_EARTH, AU, DAY } from './constants.ts'

export interface MinimumMass {
  /** M sin i in nominal Jupiter masses. */
  msiniMjup: number
  /** M sin i in nominal Earth masses. */
  msiniMearth: number
  /** M sin i in solar masses. */
  msiniMsun: number
}

function checkPositive(name: string, v: number): void {
  if (!(v > 0) || !Number.isFinite(v)) throw new RangeError(`${name} must be a positive finite number, got ${v}`)
}

/**
 * Mass function f(m) = (m sin i)³ / (M★ + m sin i)² = P K³ (1 − e²)^{3/2} / (2π G), solved for
 * m sin i by fixed-point iteration x ← [f (M★ + x)²]^{1/3}, a contraction (slope < 2/3) for any
 * companion mass. Inputs: P (days), K (m/s), e, M★ (solar masses).
 */
export function minimumMass(period: number, K: number, e: number, starMass: number): MinimumMass {
  checkPositive('period', period)
  checkPositive('starMass', starMass)
  if (!(K >= 0)) throw new RangeError(`K must be ≥ 0, got ${K}`)
  if (!(e >= 0 && e < 1)) throw new RangeError(`e must be in [0, 1), got ${e}`)
  const f = period * DAY * K * K * K * Math.pow(1 - e * e, 1.5) / (2 * Math.PI) // G·f(m), m³/s²
  const gms = starMass * GM_SUN
  let x = Math.cbrt(f * gms * gms)
  for (let i = 0; i < 200; i++) {
    const next = Math.cbrt(f * (gms + x) * (gms + x))
    if (Math.abs(next - x) <= 1e-15 * next) { x = next; break }
    x = next
  }
  return { msiniMjup: x / GM_JUPITER, msiniMearth: x / GM_EARTH, msiniMsun: x / GM_SUN }
}

/**
 * Semi-amplitude K (m/s) of a companion of minimum mass `msiniMjup` (Jupiter masses) on period P
 * (days) and eccentricity e around a star of mass M★ (solar masses): the mass function read the
 * other way, K = [2π G / P]^{1/3} m sin i (M★ + m sin i)^{−2/3} (1 − e²)^{−1/2}.
 */
export function semiAmplitude(period: number, msiniMjup: number, e: number, starMass: number): number {
  checkPositive('period', period)
  checkPositive('starMass', starMass)
  if (!(msiniMjup >= 0)) throw new RangeError(`msiniMjup must be ≥ 0, got ${msiniMjup}`)
  if (!(e >= 0 && e < 1)) throw new RangeError(`e must be in [0, 1), got ${e}`)
  const gm = msiniMjup * GM_JUPITER
  const gms = starMass * GM_SUN
  return Math.cbrt(2 * Math.PI / (period * DAY)) * gm / Math.pow(gms + gm, 2 / 3) / Math.sqrt(1 - e * e)
}

/**
 * Semi-major axis (au) of the relative orbit from Kepler's third law, a³ = G(M★ + m) P² / 4π².
 * `mplanetMsun` is the companion's mass in solar masses (use M sin i for a minimum-mass estimate).
 */
export function semiMajorAxis(period: number, starMass: number, mplanetMsun = 0): number {
  checkPositive('period', period)
  checkPositive('starMass', starMass)
  if (!(mplanetMsun >= 0)) throw new RangeError(`mplanetMsun must be ≥ 0, got ${mplanetMsun}`)
  const p = period * DAY
  return Math.cbrt(GM_SUN * (starMass + mplanetMsun) * p * p / (4 * Math.PI * Math.PI)) / AU
}

export interface DerivedPlanet extends MinimumMass {
  aAu: number
  /** 1σ errors (stellar-mass error combined in quadrature with the orbit's). */
  uncertainty: { msiniMjup: number; msiniMearth: number; aAu: number }
}

/**
 * M sin i and a with first-order error propagation: orbit covariance of (P, K, e) (3×3 row-major,
 * optional) plus an independent stellar-mass error, via central-difference partial derivatives.
 */
export function derivedPlanet(
  orbit: { period: number; K: number; e: number },
  starMass: number,
  opts: { starMassErr?: number; covariance?: ArrayLike<number> } = {},
): DerivedPlanet {
  const { period, K, e } = orbit
  const starMassErr = opts.starMassErr ?? 0
  if (!(starMassErr >= 0)) throw new RangeError(`starMassErr must be ≥ 0, got ${starMassErr}`)
  const evalAt = (p: number, k: number, ee: number, ms: number): [number, number] => {
    const m = minimumMass(p, Math.max(k, 0), Math.min(Math.max(ee, 0), 0.999999), ms)
    return [m.msiniMjup, semiMajorAxis(p, ms, m.msiniMsun)]
  }
  const base = minimumMass(period, K, e, starMass)
  const aAu = semiMajorAxis(period, starMass, base.msiniMsun)
  const x = [period, K, e, starMass]
  const grads: number[][] = [] // grads[j] = ∂(msini, a)/∂x_j
  for (let j = 0; j < 4; j++) {
    const h = j === 2 ? Math.min(1e-6, Math.max(1e-9, (1 - e) / 10)) : 1e-6 * Math.abs(x[j])
    const up = x.slice(), dn = x.slice()
    up[j] += h; dn[j] -= h
    if (j === 2 && dn[j] < 0) dn[j] = 0
    const fu = evalAt(up[0], up[1], up[2], up[3]), fd = evalAt(dn[0], dn[1], dn[2], dn[3])
    grads.push([(fu[0] - fd[0]) / (up[j] - dn[j]), (fu[1] - fd[1]) / (up[j] - dn[j])])
  }
  const varOut = [0, 0]
  for (let q = 0; q < 2; q++) {
    if (opts.covariance) {
      const c = opts.covariance
      for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) varOut[q] += grads[i][q] * grads[j][q] * c[i * 3 + j]
    }
    varOut[q] += grads[3][q] * grads[3][q] * starMassErr * starMassErr
  }
  const sm = Math.sqrt(Math.max(varOut[0], 0))
  return {
    ...base,
    aAu,
    uncertainty: { msiniMjup: sm, msiniMearth: sm * GM_JUPITER / GM_EARTH, aAu: Math.sqrt(Math.max(varOut[1], 0)) },
  }
}

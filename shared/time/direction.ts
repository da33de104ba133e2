import { DAYS_PER_JULIAN_YEAR, J2000 } from './calendar.ts'
import type { Target } from './types.ts'

const MAS = Math.PI / (180 * 3600 * 1000)
const DEG = Math.PI / 180

export type Vec3 = [number, number, number]

/** Checks a target's fields; misuse throws naming the field. */
export function checkTarget(target: Target): void {
  const { raDeg, decDeg, pmRaMasYr = 0, pmDecMasYr = 0, epochJd = J2000 } = target
  if (!Number.isFinite(raDeg) || raDeg < 0 || raDeg >= 360) throw new RangeError(`raDeg must be in [0, 360), got ${raDeg}`)
  if (!Number.isFinite(decDeg) || Math.abs(decDeg) > 90) throw new RangeError(`decDeg must be in [-90, 90], got ${decDeg}`)
  if (!Number.isFinite(pmRaMasYr) || Math.abs(pmRaMasYr) > 20000) throw new RangeError(`pmRaMasYr must be within ±20000 mas/yr, got ${pmRaMasYr}`)
  if (!Number.isFinite(pmDecMasYr) || Math.abs(pmDecMasYr) > 20000) throw new RangeError(`pmDecMasYr must be within ±20000 mas/yr, got ${pmDecMasYr}`)
  if (!Number.isFinite(epochJd) || epochJd < 2378496.5 || epochJd > 2524593.5) throw new RangeError(`epochJd must be a Julian date in 1800–2200, got ${epochJd}`)
}

/**
 * Unit vector (ICRS, equatorial) towards the star at TDB Julian date `jd`, the catalogue position
 * moved along the tangent plane by the proper motion: n(t) = normalise(n₀ + Δt (μα* p̂ + μδ q̂)),
 * p̂ and q̂ the local east and north unit vectors (the linear model of the Hipparcos catalogue,
 * ESA SP-1200 vol. 1 §1.5.5, without parallax and radial velocity — a few mas over decades for
 * nearby stars, i.e. microseconds of light time).
 */
export function starDirection(target: Target, jd: number): Vec3 {
  const a = target.raDeg * DEG, d = target.decDeg * DEG
  const ca = Math.cos(a), sa = Math.sin(a), cd = Math.cos(d), sd = Math.sin(d)
  const pmRa = (target.pmRaMasYr ?? 0) * MAS, pmDec = (target.pmDecMasYr ?? 0) * MAS
  const years = (jd - (target.epochJd ?? J2000)) / DAYS_PER_JULIAN_YEAR
  // n₀, east p̂ = (−sin α, cos α, 0), north q̂ = (−sin δ cos α, −sin δ sin α, cos δ)
  const x = cd * ca + years * (-sa * pmRa - sd * ca * pmDec)
  const y = cd * sa + years * (ca * pmRa - sd * sa * pmDec)
  const z = sd + years * (cd * pmDec)
  const n = Math.hypot(x, y, z)
  return [x / n, y / n, z / n]
}

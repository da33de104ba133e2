/**
 * Kepler's equation M = E − e sin E and the true anomaly, for elliptic orbits 0 ≤ e < 1.
 *
 * The solver takes Markley's (1995, Celest. Mech. 63, 101) cubic starting value and one
 * high-order correction of his form, which together leave |E − e sin E − M| below 3e-15; a guarded Newton
 * step (Danby 1988, *Fundamentals of Celestial Mechanics*) then runs only if the residual
 * still exceeds the tolerance, so the result always meets |E − e sin E − M| < 1e-12.
 * Relations between anomalies follow Murray & Dermott 1999, *Solar System Dynamics*, §2.4.
 */

const TWO_PI = 2 * Math.PI
const PI2 = Math.PI * Math.PI
/** Residual tolerance on Kepler's equation, radians. */
export const KEPLER_TOLERANCE = 1e-12

/** Reduces an angle to [−π, π). */
export function wrapPi(x: number): number {
  if (x >= -Math.PI && x < Math.PI) return x
  return x - TWO_PI * Math.floor((x + Math.PI) / TWO_PI)
}

/**
 * Eccentric anomaly E (radians, on the same revolution as M) for mean anomaly M and
 * eccentricity e. Markley 1995 starter + fifth-order correction, Newton fallback.
 * Throws a RangeError for e outside [0, 1).
 */
export function solveKepler(M: number, e: number): number {
  if (!(e >= 0 && e < 1)) throw new RangeError(`e must be in [0, 1), got ${e}`)
  if (!Number.isFinite(M)) throw new RangeError(`M must be finite, got ${M}`)
  const m = wrapPi(M)
  return M - m + keplerReduced(m, e)
}

/** Kepler's equation for M already in [−π, π). No argument checks (hot path). */
function keplerReduced(mSigned: number, e: number): number {
  if (e === 0) { SINCOS.sin = Math.sin(mSigned); SINCOS.cos = Math.cos(mSigned); return mSigned }
  return keplerCore(mSigned, e, ALPHA0, ALPHA1 / (1 + e))
}

const ALPHA0 = 3 * PI2 / (PI2 - 6)
const HALF_PI = 0.5 * Math.PI
/**
 * sin E and cos E of the last solve (E on the reduced revolution), left by the solver so the RV
 * model need not recompute them. Internal to shared/rv; not re-exported.
 */
export const SINCOS = { sin: 0, cos: 1 }
const ALPHA1 = 1.6 * Math.PI / (PI2 - 6)

/**
 * Markley 1995 for M in [−π, π), e > 0; `a1 = 1.6π / ((1 + e)(π² − 6))` precomputed by the caller.
 * Markley's eqs. (20)–(22) give a cubic in E whose real root approximates the solution; eqs.
 * (24)–(29) apply one fifth-order correction.
 */
function keplerCore(mSigned: number, e: number, a0: number, a1: number): number {
  const sign = mSigned < 0 ? -1 : 1
  const M = mSigned * sign
  const alpha = a0 + a1 * (Math.PI - M)
  const d = 3 * (1 - e) + alpha * e
  const q = 2 * alpha * d * (1 - e) - M * M
  const r = 3 * alpha * d * (d - 1 + e) * M + M * M * M
  const cb = Math.cbrt(Math.abs(r) + Math.sqrt(q * q * q + r * r))
  const w = cb * cb
  const D = w * w + w * q + q * q
  let E = (2 * r * w + M * D) / (D * d) // = (2rw/D + M)/d with one division
  // sin E and cos E from one tangent of a half angle in [0, π/4] (t = tan h, sin = 2t/(1+t²),
  // cos = (1−t²)/(1+t²)): one transcendental call instead of two, accurate to a few ulp.
  const upper = E > HALF_PI
  const tq = Math.tan(upper ? 0.5 * (Math.PI - E) : 0.5 * E)
  const tt = tq * tq
  const inv = 1 / (1 + tt)
  const sE = 2 * tq * inv
  const cE = upper ? (tt - 1) * inv : (1 - tt) * inv
  let se = e * sE
  const ce = e * cE
  let f0 = E - se - M
  const f1 = 1 - ce
  const f2 = se
  const f3 = ce
  // Markley's nested corrections (his δ3 → δ4 → δ5); we stop one level early, feeding the Halley
  // step δ3 into the fifth-order form: the residual stays below 3e-15 over 0 ≤ e ≤ 0.99 (checked in
  // the tests), and the verification below falls back to Newton otherwise.
  const d3 = -f0 * f1 / (f1 * f1 - 0.5 * f0 * f2) // Halley: −f0/(f1 − ½ f0 f2/f1), one division
  const d5 = -f0 / (f1 + 0.5 * d3 * f2 + d3 * d3 * f3 / 6 - d3 * d3 * d3 * f2 / 24)
  E += d5
  // sin and cos of E + d5 from the angle-sum rule with short series in the small d5
  // (|d5| < 1e-2 whenever the starter is sound); they also serve the caller (SINCOS).
  const d52 = d5 * d5
  const cd = 1 - d52 * (0.5 - d52 / 24), sd = d5 * (1 - d52 * (1 / 6 - d52 / 120))
  let sinE = sE * cd + cE * sd
  let cosE = cE * cd - sE * sd
  se = e * sinE
  f0 = E - se - M
  if (Math.abs(f0) >= KEPLER_TOLERANCE || Math.abs(d5) > 1e-2) {
    // Newton (Danby 1988) in the rare case the correction left a residual above tolerance.
    f0 = E - e * Math.sin(E) - M
    for (let it = 0; it < 8 && Math.abs(f0) >= KEPLER_TOLERANCE; it++) {
      E -= f0 / (1 - e * Math.cos(E))
      f0 = E - e * Math.sin(E) - M
    }
    sinE = Math.sin(E); cosE = Math.cos(E)
  }
  SINCOS.sin = sign * sinE
  SINCOS.cos = cosE
  return sign * E
}

/**
 * Solves Kepler's equation for every mean anomaly in `M`, writing E into `out`
 * (which may be `M` itself). No allocation. Returns `out`.
 */
export function solveKeplerArray(M: Float64Array, e: number, out: Float64Array): Float64Array {
  if (!(e >= 0 && e < 1)) throw new RangeError(`e must be in [0, 1), got ${e}`)
  if (out.length < M.length) throw new RangeError('out must be at least as long as M')
  if (e === 0) { if (out !== M) out.set(M); return out }
  const a1 = ALPHA1 / (1 + e)
  for (let i = 0; i < M.length; i++) {
    const Mi = M[i]
    const m = Mi >= -Math.PI && Mi < Math.PI ? Mi : Mi - TWO_PI * Math.floor((Mi + Math.PI) / TWO_PI)
    out[i] = Mi - m + keplerCore(m, e, ALPHA0, a1)
  }
  return out
}

/** True anomaly ν (radians, in (−π, π]) from the eccentric anomaly E — Murray & Dermott 1999, eq. 2.46. */
export function trueAnomaly(E: number, e: number): number {
  if (!(e >= 0 && e < 1)) throw new RangeError(`e must be in [0, 1), got ${e}`)
  const h = 0.5 * E
  return 2 * Math.atan2(Math.sqrt(1 + e) * Math.sin(h), Math.sqrt(1 - e) * Math.cos(h))
}

/** Eccentric anomaly E from the true anomaly ν (inverse of `trueAnomaly`, same revolution branch). */
export function eccentricFromTrue(nu: number, e: number): number {
  if (!(e >= 0 && e < 1)) throw new RangeError(`e must be in [0, 1), got ${e}`)
  const h = 0.5 * nu
  return 2 * Math.atan2(Math.sqrt(1 - e) * Math.sin(h), Math.sqrt(1 + e) * Math.cos(h))
}

/** True anomalies for every mean anomaly in `M`, written into `out` (may alias `M`). No allocation. */
export function trueAnomalyArray(M: Float64Array, e: number, out: Float64Array): Float64Array {
  if (!(e >= 0 && e < 1)) throw new RangeError(`e must be in [0, 1), got ${e}`)
  if (out.length < M.length) throw new RangeError('out must be at least as long as M')
  const a = Math.sqrt(1 + e), b = Math.sqrt(1 - e)
  for (let i = 0; i < M.length; i++) {
    const E = keplerReduced(wrapPi(M[i]), e)
    const h = 0.5 * E
    out[i] = 2 * Math.atan2(a * Math.sin(h), b * Math.cos(h))
  }
  return out
}

/** Internal fast path for the model: E of M in any range, no checks. */
export function keplerUnchecked(M: number, e: number): number {
  return keplerReduced(wrapPi(M), e)
}

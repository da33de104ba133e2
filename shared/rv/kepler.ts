/**
 * Kepler's equation M = E − e sin E and the true anomaly, for elliptic orbits 0 ≤ e < 1.
 *
 * The solver takes Markley's (1995, Celest. Mech. 63, 101) cubic starting value and one
 * high-order correction of his form, which together leave |E − e sin E − M| below 3e-15; a guarded Newton
 * step (Danby 1988, *Fundamentals of Celestial Mechanics*) then runs only if the residual
 * still exceeds the tolerance, so the result always meets |E − e sin E − M| < 1e-12.
 * Many M at one e (the array forms and the RV model) go through a per-e table instead (see
 * `solveTabled`): no transcendental call per solve, the same residual check and fallback.
 * Relations between anomalies follow Murray & Dermott 1999, *Solar System Dynamics*, §2.4.
 */

const TWO_PI = 2 * Math.PI
const PI2 = Math.PI * Math.PI
const INV_TWO_PI = 1 / TWO_PI
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

// ---- Array solver: a per-e table of the equation around fixed nodes in E ----------------------
//
// For one e and many M (a model evaluated at all observation times), E ∈ [0, π] is cut into
// TABLE_NODES equal intervals of width TABLE_H. sin and cos at the interval boundaries and centres
// E_c do not depend on e and are computed once; per e the table holds the boundaries' mean
// anomalies M_b = E_b − e sin E_b (to find the interval of an M), and at each centre the Taylor
// coefficients of f(δ) = E_c + δ − e sin(E_c + δ) − M in δ = E − E_c (common practice for
// table-driven solvers of one equation at many points). Within an interval |δ| ≤ TABLE_H/2, so sin δ
// and cos δ are short Taylor series and a solve needs no transcendental call.

const TABLE_NODES = 64
const TABLE_H = Math.PI / TABLE_NODES
/** Uniform bins in M over [0, π] pointing at the first interval that can hold an M of the bin. */
const TABLE_BINS = 128
const BIN_SCALE = TABLE_BINS / Math.PI
const SIN_B = new Float64Array(TABLE_NODES + 1)
const SIN_C = new Float64Array(TABLE_NODES), COS_C = new Float64Array(TABLE_NODES)
for (let j = 0; j <= TABLE_NODES; j++) SIN_B[j] = Math.sin(j * TABLE_H)
for (let j = 0; j < TABLE_NODES; j++) { SIN_C[j] = Math.sin((j + 0.5) * TABLE_H); COS_C[j] = Math.cos((j + 0.5) * TABLE_H) }
/** Per-e table: M at the boundaries (last one +∞ as a sentinel), M at the centres, e sin E_c, e cos E_c, 1/f′(0), and the reversion coefficients p = f″/(2f′), r = 2p² − f‴/(6f′). */
const T_MB = new Float64Array(TABLE_NODES + 1)
const T_MC = new Float64Array(TABLE_NODES)
const T_ES = new Float64Array(TABLE_NODES), T_EC = new Float64Array(TABLE_NODES)
const T_INV = new Float64Array(TABLE_NODES), T_P = new Float64Array(TABLE_NODES), T_R = new Float64Array(TABLE_NODES), T_W = new Float64Array(TABLE_NODES)
const T_BIN = new Int32Array(TABLE_BINS + 1)
let tableE = NaN

/** Fills the per-e table (no-op when it already holds `e`). 0 < e < 1, not checked. */
function prepareTable(e: number): void {
  if (e === tableE) return
  for (let j = 0; j <= TABLE_NODES; j++) T_MB[j] = j * TABLE_H - e * SIN_B[j]
  T_MB[TABLE_NODES] = Infinity
  for (let j = 0; j < TABLE_NODES; j++) {
    const es = e * SIN_C[j], ec = e * COS_C[j]
    const inv = 1 / (1 - ec)
    const p = 0.5 * es * inv
    T_MC[j] = (j + 0.5) * TABLE_H - es
    T_ES[j] = es; T_EC[j] = ec; T_INV[j] = inv; T_P[j] = p
    const q = ec * inv / 6
    T_R[j] = 2 * p * p - q
    T_W[j] = p * (5 * q - 5 * p * p) + es * inv / 24
  }
  let j = 0
  for (let b = 0; b <= TABLE_BINS; b++) {
    const m = b / BIN_SCALE
    while (T_MB[j + 1] <= m) j++
    T_BIN[b] = j
  }
  tableE = e
}

/** Largest correction step for which the second-order angle-sum update of sin d, cos d is exact to 1e-16. */
const STEP_MAX = 2e-5

/**
 * Solves Kepler's equation for M[0..n) at one e from the table of `prepareTable(e)`, writing E (on
 * M's revolution) into `outE` and sin E, cos E into `outSin`, `outCos`, each when given (any may
 * alias `M`). Per solve: the interval of |M| reduced to [0, π] from the bins, a quartic series
 * reversion of f about the interval's centre as the starter, one Halley step (Danby 1988, §6.6),
 * sin d and cos d by Taylor series updated by the angle-sum rule. The residual |f| is then
 * evaluated; if it is not below KEPLER_TOLERANCE (or the step was too large for the series), that
 * point goes to `keplerCore` (Markley 1995 with the Newton fallback). Over 0 ≤ e ≤ 0.99 the residual
 * stays below 1e-16 and no point falls back (tests/shared/rv/kepler-table.spec.ts).
 *
 * The solve is written out inside the loop on purpose: a per-point call would box its double
 * argument and result on the heap.
 */
function solveTabled(M: Float64Array, n: number, e: number, outE: Float64Array | null, outSin: Float64Array | null, outCos: Float64Array | null): void {
  for (let i = 0; i < n; i++) {
    const Mi = M[i]
    const mSigned = Mi - TWO_PI * Math.floor(Mi * INV_TWO_PI + 0.5) // in [−π, π] up to rounding
    const sg = Math.sign(mSigned)
    const m = Math.abs(mSigned)
    let j = T_BIN[(m * BIN_SCALE) | 0]
    while (T_MB[j + 1] <= m) j++
    const es = T_ES[j], ec = T_EC[j]
    const dM = m - T_MC[j]
    const x = dM * T_INV[j]
    let d = x * (1 - x * (T_P[j] - x * (T_R[j] + x * T_W[j])))
    // sin d and 1 − cos d by Taylor series: |d| ≲ TABLE_H/2 = 0.0245, truncation below 1e-20
    const d2 = d * d
    let sd = d * (1 - d2 * (1 / 6 - d2 * (1 / 120 - d2 / 5040)))
    let vd = d2 * (0.5 - d2 * (1 / 24 - d2 * (1 / 720 - d2 / 40320)))
    const f0 = d - dM + es * vd - ec * sd
    const f1 = 1 + es * sd - ec * (1 - vd)
    const f2 = es * (1 - vd) + ec * sd
    const step = f0 * f1 / (f1 * f1 - 0.5 * f0 * f2) // Halley: f0/(f1 − ½ f0 f2/f1), one division
    d -= step
    // sin and 1 − cos of d − step by the angle-sum rule, to second order in the small step
    const cd0 = 1 - vd, h2 = 0.5 * step * step, sd0 = sd
    sd = sd0 - step * cd0 - h2 * sd0
    vd = vd - step * sd0 + h2 * cd0
    const res = d - dM + es * vd - ec * sd
    let E: number, sinE: number, cosE: number
    if (Math.abs(res) < KEPLER_TOLERANCE && Math.abs(d) < TABLE_H && Math.abs(step) < STEP_MAX) {
      const s = SIN_C[j], c = COS_C[j], cd = 1 - vd
      E = (j + 0.5) * TABLE_H + d
      sinE = s * cd + c * sd
      cosE = c * cd - s * sd
    } else {
      E = keplerCore(m, e, ALPHA0, ALPHA1 / (1 + e))
      sinE = SINCOS.sin; cosE = SINCOS.cos
    }
    if (outE !== null) outE[i] = Mi - mSigned + sg * E
    if (outSin !== null) outSin[i] = sg * sinE
    if (outCos !== null) outCos[i] = cosE
  }
}

/**
 * Internal fast path for the RV model: sin E and cos E for M[0..n) at one e (0 ≤ e < 1, M finite
 * or NaN; not checked), written into `sinE` and `cosE` (either may alias `M`). No allocation.
 */
export function keplerSinCosArray(M: Float64Array, n: number, e: number, sinE: Float64Array, cosE: Float64Array): void {
  if (n < TABLE_MIN_LENGTH) {
    for (let i = 0; i < n; i++) { keplerReduced(wrapPi(M[i]), e); sinE[i] = SINCOS.sin; cosE[i] = SINCOS.cos }
    return
  }
  prepareTable(e)
  solveTabled(M, n, e, null, sinE, cosE)
}

/** Arrays shorter than this are solved point by point (the table costs about as much as a few solves). */
const TABLE_MIN_LENGTH = 16

/**
 * Solves Kepler's equation for every mean anomaly in `M`, writing E into `out`
 * (which may be `M` itself). No allocation. Returns `out`.
 */
export function solveKeplerArray(M: Float64Array, e: number, out: Float64Array): Float64Array {
  if (!(e >= 0 && e < 1)) throw new RangeError(`e must be in [0, 1), got ${e}`)
  if (out.length < M.length) throw new RangeError('out must be at least as long as M')
  if (e === 0) { if (out !== M) out.set(M); return out }
  if (M.length < TABLE_MIN_LENGTH) {
    for (let i = 0; i < M.length; i++) { const m = wrapPi(M[i]); out[i] = M[i] - m + keplerReduced(m, e) }
    return out
  }
  prepareTable(e)
  solveTabled(M, M.length, e, out, null, null)
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

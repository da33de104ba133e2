/**
 * Starting values for a new Keplerian at a trial period, so that no initial guess is needed.
 *
 * At fixed (P, e, Tp) the model is linear in K cos ω, K sin ω and in the offsets and trend, so a
 * coarse grid over e and the periastron phase can be scored exactly by weighted linear least
 * squares; the best few grid points seed the non-linear fit. For e = 0 this is the one-frequency
 * least-squares fit behind the generalised Lomb–Scargle periodogram (Zechmeister & Kürster 2009,
 * A&A 496, 577), which gives K and the phase directly.
 */
import { addKeplerian, tpToTc, type Keplerian } from './model.ts'
import { keplerSinCosArray } from './kepler.ts'
import { cholesky, choleskySolve } from './linalg.ts'
import type { RvData } from './orbit-data.ts'
import type { PlanetStart, TrendKind } from './orbit-fit.ts'

const TWO_PI = 2 * Math.PI

export interface StartOptions {
  /** Planets already in the model, subtracted before scoring (elements with ω in radians). */
  others?: Keplerian[]
  /** Jitter per instrument added to the errors when weighting (default 0). */
  jitter?: ArrayLike<number>
  trend?: TrendKind
  epoch?: number
  /** How many distinct starts to return (default 3). */
  count?: number
  /** Non-zero eccentricities of the grid (default 0.15, 0.35, 0.55, 0.75, 0.9; e = 0 is always tried). */
  eccentricities?: number[]
  /** Periastron phases per eccentricity (default 16). */
  phaseSteps?: number
}

/** A starting planet and the weighted χ² of its grid point (offsets, trend and K solved exactly). */
export type ScoredStart = PlanetStart & { chi2: number }

/** Starting planets at `period`, best (lowest χ²) first. */
export function planetStarts(data: RvData, period: number, opts: StartOptions = {}): ScoredStart[] {
  if (!(period > 0)) throw new RangeError(`period must be > 0, got ${period}`)
  const n = data.t.length
  const nInst = data.instrumentNames.length
  const trend = opts.trend ?? 'none'
  const nTr = trend === 'linear' ? 1 : trend === 'quadratic' ? 2 : 0
  let epoch = opts.epoch ?? 0
  if (opts.epoch === undefined) { for (let i = 0; i < n; i++) epoch += data.t[i]; epoch /= Math.max(n, 1) }
  const r0 = Float64Array.from(data.y)
  if (opts.others?.length) {
    const m = new Float64Array(n)
    for (const o of opts.others) addKeplerian(data.t, o, m)
    for (let i = 0; i < n; i++) r0[i] -= m[i]
  }
  const w = new Float64Array(n)
  for (let i = 0; i < n; i++) { const s = opts.jitter ? opts.jitter[data.instrument[i]] : 0; w[i] = 1 / (data.dy[i] ** 2 + s * s) }

  // weighted LS of r0 on [colA, colB | instrument indicators | trend]; returns χ² and coefficients.
  // The normal-matrix block of the indicators and trend and its right-hand side do not depend on
  // the shape columns: summed once; per grid point only the shape rows are summed (same equations).
  const nLin = nInst + nTr
  const p = 2 + nLin
  const base = new Float64Array(p * p), bBase = new Float64Array(p)
  const dt1 = new Float64Array(n)
  let yy = 0
  for (let i = 0; i < n; i++) {
    const wi = w[i], k = 2 + data.instrument[i], dt = data.t[i] - epoch
    dt1[i] = dt
    base[k * p + k] += wi; bBase[k] += wi * r0[i]
    if (nTr) {
      const q = 2 + nInst
      base[k * p + q] += wi * dt; base[q * p + q] += wi * dt * dt; bBase[q] += wi * dt * r0[i]
      if (nTr > 1) { base[k * p + q + 1] += wi * dt * dt; base[q * p + q + 1] += wi * dt ** 3; base[(q + 1) * p + q + 1] += wi * dt ** 4; bBase[q + 1] += wi * dt * dt * r0[i] }
    }
    yy += wi * r0[i] * r0[i]
  }
  const A = new Float64Array(p * p), b = new Float64Array(p)
  const solve = (colA: Float64Array, colB: Float64Array): { chi2: number; coef: Float64Array } | null => {
    A.set(base); b.set(bBase)
    let aa = 0, ab = 0, bb = 0, ar = 0, br = 0, at = 0, bt = 0, at2 = 0, bt2 = 0
    for (let i = 0; i < n; i++) {
      const wi = w[i], ca = wi * colA[i], cb = wi * colB[i], ri = r0[i], k = 2 + data.instrument[i]
      aa += ca * colA[i]; ab += ca * colB[i]; bb += cb * colB[i]; ar += ca * ri; br += cb * ri
      A[k] += ca; A[p + k] += cb
      if (nTr) { const dt = dt1[i]; at += ca * dt; bt += cb * dt; if (nTr > 1) { at2 += ca * dt * dt; bt2 += cb * dt * dt } }
    }
    A[0] = aa; A[1] = ab; A[p + 1] = bb; b[0] = ar; b[1] = br
    if (nTr) { const q = 2 + nInst; A[q] = at; A[p + q] = bt; if (nTr > 1) { A[q + 1] = at2; A[p + q + 1] = bt2 } }
    for (let a = 0; a < p; a++) for (let c = 0; c < a; c++) A[a * p + c] = A[c * p + a]
    if (!cholesky(A, p)) return null
    const coef = Float64Array.from(b)
    choleskySolve(A, p, coef)
    // χ² = Σ w r0² − bᵀ coef (normal equations)
    let chi2 = yy
    for (let a = 0; a < p; a++) chi2 -= b[a] * coef[a]
    return { chi2, coef }
  }

  interface Cand { chi2: number; start: ScoredStart }
  const cands: Cand[] = []
  // At fixed (e, Tp) the model K[cos(ν+ω) + e cos ω] = (K cos ω)(cos ν + e) − (K sin ω) sin ν is
  // linear in K cos ω and K sin ω, so ω and K are solved exactly; only e and Tp need a grid.
  const colA = new Float64Array(n), colB = new Float64Array(n)
  const Ms = new Float64Array(n), sinE = new Float64Array(n), cosE = new Float64Array(n)
  const f = TWO_PI / period
  const eccs = [0, ...(opts.eccentricities ?? [0.15, 0.35, 0.55, 0.75, 0.9])]
  const nPh = opts.phaseSteps ?? 16
  for (const e of eccs) {
    const sq = Math.sqrt(1 - e * e)
    const phases = e === 0 ? 1 : nPh
    for (let ip = 0; ip < phases; ip++) {
      const tp = epoch + period * ip / phases
      for (let i = 0; i < n; i++) Ms[i] = f * (data.t[i] - tp)
      if (e === 0) {
        for (let i = 0; i < n; i++) { colA[i] = Math.cos(Ms[i]); colB[i] = Math.sin(Ms[i]) }
      } else {
        keplerSinCosArray(Ms, n, e, sinE, cosE) // the model's array solver (kepler.ts)
        for (let i = 0; i < n; i++) {
          const cE = cosE[i]
          const den = 1 - e * cE
          colA[i] = (cE - e) / den + e
          colB[i] = sq * sinE[i] / den
        }
      }
      const res = solve(colA, colB)
      if (!res) continue
      const a = res.coef[0], b = res.coef[1]
      const K = Math.hypot(a, b)
      let om = Math.atan2(-b, a)
      if (om < 0) om += TWO_PI
      cands.push({ chi2: res.chi2, start: { period, K, e, omegaDeg: om * 180 / Math.PI, tc: tpToTc(tp, period, e, om), chi2: res.chi2 } })
    }
  }
  cands.sort((a, b) => a.chi2 - b.chi2)
  const count = opts.count ?? 3
  const out: ScoredStart[] = []
  const circular = cands.find((c) => c.start.e === 0)
  for (const c of cands) {
    if (out.length >= count) break
    // skip near-duplicates (same e, similar ω)
    if (out.some((o) => o.e === c.start.e && Math.abs(((o.omegaDeg! - c.start.omegaDeg! + 540) % 360) - 180) < 30)) continue
    out.push(c.start)
  }
  if (circular && !out.includes(circular.start)) out.push(circular.start)
  return out
}

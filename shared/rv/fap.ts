/**
 * False-alarm probability of a periodogram peak: Baluev 2008 (MNRAS 385, 1279) analytic
 * approximation, its inverse (false-alarm levels), and a seeded bootstrap as a check.
 */
import type { Random } from '../math/random.ts'
import { frequencyGrid, prepare, directPowerInto, fastPowerInto, chooseMethod, type PeriodogramOptions } from './periodogram-core.ts'

/** ln Γ(x) for x > 0, Lanczos approximation (g = 7, 9 terms; relative error ~1e-15). Common practice. */
export function lnGamma(x: number): number {
  if (!(x > 0)) throw new RangeError(`x must be > 0 (got ${x})`)
  if (x < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * x)) - lnGamma(1 - x)
  const g = 7
  const c = [0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313,
    -176.61502916214059, 12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7]
  x -= 1
  let a = c[0]
  const tt = x + g + 0.5
  for (let i = 1; i < 9; i++) a += c[i] / (x + i)
  return 0.5 * Math.log(2 * Math.PI) + (x + 0.5) * Math.log(tt) - tt + Math.log(a)
}

export interface FapOptions {
  /** Kept for symmetry with the periodogram: both variants fit centred data, so the degrees of freedom are the same. */
  floatingMean?: boolean
  /** Errors of the points: the effective baseline uses the 1/σ²-weighted variance of t (as astropy does). Unweighted without. */
  dy?: Float64Array
  /** m/s added in quadrature to dy for the weights. */
  jitter?: number
}

/** Effective baseline T_eff = √(4π·Var_w(t)) (Baluev 2008, Table 1). */
function effectiveBaseline(t: Float64Array, opts: FapOptions): number {
  const n = t.length
  if (n < 2) throw new RangeError(`t must have at least 2 points (got ${n})`)
  const dy = opts.dy, j2 = (opts.jitter ?? 0) ** 2
  if (dy !== undefined && dy.length !== n) throw new RangeError(`dy has ${dy.length} values but t has ${n}`)
  let sw = 0, st = 0
  for (let i = 0; i < n; i++) {
    const w = dy === undefined ? 1 : 1 / (dy[i] * dy[i] + j2)
    sw += w; st += w * t[i]
  }
  const mean = st / sw
  let v = 0
  for (let i = 0; i < n; i++) {
    const w = dy === undefined ? 1 : 1 / (dy[i] * dy[i] + j2)
    v += w * (t[i] - mean) ** 2
  }
  return Math.sqrt(4 * Math.PI * v / sw)
}

function checkFapArgs(nPoints: number, maxFrequency: number): void {
  if (!(Number.isInteger(nPoints) && nPoints >= 4)) throw new RangeError(`nPoints must be an integer >= 4 (got ${nPoints})`)
  if (!(Number.isFinite(maxFrequency) && maxFrequency > 0)) throw new RangeError(`maxFrequency must be finite and > 0 (got ${maxFrequency})`)
}

function fapFromTeff(z: number, n: number, teff: number, fmax: number): number {
  if (!(z > 0)) return 1
  if (z >= 1) return 0
  const nh = n - 1, nk = n - 3 // degrees of freedom without / with the sinusoid (centred data)
  const fapSingle = Math.pow(1 - z, 0.5 * nk)
  const gamma = Math.sqrt(2 / nh) * Math.exp(lnGamma(nh / 2) - lnGamma((nh - 1) / 2))
  const tau = gamma * fmax * teff * Math.pow(1 - z, 0.5 * (nk - 1)) * Math.sqrt(0.5 * nh * z)
  const p = -Math.expm1(-tau) + fapSingle * Math.exp(-tau)
  return p < 0 ? 0 : p > 1 ? 1 : p
}

/**
 * Probability that noise alone gives a peak at least `power` high anywhere from 0 to
 * `maxFrequency` (c/d): Baluev 2008, MNRAS 385, 1279, eq. 6 (the alias-free approximation built on
 * the Davies bound, Table 1 τ factor for the 'standard' normalisation), in the form of
 * VanderPlas 2018, ApJS 236, 16, §7.4 — numerically the same as astropy's
 * `false_alarm_probability(method='baluev')` (checked in tests/shared/rv/fap.spec.ts).
 * FAP = 1 − (1 − FAP₁)·e^{−τ}, FAP₁ = (1 − z)^{(N−3)/2},
 * τ = γ(N−1)·f_max·T_eff·(1 − z)^{(N−4)/2}·√((N−1)z/2), T_eff = √(4π Var(t)).
 */
export function baluevFap(power: number, nPoints: number, t: Float64Array, maxFrequency: number, opts: FapOptions = {}): number {
  checkFapArgs(nPoints, maxFrequency)
  if (!Number.isFinite(power)) throw new RangeError(`power must be finite (got ${power})`)
  return fapFromTeff(power, nPoints, effectiveBaseline(t, opts), maxFrequency)
}

/**
 * The power at which {@link baluevFap} equals `fap` (for drawing the 10 %, 1 %, 0.1 % lines):
 * bisection on (0, 1), where FAP falls from 1 to 0, to 1e-13 in power.
 */
export function falseAlarmLevel(fap: number, nPoints: number, t: Float64Array, maxFrequency: number, opts: FapOptions = {}): number {
  if (!(fap > 0 && fap < 1)) throw new RangeError(`fap must be in (0, 1) (got ${fap})`)
  checkFapArgs(nPoints, maxFrequency)
  const teff = effectiveBaseline(t, opts)
  let lo = 0, hi = 1
  for (let i = 0; i < 200 && hi - lo > 1e-14; i++) {
    const mid = 0.5 * (lo + hi)
    if (fapFromTeff(mid, nPoints, teff, maxFrequency) > fap) lo = mid
    else hi = mid
  }
  return 0.5 * (lo + hi)
}

export interface BootstrapOptions extends PeriodogramOptions {
  /** Number of resampled data sets (default 1000). */
  samples?: number
  /** Seeded generator (shared/math/random.ts). */
  random: Random
}

/**
 * Bootstrap false-alarm probability (common practice; e.g. VanderPlas 2018, ApJS 236, 16, §7.4.2):
 * `samples` times, draw (y, dy) pairs with replacement onto the same times, compute the
 * periodogram on the same grid and record its highest power. Returns the fraction of those
 * maxima ≥ `power` (0 when none reaches it: then the FAP is below about 1/samples).
 * Deterministic for a given `random` state.
 */
export function bootstrapFap(t: Float64Array, y: Float64Array, dy: Float64Array, power: number, opts: BootstrapOptions): number {
  const samples = opts.samples ?? 1000
  if (!(Number.isInteger(samples) && samples >= 1)) throw new RangeError(`samples must be an integer >= 1 (got ${samples})`)
  if (opts.random === undefined || typeof opts.random.next !== 'function') throw new TypeError('random must be a seeded Random (createRandom(seed))')
  if (!Number.isFinite(power)) throw new RangeError(`power must be finite (got ${power})`)
  const grid = frequencyGrid(t, opts)
  prepare(t, y, dy, opts.jitter ?? 0) // validates once
  const n = t.length
  const yb = new Float64Array(n), db = new Float64Array(n)
  const out = new Float64Array(grid.count)
  const method = chooseMethod(n, grid.count, opts.method)
  const floating = opts.floatingMean ?? true
  let above = 0
  for (let b = 0; b < samples; b++) {
    for (let i = 0; i < n; i++) { const k = opts.random.int(n); yb[i] = y[k]; db[i] = dy[k] }
    const p = prepare(t, yb, db, opts.jitter ?? 0)
    if (method === 'direct') directPowerInto(p, grid, floating, out)
    else fastPowerInto(p, grid, floating, out)
    let mx = 0
    for (let k = 0; k < grid.count; k++) if (out[k] > mx) mx = out[k]
    if (mx >= power) above++
  }
  return above / samples
}

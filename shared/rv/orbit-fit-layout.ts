/**
 * Parameter layout of the fitter: which planet elements are free, where each sits in the free
 * vector x, its finite-difference scale, and the map x → elements. Built once per fit and never
 * changed afterwards (the scratch buffers live in `orbit-fit-objective.ts`'s `Workspace`).
 *
 * Free parameters per planet: P, K, √e cos ω, √e sin ω (Ford 2006, ApJ 642, 505; Eastman, Gaudi &
 * Agol 2013, PASP 125, 83) and the time of conjunction Tc; fixing e or ω leaves ω or √e free.
 */
import { tcToTp, tpToTc, nearestEpoch } from './model.ts'
import { checkRvData, baseline, type RvData } from './orbit-data.ts'
import { E_MAX, type FitOptions, type PlanetParam, type Prior, type TrendKind } from './orbit-fit-types.ts'
import { trendTerms } from './orbit-fit-linear.ts'

const TWO_PI = 2 * Math.PI
const DEG = Math.PI / 180

export type EccMode = 'both' | 'omega' | 'sqrte' | 'none'

/** One planet's elements as the fitter sees them (ω in radians). */
export interface FitElements { period: number; K: number; e: number; omega: number; tc: number; tp: number }

export interface PlanetLayout {
  iP: number; iK: number; iA: number; iB: number; iTc: number
  ecc: EccMode
  phaseFixed: 'tc' | 'tp' | null
  base: FitElements
}

/** Everything about one fit that does not change while it runs. */
export interface FitLayout {
  data: RvData
  n: number
  epoch: number
  trend: TrendKind
  nInst: number
  /** Linear parameters: one offset per instrument, then the trend coefficients. */
  nLin: number
  layouts: PlanetLayout[]
  nFree: number
  /** Forward-difference step of each free parameter (also the scale of convergence tests). */
  scales: Float64Array
  priors: Prior[]
  jitterFixed: number[] | null
  /** Free-parameter index → planet it belongs to. */
  owner: Int32Array
}

/** Wraps an angle difference in degrees to [−180°, 180°). */
export function wrapDegrees(d: number): number {
  return ((d % 360) + 540) % 360 - 180
}

/** Validates the options and lays out the free vector; returns the layout and the start x0. */
export function buildLayout(data: RvData, opts: FitOptions): { layout: FitLayout; x0: Float64Array } {
  checkRvData(data)
  const n = data.t.length
  const nInst = data.instrumentNames.length
  const trend = opts.trend ?? 'none'
  if (!['none', 'linear', 'quadratic'].includes(trend)) throw new RangeError(`trend must be none, linear or quadratic, got ${trend}`)
  let mean = 0
  for (let i = 0; i < n; i++) mean += data.t[i]
  mean = n ? mean / n : 0
  const epoch = opts.epoch ?? mean
  if (!Number.isFinite(epoch)) throw new RangeError('epoch must be finite')
  const nLin = nInst + trendTerms(trend)
  const T = Math.max(baseline(data.t), 1)
  let medErr = 0
  for (let i = 0; i < n; i++) medErr += data.dy[i]
  medErr = n ? medErr / n : 1

  const x: number[] = []
  const scales: number[] = []
  const layouts: PlanetLayout[] = opts.planets.map((p, k) => {
    const label = `planets[${k}]`
    if (!(p.period > 0)) throw new RangeError(`${label}.period must be > 0, got ${p.period}`)
    if (!(p.K >= 0)) throw new RangeError(`${label}.K must be ≥ 0, got ${p.K}`)
    const e = p.e ?? 0
    if (!(e >= 0 && e < 1)) throw new RangeError(`${label}.e must be in [0, 1), got ${e}`)
    const omega = (p.omegaDeg ?? 0) * DEG
    if (!Number.isFinite(omega)) throw new RangeError(`${label}.omegaDeg must be finite`)
    let tc: number, tp: number
    if (p.tc !== undefined) { tc = p.tc; tp = tcToTp(tc, p.period, e, omega) }
    else if (p.tp !== undefined) { tp = p.tp; tc = tpToTc(tp, p.period, e, omega) }
    else throw new RangeError(`${label} needs tc or tp`)
    if (!Number.isFinite(tc)) throw new RangeError(`${label}.tc must be finite`)
    const fix = new Set(p.fix ?? [])
    for (const f of fix) if (!['period', 'K', 'e', 'omegaDeg', 'tc', 'tp'].includes(f)) throw new RangeError(`${label}.fix: unknown parameter ${f}`)
    const lay: PlanetLayout = {
      iP: -1, iK: -1, iA: -1, iB: -1, iTc: -1, ecc: 'both',
      phaseFixed: fix.has('tc') ? 'tc' : fix.has('tp') ? 'tp' : null,
      base: { period: p.period, K: p.K, e, omega, tc, tp },
    }
    const push = (v: number, s: number): number => { x.push(v); scales.push(s); return x.length - 1 }
    if (!fix.has('period')) lay.iP = push(p.period, 1e-5 * p.period * p.period / (TWO_PI * T))
    if (!fix.has('K')) lay.iK = push(p.K, 1e-5 * Math.max(p.K, medErr, 1e-3))
    const fe = fix.has('e'), fw = fix.has('omegaDeg')
    if (e === 0 && fe) lay.ecc = 'none'
    else if (fe && fw) lay.ecc = 'none'
    else if (fe) { lay.ecc = 'omega'; lay.iA = push(omega, 1e-5) }
    else if (fw) { lay.ecc = 'sqrte'; lay.iA = push(Math.sqrt(e), 1e-5) }
    else { lay.ecc = 'both'; lay.iA = push(Math.sqrt(e) * Math.cos(omega), 1e-5); lay.iB = push(Math.sqrt(e) * Math.sin(omega), 1e-5) }
    if (!lay.phaseFixed) lay.iTc = push(nearestEpoch(tc, p.period, epoch), 1e-5 * p.period / TWO_PI)
    return lay
  })
  const owner = new Int32Array(x.length)
  layouts.forEach((L, k) => { for (const i of [L.iP, L.iK, L.iA, L.iB, L.iTc]) if (i >= 0) owner[i] = k })
  const priors = opts.priors ?? []
  priors.forEach((pr, j) => {
    if (!(pr.planet >= 0 && pr.planet < layouts.length)) throw new RangeError(`priors[${j}].planet out of range`)
    if (pr.gaussian && !(pr.gaussian.sigma > 0)) throw new RangeError(`priors[${j}].gaussian.sigma must be > 0`)
    if (pr.uniform && !(pr.uniform.max > pr.uniform.min)) throw new RangeError(`priors[${j}].uniform.max must exceed min`)
  })
  let jitterFixed: number[] | null = null
  if (Array.isArray(opts.jitter)) {
    if (opts.jitter.length !== nInst) throw new RangeError(`jitter must have one value per instrument (${nInst})`)
    opts.jitter.forEach((s, k) => { if (!(s >= 0)) throw new RangeError(`jitter[${k}] must be ≥ 0`) })
    jitterFixed = opts.jitter.slice()
  }
  const layout: FitLayout = {
    data, n, epoch, trend, nInst, nLin, layouts, nFree: x.length, scales: Float64Array.from(scales), priors, jitterFixed, owner,
  }
  return { layout, x0: Float64Array.from(x) }
}

/** Planet k's elements from the free vector. */
export function unpack(L: FitLayout, x: ArrayLike<number>, k: number): FitElements {
  const pl = L.layouts[k]
  const period = pl.iP >= 0 ? x[pl.iP] : pl.base.period
  const K = pl.iK >= 0 ? x[pl.iK] : pl.base.K
  let e = pl.base.e, omega = pl.base.omega
  if (pl.ecc === 'both') { const a = x[pl.iA], b = x[pl.iB]; e = a * a + b * b; omega = e > 0 ? Math.atan2(b, a) : 0 }
  else if (pl.ecc === 'omega') omega = x[pl.iA]
  else if (pl.ecc === 'sqrte') e = x[pl.iA] * x[pl.iA]
  let tc: number, tp: number
  if (pl.phaseFixed === 'tp') { tp = pl.base.tp; tc = tpToTc(tp, period, e, omega) }
  else { tc = pl.iTc >= 0 ? x[pl.iTc] : pl.base.tc; tp = tcToTp(tc, period, e, omega) }
  return { period, K, e, omega, tc, tp }
}

/**
 * Projects a free vector onto the bounds P > 0, K ≥ 0, e ≤ E_MAX (in place). With `flipNegativeK`, a
 * negative K is first mapped to the same velocity curve with K > 0 where the free parameters allow:
 * −K [cos(ν + ω) + e cos ω] = K [cos(ν + ω + π) + e cos(ω + π)], so K → −K and ω → ω + π at the same
 * periastron time (for a circular orbit with ω held, half a period later). The optimiser can then pass
 * through K = 0 instead of sticking there with the planet's other parameters undetermined.
 */
export function project(L: FitLayout, x: Float64Array, flipNegativeK = false): void {
  L.layouts.forEach((pl, k) => {
    if (pl.iP >= 0 && !(x[pl.iP] > 0)) x[pl.iP] = 1e-6
    if (pl.ecc === 'both') {
      const e = x[pl.iA] * x[pl.iA] + x[pl.iB] * x[pl.iB]
      if (e > E_MAX) { const f = Math.sqrt(E_MAX / e); x[pl.iA] *= f; x[pl.iB] *= f }
    } else if (pl.ecc === 'sqrte') {
      x[pl.iA] = Math.min(Math.abs(x[pl.iA]), Math.sqrt(E_MAX))
    }
    if (flipNegativeK && pl.iK >= 0 && x[pl.iK] < 0) flipSign(L, x, k)
    if (pl.iK >= 0 && x[pl.iK] < 0) x[pl.iK] = 0
  })
}

/** The value a prior on `param` applies to (ω in degrees). */
export function priorValue(p: FitElements, param: PlanetParam): number {
  switch (param) {
    case 'period': return p.period
    case 'K': return p.K
    case 'e': return p.e
    case 'omegaDeg': return p.omega / DEG
    case 'tc': return p.tc
    case 'tp': return p.tp
  }
}

/**
 * The gradient g of the cost with what pushes a parameter past its bound removed (into `out`): K held
 * at 0 by a gradient pushing it below, the outward radial part of (√e cos ω, √e sin ω) at e = E_MAX,
 * √e pushed above √E_MAX. The optimiser's convergence test reads it, so a fit resting on a bound converges.
 */
export function projectGradient(L: FitLayout, x: ArrayLike<number>, g: ArrayLike<number>, out: Float64Array): void {
  out.set(g)
  const atEmax = (e: number): boolean => e >= E_MAX * (1 - 1e-9)
  for (const pl of L.layouts) {
    if (pl.iK >= 0 && x[pl.iK] === 0 && out[pl.iK] > 0) out[pl.iK] = 0
    if (pl.ecc === 'both') {
      const a = x[pl.iA], b = x[pl.iB], rr = Math.hypot(a, b)
      const radial = rr > 0 ? (out[pl.iA] * a + out[pl.iB] * b) / rr : 0 // descent leaves the disc when < 0
      if (atEmax(rr * rr) && radial < 0) { out[pl.iA] -= radial * a / rr; out[pl.iB] -= radial * b / rr }
    } else if (pl.ecc === 'sqrte' && atEmax(x[pl.iA] * x[pl.iA]) && out[pl.iA] < 0) out[pl.iA] = 0
  }
}

/** K → −K with the same velocity curve, when planet k's free parameters can express it (see `project`). */
function flipSign(L: FitLayout, x: Float64Array, k: number): void {
  const pl = L.layouts[k]
  if (pl.phaseFixed === 'tc' || !(x[pl.iK] < 0)) return
  const el = unpack(L, x, k)
  let omega = el.omega, tp = el.tp
  if (el.e === 0) {
    // circular: half a period later (ω is undefined or held)
    if (pl.phaseFixed === 'tp') return
    tp += el.period / 2
  } else if (pl.ecc === 'both') { x[pl.iA] = -x[pl.iA]; x[pl.iB] = -x[pl.iB]; omega += Math.PI }
  else if (pl.ecc === 'omega') { x[pl.iA] += Math.PI; omega += Math.PI }
  else return // e > 0 with ω held: no equivalent curve with K > 0
  x[pl.iK] = -x[pl.iK]
  if (pl.iTc >= 0) x[pl.iTc] = nearestEpoch(tpToTc(tp, el.period, el.e, omega), el.period, L.epoch)
}

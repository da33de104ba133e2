/**
 * Log-posterior of the RV model (N Keplerians + per-instrument offset and jitter + optional
 * trend) in a parameterisation suited to sampling.
 *
 * Sampling coordinates, in this order:
 *   per planet   ln P, ln K, √e cos ω, √e sin ω, Tc     (Ford 2006, ApJ 642, 505; Eastman, Gaudi &
 *                                                      Agol 2013, PASP 125, 83 for √e cos ω, √e sin ω)
 *                every parameter the model fixes (`fix`, as the fitter's PlanetStart.fix) is left
 *                out and held at its value: with e fixed the planet has ω (radians, flat on the
 *                circle, sampled on [ω₀ − π, ω₀ + π)); with ω fixed it has e (flat on [0, eMax));
 *                with e fixed at 0, or e and ω fixed, neither; with Tc or Tp fixed no phase
 *                coordinate (a fixed Tp gives Tc from the current P, e, ω)
 *   per instrument  offset
 *   per instrument  ln s (only when jitters are sampled)
 *   trend        slope [, curvature]                  (about `epoch`)
 *   GP noise     (with `spec.noise`) ln amplitude(s), ln decay time, rotation period, shape — the
 *                free ones; priors and likelihood in ./posterior-gp.ts
 *
 * Likelihood (Ford 2006): ln L = −½ Σ_i [ r_i² / (σ_i² + s_k²) + ln 2π(σ_i² + s_k²) ], the same
 * as the fitter's; offsets and trend are sampled, not profiled.
 *
 * Priors are stated on the physical parameters and converted with the Jacobian of the map, so they
 * mean what they say. Defaults (common practice for RV posteriors): flat in P > 0, flat in K ≥ 0,
 * flat in e on [0, eMax) and flat in ω, flat in Tc, flat in the offsets and trend, flat in the
 * jitter s ≥ 0. Jacobians:
 *   - P = e^{u}: p(u) = p(P) · P, so ln p gains + ln P;
 *   - K = e^{v}: + ln K;  s = e^{w}: + ln s;
 *   - (h, k) = (√e cos ω, √e sin ω): ∂(h, k)/∂(e, ω) = [[cos ω/(2√e), −√e sin ω], [sin ω/(2√e), √e cos ω]],
 *     determinant ½ (constant), so a prior uniform in e and ω is uniform in (h, k) and needs no term;
 *     any stated prior on e or ω enters as is, p(h, k) = 2 p(e) p(ω).
 * Stated priors (`SamplingPrior`) multiply into the defaults: uniform and log-uniform priors
 * restrict the support (−∞ outside) and add their normalised densities; Gaussian priors add
 * −½((x − μ)/σ)² − ln σ√2π, with ω differences wrapped to ±180° and Tp taken on the revolution
 * nearest the prior's centre.
 *
 * The evaluation allocates nothing: one model buffer, Kepler's equation by the core's solver
 * (`addKeplerian`), per-row constants precomputed.
 */
import { addKeplerian, tcToTp, tpToTc, nearestEpoch, type Keplerian } from './model.ts'
import { checkRvData, type RvData } from './orbit-data.ts'
import { E_MAX, type TrendKind, type FitResult, type PlanetParam } from './orbit-fit.ts'
import type { GpHyperSpec } from './gp-fit.ts'
import { gpTerm, type GpCoords } from './posterior-gp.ts'

const TWO_PI = 2 * Math.PI
const DEG = Math.PI / 180
const LN_2PI = Math.log(TWO_PI)

export type SamplingParam = 'period' | 'K' | 'e' | 'omegaDeg' | 'tc' | 'tp' | 'offset' | 'jitter'

/**
 * A prior on a physical parameter: `planet` (index) for period/K/e/omegaDeg/tc/tp, `instrument`
 * (index) for offset/jitter. Give exactly one of uniform, logUniform, gaussian. The fitter's
 * `Prior` objects are valid `SamplingPrior`s.
 */
export interface SamplingPrior {
  planet?: number
  instrument?: number
  param: SamplingParam
  uniform?: { min: number; max: number }
  logUniform?: { min: number; max: number }
  gaussian?: { mu: number; sigma: number }
}

/** The model to sample and the point it is centred on (usually the maximum-likelihood fit). */
export interface PosteriorSpec {
  /** Centre values of each planet; `fix` lists the parameters held at these values (not sampled). */
  planets: Array<{ period: number; K: number; e?: number; omegaDeg?: number; tc?: number; tp?: number; fix?: readonly PlanetParam[] }>
  trend?: TrendKind
  /** Reference time of the trend (default: mean time of the data). */
  epoch?: number
  /** 'fit' (default): jitters are sampled; or fixed jitters per instrument (m/s). */
  jitter?: 'fit' | number[]
  /** Centre values per instrument (default 0 offsets, 1 m/s jitters when sampled). */
  offsets?: number[]
  jitters?: number[]
  slope?: number
  curvature?: number
  priors?: SamplingPrior[]
  /** Hard upper bound on e (default E_MAX = 0.99 of the fitter). */
  eMax?: number
  /**
   * Correlated noise: a GP (the model spec's `noise` of kind 'gp', as `GpHyperSpec`); its values are the
   * sampler's centre, `fixed` ones are held. Absent: white noise.
   */
  noise?: GpHyperSpec | null
}

/** Where one planet's coordinates sit in the sampling vector (−1: held fixed or not in this mode). */
export interface PlanetCoords {
  lnP: number
  lnK: number
  /** √e cos ω and √e sin ω (e and ω both free). */
  h: number
  k: number
  /** e alone (ω fixed). */
  e: number
  /** ω in radians alone (e fixed, not 0). */
  omega: number
  tc: number
  /** Values the fixed parameters hold (ω in radians; Tp only when the phase is fixed by Tp). */
  fixed: { period: number; K: number; e: number; omega: number; tc: number; tp: number | null }
}

export interface PosteriorLayout {
  nPlanets: number
  /** Per planet, the index of each coordinate (−1 when it is held fixed). */
  planets: PlanetCoords[]
  nInst: number
  /** Index of the first offset, of the first ln jitter (−1 if fixed), of the slope and curvature (−1 if absent). */
  iOffset: number
  iJitter: number
  iSlope: number
  iCurvature: number
  /** The GP hyperparameters' coordinates (null: white noise). */
  gp: GpCoords | null
}

export interface LogPosterior {
  nDim: number
  /** Names and units of the sampling coordinates. */
  names: string[]
  units: string[]
  layout: PosteriorLayout
  epoch: number
  eMax: number
  /** ln posterior (up to a constant) at a sampling point; −Infinity outside the support. No allocation. */
  logProb(x: ArrayLike<number>): number
  /** ln L alone (Ford 2006) at a sampling point (NaN-free: −Infinity for impossible points). */
  logLikelihood(x: ArrayLike<number>): number
  /** ln prior including the Jacobian terms. */
  logPrior(x: ArrayLike<number>): number
  /** Sampling point of the spec's centre values. */
  centre: Float64Array
  /** The GP hyperparameters' priors in words (empty for white noise). */
  noisePriors: string[]
}

const LETTERS = 'bcdefghijklmnopqrstuvwxyz'
/** Planet label used in parameter names: b, c, d… (the trade's habit for companions of one star). */
export function planetLabel(k: number): string {
  return k < LETTERS.length ? LETTERS[k] : `p${k + 1}`
}

/**
 * Builds the log-posterior of `spec` for `data` (see the module comment). Throws a RangeError
 * naming the field on misuse.
 */
export function createLogPosterior(data: RvData, spec: PosteriorSpec): LogPosterior {
  checkRvData(data)
  const n = data.t.length
  const nInst = data.instrumentNames.length
  const nPl = spec.planets.length
  const trend = spec.trend ?? 'none'
  if (!['none', 'linear', 'quadratic'].includes(trend)) throw new RangeError(`trend must be none, linear or quadratic, got ${trend}`)
  const eMax = spec.eMax ?? E_MAX
  if (!(eMax > 0 && eMax < 1)) throw new RangeError(`eMax must be in (0, 1), got ${eMax}`)
  let mean = 0
  for (let i = 0; i < n; i++) mean += data.t[i]
  const epoch = spec.epoch ?? (n ? mean / n : 0)
  if (!Number.isFinite(epoch)) throw new RangeError('epoch must be finite')
  const fixedJitter = Array.isArray(spec.jitter) ? spec.jitter : null
  if (fixedJitter) {
    if (fixedJitter.length !== nInst) throw new RangeError(`jitter must have one value per instrument (${nInst})`)
    fixedJitter.forEach((s, k) => { if (!(s >= 0)) throw new RangeError(`jitter[${k}] must be ≥ 0`) })
  } else if (spec.jitter !== undefined && spec.jitter !== 'fit') throw new RangeError("jitter must be 'fit' or an array")

  const names: string[] = [], units: string[] = []
  const centre: number[] = []
  const coords: PlanetCoords[] = []
  // ω sampled alone (e fixed) lives on [ω₀ − π, ω₀ + π): flat on the circle, one branch
  const omegaLo = new Float64Array(nPl)
  spec.planets.forEach((p, k) => {
    const label = `planets[${k}]`
    const fix = new Set<string>(p.fix ?? [])
    for (const f of fix) if (!['period', 'K', 'e', 'omegaDeg', 'tc', 'tp'].includes(f)) throw new RangeError(`${label}.fix: unknown parameter ${f}`)
    if (!(p.period > 0)) throw new RangeError(`${label}.period must be > 0, got ${p.period}`)
    if (!(p.K > 0) && !(fix.has('K') && p.K >= 0)) throw new RangeError(`${label}.K must be > 0 to start the sampler (ln K), got ${p.K}`)
    const e = p.e ?? 0
    if (!(e >= 0 && e < eMax)) throw new RangeError(`${label}.e must be in [0, eMax), got ${e}`)
    const w = (p.omegaDeg ?? 0) * DEG
    if (!Number.isFinite(w)) throw new RangeError(`${label}.omegaDeg must be finite`)
    let tc: number
    if (p.tc !== undefined && !fix.has('tp')) tc = p.tc
    else if (p.tp !== undefined) tc = tpToTc(p.tp, p.period, e, w)
    else throw new RangeError(`${label} needs tc or tp${fix.has('tp') ? ' (tp, to hold it fixed)' : ''}`)
    if (!Number.isFinite(tc)) throw new RangeError(`${label}.tc must be finite`)
    const L = planetLabel(k)
    const c: PlanetCoords = {
      lnP: -1, lnK: -1, h: -1, k: -1, e: -1, omega: -1, tc: -1,
      fixed: { period: p.period, K: p.K, e, omega: w, tc, tp: fix.has('tp') && !fix.has('tc') ? p.tp! : null },
    }
    const push = (name: string, unit: string, v: number): number => { names.push(`${name} ${L}`); units.push(unit); centre.push(v); return centre.length - 1 }
    if (!fix.has('period')) c.lnP = push('ln P', 'ln d', Math.log(p.period))
    if (!fix.has('K')) c.lnK = push('ln K', 'ln m/s', Math.log(p.K))
    const fe = fix.has('e'), fw = fix.has('omegaDeg')
    if (fe && (e === 0 || fw)) { /* no eccentricity coordinate */ }
    else if (fe) { omegaLo[k] = w - Math.PI; c.omega = push('ω', 'rad', w) }
    else if (fw) c.e = push('e', '', e)
    else { c.h = push('√e cos ω', '', Math.sqrt(e) * Math.cos(w)); c.k = push('√e sin ω', '', Math.sqrt(e) * Math.sin(w)) }
    if (!fix.has('tc') && !fix.has('tp')) c.tc = push('Tc', 'd', nearestEpoch(tc, p.period, epoch))
    coords.push(c)
  })
  const iOffset = centre.length
  for (let k = 0; k < nInst; k++) {
    names.push(`offset ${data.instrumentNames[k]}`); units.push('m/s')
    centre.push(spec.offsets?.[k] ?? 0)
  }
  let iJitter = -1
  if (!fixedJitter) {
    iJitter = centre.length
    for (let k = 0; k < nInst; k++) {
      names.push(`ln jitter ${data.instrumentNames[k]}`); units.push('ln m/s')
      const s = spec.jitters?.[k] ?? 1
      centre.push(Math.log(Math.max(s, 1e-3)))
    }
  }
  let iSlope = -1, iCurvature = -1
  if (trend !== 'none') { iSlope = centre.length; names.push('slope'); units.push('m/s/d'); centre.push(spec.slope ?? 0) }
  if (trend === 'quadratic') { iCurvature = centre.length; names.push('curvature'); units.push('m/s/d²'); centre.push(spec.curvature ?? 0) }
  const gp = spec.noise ? gpTerm(data, spec.noise, (name, unit, v) => { names.push(name); units.push(unit); centre.push(v); return centre.length - 1 }) : null
  const nDim = centre.length
  const maxPlanetPeriod = gp ? gp.maxPlanetPeriod : Infinity

  // ---- priors, checked and compiled
  const priors = (spec.priors ?? []).map((pr, j) => {
    const label = `priors[${j}]`
    const planetParam = ['period', 'K', 'e', 'omegaDeg', 'tc', 'tp'].includes(pr.param)
    const instParam = ['offset', 'jitter'].includes(pr.param)
    if (!planetParam && !instParam) throw new RangeError(`${label}.param: unknown parameter ${pr.param}`)
    if (planetParam && !(Number.isInteger(pr.planet) && pr.planet! >= 0 && pr.planet! < nPl)) throw new RangeError(`${label}.planet out of range`)
    if (instParam && !(Number.isInteger(pr.instrument) && pr.instrument! >= 0 && pr.instrument! < nInst)) throw new RangeError(`${label}.instrument out of range`)
    if (pr.param === 'jitter' && fixedJitter) throw new RangeError(`${label}: a prior on the jitter needs sampled jitters`)
    const kinds = [pr.uniform, pr.logUniform, pr.gaussian].filter((v) => v !== undefined).length
    if (kinds !== 1) throw new RangeError(`${label} must give exactly one of uniform, logUniform, gaussian`)
    if (pr.uniform && !(pr.uniform.max > pr.uniform.min)) throw new RangeError(`${label}.uniform.max must exceed min`)
    if (pr.logUniform && !(pr.logUniform.min > 0 && pr.logUniform.max > pr.logUniform.min)) throw new RangeError(`${label}.logUniform needs 0 < min < max`)
    if (pr.gaussian && !(pr.gaussian.sigma > 0)) throw new RangeError(`${label}.gaussian.sigma must be > 0`)
    const kind = pr.uniform ? 0 : pr.logUniform ? 1 : 2
    const lo = pr.uniform?.min ?? pr.logUniform?.min ?? 0
    const hi = pr.uniform?.max ?? pr.logUniform?.max ?? 0
    const mu = pr.gaussian?.mu ?? 0.5 * (lo + hi)
    const sigma = pr.gaussian?.sigma ?? 1
    const norm = kind === 0 ? -Math.log(hi - lo) : kind === 1 ? -Math.log(Math.log(hi / lo)) : -Math.log(sigma) - 0.5 * LN_2PI
    return { param: pr.param, index: planetParam ? pr.planet! : pr.instrument!, kind, lo, hi, mu, sigma, norm }
  })

  // ---- scratch and per-row constants
  const model = new Float64Array(n)
  const dt = new Float64Array(n), dt2 = new Float64Array(n), dy2 = new Float64Array(n)
  for (let i = 0; i < n; i++) { dt[i] = data.t[i] - epoch; dt2[i] = dt[i] * dt[i]; dy2[i] = data.dy[i] * data.dy[i] }
  const { t, y, instrument } = data
  const orbits: Keplerian[] = spec.planets.map(() => ({ period: 1, K: 0, e: 0, omega: 0, tp: 0 }))
  const s2 = new Float64Array(nInst)
  let fixedLogDet = 0
  if (fixedJitter) {
    for (let i = 0; i < n; i++) fixedLogDet += Math.log(dy2[i] + fixedJitter[instrument[i]] ** 2)
    for (let k = 0; k < nInst; k++) s2[k] = fixedJitter[k] ** 2
  }
  const constTerm = n * LN_2PI
  const ex = new Float64Array(nPl), om = new Float64Array(nPl), tcs = new Float64Array(nPl)

  /** Fills orbits / ex / om from x; returns the prior's Jacobian terms, or −Infinity outside the bounds. */
  const unpack = (x: ArrayLike<number>): number => {
    let jac = 0
    for (let k = 0; k < nPl; k++) {
      const c = coords[k]
      let P = c.fixed.period, K = c.fixed.K, e = c.fixed.e, w = c.fixed.omega
      if (c.lnP >= 0) {
        const lnP = x[c.lnP]
        if (!(lnP < 700 && lnP > -700)) return -Infinity
        P = Math.exp(lnP)
        if (P > maxPlanetPeriod) return -Infinity
        jac += lnP
      }
      if (c.lnK >= 0) {
        const lnK = x[c.lnK]
        if (!(lnK < 700 && lnK > -700)) return -Infinity
        K = Math.exp(lnK)
        jac += lnK
      }
      if (c.h >= 0) {
        const h = x[c.h], kk = x[c.k]
        e = h * h + kk * kk
        if (!(e < eMax)) return -Infinity
        w = e > 0 ? Math.atan2(kk, h) : 0
      } else if (c.e >= 0) {
        e = x[c.e]
        if (!(e >= 0 && e < eMax)) return -Infinity
      } else if (c.omega >= 0) {
        w = x[c.omega]
        if (!(w >= omegaLo[k] && w < omegaLo[k] + TWO_PI)) return -Infinity
      }
      let tc: number
      if (c.tc >= 0) {
        tc = x[c.tc]
        if (!Number.isFinite(tc)) return -Infinity
        if (gp && !(Math.abs(tc - centre[c.tc]) <= 0.5 * P)) return -Infinity
      }
      else tc = c.fixed.tp === null ? c.fixed.tc : tpToTc(c.fixed.tp, P, e, w)
      const orb = orbits[k]
      orb.period = P; orb.K = K; orb.e = e; orb.omega = w
      orb.tp = c.fixed.tp === null ? tcToTp(tc, P, e, w) : c.fixed.tp
      ex[k] = e; om[k] = w; tcs[k] = tc
    }
    if (iJitter >= 0) {
      for (let k = 0; k < nInst; k++) {
        const ls = x[iJitter + k]
        if (!(ls < 350 && ls > -350)) return -Infinity
        s2[k] = Math.exp(2 * ls)
        jac += ls
      }
    }
    for (let d = iOffset; d < nDim; d++) if (!Number.isFinite(x[d])) return -Infinity
    if (gp) jac += gp.prior(x)
    return jac
  }

  const statedPriors = (x: ArrayLike<number>): number => {
    let s = 0
    for (let j = 0; j < priors.length; j++) {
      const pr = priors[j]
      let v: number
      switch (pr.param) {
        case 'period': v = orbits[pr.index].period; break
        case 'K': v = orbits[pr.index].K; break
        case 'e': v = ex[pr.index]; break
        case 'omegaDeg': {
          v = om[pr.index] / DEG
          const ref = pr.kind === 2 ? pr.mu : 0.5 * (pr.lo + pr.hi)
          v = ref + ((((v - ref) % 360) + 540) % 360) - 180
          break
        }
        case 'tc': v = tcs[pr.index]; break
        case 'tp': {
          const ref = pr.kind === 2 ? pr.mu : 0.5 * (pr.lo + pr.hi)
          v = nearestEpoch(orbits[pr.index].tp, orbits[pr.index].period, ref)
          break
        }
        case 'offset': v = x[iOffset + pr.index]; break
        default: v = Math.sqrt(s2[pr.index])
      }
      if (pr.kind === 2) { const z = (v - pr.mu) / pr.sigma; s += -0.5 * z * z + pr.norm }
      else if (v < pr.lo || v > pr.hi) return -Infinity
      else s += pr.kind === 1 ? pr.norm - Math.log(v) : pr.norm
    }
    return s
  }

  let dyMin2 = Infinity, dyMax2 = 0
  for (let i = 0; i < n; i++) { dyMin2 = Math.min(dyMin2, dy2[i]); dyMax2 = Math.max(dyMax2, dy2[i]) }

  const likelihood = (x: ArrayLike<number>): number => {
    // model = offsets + trend, then the Keplerians added in place
    const slope = iSlope >= 0 ? x[iSlope] : 0
    const curv = iCurvature >= 0 ? x[iCurvature] : 0
    for (let i = 0; i < n; i++) model[i] = x[iOffset + instrument[i]] + slope * dt[i] + curv * dt2[i]
    for (let k = 0; k < nPl; k++) addKeplerian(t, orbits[k], model)
    if (gp) {
      for (let i = 0; i < n; i++) model[i] = y[i] - model[i]
      return gp.logLikelihood(model, s2)
    }
    let chi2 = 0, logDet = 0
    if (fixedJitter) {
      for (let i = 0; i < n; i++) { const r = y[i] - model[i]; chi2 += r * r / (dy2[i] + s2[instrument[i]]) }
      logDet = fixedLogDet
    } else {
      let maxS2 = 0
      for (let k = 0; k < nInst; k++) if (s2[k] > maxS2) maxS2 = s2[k]
      if (dyMin2 > 1e-18 && dyMax2 + maxS2 < 1e18) {
        // Σ ln V as logs of products of 16 variances (each product within 1e±288, no over- or
        // underflow): 1/16 of the logarithms, same value to ~1e-14
        let prod = 1, cnt = 0
        for (let i = 0; i < n; i++) {
          const r = y[i] - model[i]
          const V = dy2[i] + s2[instrument[i]]
          chi2 += r * r / V
          prod *= V
          if (++cnt === 16) { logDet += Math.log(prod); prod = 1; cnt = 0 }
        }
        logDet += Math.log(prod)
      } else {
        for (let i = 0; i < n; i++) {
          const r = y[i] - model[i]
          const V = dy2[i] + s2[instrument[i]]
          chi2 += r * r / V
          logDet += Math.log(V)
        }
      }
    }
    const ll = -0.5 * (chi2 + logDet + constTerm)
    return Number.isNaN(ll) ? -Infinity : ll
  }

  const logPrior = (x: ArrayLike<number>): number => {
    if (x.length !== nDim) throw new RangeError(`x must have ${nDim} coordinates, got ${x.length}`)
    const jac = unpack(x)
    if (jac === -Infinity) return -Infinity
    return jac + statedPriors(x)
  }
  const logLikelihood = (x: ArrayLike<number>): number => {
    if (x.length !== nDim) throw new RangeError(`x must have ${nDim} coordinates, got ${x.length}`)
    if (unpack(x) === -Infinity) return -Infinity
    return likelihood(x)
  }
  const logProb = (x: ArrayLike<number>): number => {
    const jac = unpack(x)
    if (jac === -Infinity) return -Infinity
    const lp = jac + statedPriors(x)
    if (lp === -Infinity) return -Infinity
    return lp + likelihood(x)
  }
  return {
    nDim, names, units, epoch, eMax, centre: Float64Array.from(centre),
    layout: { nPlanets: nPl, planets: coords, nInst, iOffset, iJitter, iSlope, iCurvature, gp: gp ? gp.coords : null },
    logProb, logLikelihood, logPrior, noisePriors: gp ? gp.priors : [],
  }
}

/**
 * Parameters a fit held fixed, per planet, read from the fitter's mark: an error of exactly 0
 * (PlanetFit.uncertainty: "0 for fixed parameters"). e fixed at 0 also fixes ω (it has no meaning);
 * a fixed phase is Tc when Tc's error is 0, else Tp when Tp's is. Use the model's own `fix` lists
 * when you have them; this is for a bare FitResult.
 */
export function fixedInFit(fit: FitResult): PlanetParam[][] {
  return fit.planets.map((p) => {
    const u = p.uncertainty
    const out: PlanetParam[] = []
    if (u.period === 0) out.push('period')
    if (u.K === 0) out.push('K')
    if (u.e === 0) out.push('e')
    if (u.omegaDeg === 0 || (u.e === 0 && p.e === 0)) out.push('omegaDeg')
    if (u.tc === 0) out.push('tc')
    else if (u.tp === 0) out.push('tp')
    return out
  })
}

/**
 * The centre of a posterior from a fit: planets (with the parameters the model fixes, `extra.fix`
 * or else `fixedInFit`), offsets, jitters (sampled unless every instrument's jitter error is
 * exactly 0, the fitter's mark of a fixed jitter), trend, epoch.
 */
export function specFromFit(fit: FitResult, extra: { priors?: SamplingPrior[]; eMax?: number; jitter?: 'fit' | number[]; fix?: ReadonlyArray<readonly PlanetParam[] | undefined> } = {}): PosteriorSpec {
  const fixed = fit.instruments.length > 0 && fit.instruments.every((s) => s.jitterErr === 0)
  const inferred = extra.fix ? null : fixedInFit(fit)
  return {
    planets: fit.planets.map((p, k) => {
      const fix = (extra.fix ? extra.fix[k] : inferred![k]) ?? []
      return { period: p.period, K: p.K, e: p.e, omegaDeg: p.omegaDeg, tc: p.tc, tp: p.tp, ...(fix.length ? { fix: [...fix] } : {}) }
    }),
    trend: fit.trend?.kind ?? 'none',
    epoch: fit.epoch,
    jitter: extra.jitter ?? (fixed ? fit.instruments.map((s) => s.jitter) : 'fit'),
    offsets: fit.instruments.map((s) => s.offset),
    jitters: fit.instruments.map((s) => s.jitter),
    slope: fit.trend?.slope,
    curvature: fit.trend?.curvature,
    priors: extra.priors,
    eMax: extra.eMax,
  }
}

/**
 * Per-coordinate 1σ scales of the sampling coordinates from a fit's covariance errors (first-order
 * propagation to ln P, ln K, √e cos ω, √e sin ω, ln s); `fallback` replaces NaN or zero errors.
 */
export function samplingScales(fit: FitResult, post: LogPosterior): Float64Array {
  const sc = new Float64Array(post.nDim)
  const ok = (v: number, fb: number): number => (Number.isFinite(v) && v > 0 ? v : fb)
  fit.planets.forEach((p, k) => {
    const c = post.layout.planets[k]
    const u = p.uncertainty
    const se = Math.sqrt(p.e), w = p.omega
    const sw = ok(u.omegaDeg * DEG, 0.1), sE = ok(u.e, 0.02)
    const de = se > 1e-3 ? 1 / (2 * se) : 0
    if (c.lnP >= 0) sc[c.lnP] = ok(u.period / p.period, 1e-4)
    if (c.lnK >= 0) sc[c.lnK] = ok(u.K / p.K, 0.05)
    if (c.h >= 0) {
      sc[c.h] = ok(Math.hypot(Math.cos(w) * de * sE, se * Math.sin(w) * sw), 0.03)
      sc[c.k] = ok(Math.hypot(Math.sin(w) * de * sE, se * Math.cos(w) * sw), 0.03)
    }
    if (c.e >= 0) sc[c.e] = sE
    if (c.omega >= 0) sc[c.omega] = sw
    if (c.tc >= 0) sc[c.tc] = ok(u.tc, 1e-3 * p.period)
  })
  const L = post.layout
  fit.instruments.forEach((s, k) => {
    sc[L.iOffset + k] = ok(s.offsetErr, 1)
    if (L.iJitter >= 0) sc[L.iJitter + k] = ok(s.jitter > 0 ? s.jitterErr / s.jitter : NaN, 0.3)
  })
  if (L.iSlope >= 0) sc[L.iSlope] = ok(fit.trend?.slopeErr ?? NaN, 1e-3)
  if (L.iCurvature >= 0) sc[L.iCurvature] = ok(fit.trend?.curvatureErr ?? NaN, 1e-6)
  return sc
}

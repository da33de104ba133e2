/**
 * Jacobian of the fitter's whitened residual vector (orbit-fit-objective.ts) with respect to the
 * free vector x, at fixed weights.
 *
 * The offsets and trend are solved exactly at every x (variable projection, Golub & Pereyra 1973,
 * SIAM J. Numer. Anal. 10, 413), so the data rows are r = W^½ (I − P_W)(y − m(x)) with P_W the
 * weighted projection onto the linear columns, and ∂r/∂x_j = −W^½ (I − P_W) ∂m/∂x_j: each column
 * is the Keplerian model's derivative with its weighted linear fit removed (the Kaufman form of the
 * variable-projection Jacobian; Golub & Pereyra 2003, Inverse Problems 19, R1, §3).
 *
 * ∂m/∂x_j comes from one Kepler solve per planet (model-partials.ts) and the chain rule through
 * x → (P, K, e, ω, Tp) of orbit-fit-layout.ts: Tp = Tc − P M_c(e, ω)/2π, with M_c the mean
 * anomaly of conjunction (its two derivatives by central differences of that scalar function);
 * with √e cos ω, √e sin ω free, e = a² + b² and ω = atan2(b, a). At e = 0 with both free that map
 * is singular (ω undefined): that planet's columns are then forward differences of the whole
 * residual vector, as is the Gaussian-prior part of every column. `jacobianByDifferences` is the
 * readable reference (forward differences throughout), tested against `jacobian`.
 */
import { tcToTp } from './model.ts'
import { keplerianPartials, keplerianPartialsBuffers, type KeplerianPartials } from './model-partials.ts'
import { linearScratch, prepareProjection, removeLinearFit, type LinearScratch } from './orbit-fit-linear.ts'
import { unpack, type FitLayout } from './orbit-fit-layout.ts'
import {
  addPlanet, insideUniformPriors, keplerModel, nGaussianPriors, priorResiduals, residualFromModel, type Workspace,
} from './orbit-fit-objective.ts'

const TWO_PI = 2 * Math.PI

/** Reusable buffers of the Jacobian (one set per fit). */
export interface JacobianScratch {
  partials: KeplerianPartials
  /** ∂m/∂x_j of the planet being differentiated, then its projected column. */
  col: Float64Array
  kep: Float64Array
  kepAll: Float64Array
  own: Float64Array
  rt: Float64Array
  xt: Float64Array
  linear: LinearScratch
  resid: Float64Array
  prior: Float64Array
  priorT: Float64Array
}

export function jacobianScratch(L: FitLayout): JacobianScratch {
  const m = L.n + nGaussianPriors(L)
  return {
    partials: keplerianPartialsBuffers(L.n), col: new Float64Array(L.n), kep: new Float64Array(L.n), kepAll: new Float64Array(L.n),
    own: new Float64Array(L.n), rt: new Float64Array(m), xt: new Float64Array(L.nFree), linear: linearScratch(L.nLin),
    resid: new Float64Array(L.n), prior: new Float64Array(nGaussianPriors(L)), priorT: new Float64Array(nGaussianPriors(L)),
  }
}

/** M_c(e, ω): the mean anomaly of inferior conjunction (rad), through the layout's own Tc → Tp map. */
const conjunctionM = (e: number, omega: number): number => -tcToTp(0, TWO_PI, e, omega)
/** Difference of two mean anomalies wrapped to (−π, π] (M_c jumps by 2π where ν_c wraps). */
const wrapped = (d: number): number => d - TWO_PI * Math.round(d / TWO_PI)

/** ∂M_c/∂e and ∂M_c/∂ω by central differences (one-sided near e = 0 and e = 1). */
function conjunctionSlopes(e: number, omega: number): [number, number] {
  const h = 1e-6
  const lo = Math.max(e - h, 0), hi = Math.min(e + h, 0.999999)
  const dE = wrapped(conjunctionM(hi, omega) - conjunctionM(lo, omega)) / (hi - lo)
  const dW = wrapped(conjunctionM(e, omega + h) - conjunctionM(e, omega - h)) / (2 * h)
  return [dE, dW]
}

/**
 * ∂m/∂x_j of planet k's velocity for each of its free parameters j, handed to `emit(j, column)`
 * (the column buffer is reused between calls). False when the map x → elements is singular there
 * (e = 0 with √e cos ω and √e sin ω both free): nothing is emitted.
 */
export function planetColumns(L: FitLayout, x: ArrayLike<number>, k: number, s: JacobianScratch, emit: (j: number, col: Float64Array) => void): boolean {
  const pl = L.layouts[k]
  const el = unpack(L, x, k)
  if (pl.ecc === 'both' && !(el.e > 1e-12)) return false
  const { period: P, e } = el
  const p = s.partials
  keplerianPartials(L.data.t, { period: P, K: el.K, e, omega: el.omega, tp: el.tp }, p)
  const n = L.n, col = s.col
  const nMean = TWO_PI / P
  // Tp from Tc (unless Tp itself is held): Tp = Tc − P M_c(e, ω)/2π
  const fromTc = pl.phaseFixed !== 'tp'
  const Mc = fromTc ? conjunctionM(e, el.omega) : 0
  const [McE, McW] = fromTc && pl.ecc !== 'none' ? conjunctionSlopes(e, el.omega) : [0, 0]
  const tpP = fromTc ? -Mc / TWO_PI : 0, tpE = -P / TWO_PI * McE, tpW = -P / TWO_PI * McW
  if (pl.iP >= 0) {
    // ∂v/∂P = dv/dM (∂M/∂P + ∂M/∂Tp ∂Tp/∂P) = dv/dM (−M/P − n ∂Tp/∂P)
    for (let i = 0; i < n; i++) col[i] = p.dM[i] * (-p.M[i] / P - nMean * tpP)
    emit(pl.iP, col)
  }
  if (pl.iK >= 0) emit(pl.iK, p.dK)
  if (pl.iTc >= 0) {
    for (let i = 0; i < n; i++) col[i] = -nMean * p.dM[i]
    emit(pl.iTc, col)
  }
  if (pl.ecc === 'none') return true
  // total derivatives in e and ω, Tp following through M_c
  const eCol = (i: number): number => p.de[i] - nMean * p.dM[i] * tpE
  const wCol = (i: number): number => p.dw[i] - nMean * p.dM[i] * tpW
  if (pl.ecc === 'omega') {
    for (let i = 0; i < n; i++) col[i] = wCol(i)
    emit(pl.iA, col)
  } else if (pl.ecc === 'sqrte') {
    const de = 2 * x[pl.iA]
    for (let i = 0; i < n; i++) col[i] = eCol(i) * de
    emit(pl.iA, col)
  } else {
    const a = x[pl.iA], b = x[pl.iB]
    // e = a² + b², ω = atan2(b, a)
    for (let i = 0; i < n; i++) col[i] = eCol(i) * 2 * a - wCol(i) * b / e
    emit(pl.iA, col)
    for (let i = 0; i < n; i++) col[i] = eCol(i) * 2 * b + wCol(i) * a / e
    emit(pl.iB, col)
  }
  return true
}

/**
 * Writes J (column-major: column j at J[j·m …], m = n + Gaussian priors) at x, where `r` holds the residual vector at x
 * (with `ws`'s weights). Analytic where `planetColumns` allows, forward differences elsewhere.
 */
export function jacobian(L: FitLayout, ws: Workspace, x: Float64Array, r: Float64Array, J: Float64Array, s: JacobianScratch): void {
  const nf = L.nFree, n = L.n
  const nPr = s.prior.length, m = n + nPr
  const differenced: number[] = []
  const projection = prepareProjection(L.data, L.epoch, L.nLin, ws.w, s.linear, s.resid)
  for (let k = 0; k < L.layouts.length; k++) {
    const ok = projection !== null && planetColumns(L, x, k, s, (j, d) => {
      // −W^½ (I − P_W) d: d minus its weighted linear fit, whitened
      removeLinearFit(L.data, projection, ws.w, d, s.resid)
      const c = j * m
      for (let i = 0; i < n; i++) J[c + i] = -ws.sw[i] * s.resid[i]
    })
    if (!ok) differenced.push(k)
  }
  if (nPr) {
    // prior rows: forward differences of the scalar prior residuals (no model evaluation)
    priorResiduals(L, x, s.prior, 0)
    for (let j = 0; j < nf; j++) {
      if (differenced.includes(L.owner[j])) continue
      s.xt.set(x)
      const h = L.scales[j]
      s.xt[j] += h
      priorResiduals(L, s.xt, s.priorT, 0)
      for (let q = 0; q < nPr; q++) J[j * m + n + q] = (s.priorT[q] - s.prior[q]) / h
    }
  }
  if (differenced.length) differenceColumns(L, ws, x, r, J, s, (j) => differenced.includes(L.owner[j]))
}

/** The readable reference: every column by forward differences of the whole residual vector. */
export function jacobianByDifferences(L: FitLayout, ws: Workspace, x: Float64Array, r: Float64Array, J: Float64Array, s: JacobianScratch): void {
  differenceColumns(L, ws, x, r, J, s, () => true)
}

/**
 * Forward-difference columns j for which `which(j)` holds: only the planet owning x_j is recomputed;
 * the model is linear in K (no Kepler solve for that column); a step leaving a uniform prior's box
 * is taken backwards instead.
 */
function differenceColumns(L: FitLayout, ws: Workspace, x: Float64Array, r: Float64Array, J: Float64Array, s: JacobianScratch, which: (j: number) => boolean): void {
  const nf = L.nFree, m = L.n + s.prior.length
  const { kep, kepAll, own, rt, xt } = s
  keplerModel(L, ws, x, kepAll)
  let ownOf = -1
  for (let j = 0; j < nf; j++) {
    if (!which(j)) continue
    const k = L.owner[j]
    if (k !== ownOf) { own.fill(0); addPlanet(L, ws, x, k, own); ownOf = k }
    const h = L.scales[j]
    let hh = h
    for (let pass = 0; pass < 2; pass++) {
      xt.set(x)
      xt[j] += hh
      const Kk = x[j]
      if (j === L.layouts[k].iK && Kk > 0) {
        const gK = hh / Kk
        for (let i = 0; i < L.n; i++) kep[i] = kepAll[i] + own[i] * gK
      } else {
        for (let i = 0; i < L.n; i++) kep[i] = kepAll[i] - own[i]
        addPlanet(L, ws, xt, k, kep)
      }
      const c = insideUniformPriors(L, xt) ? residualFromModel(L, ws, xt, kep, rt) : Infinity
      if (Number.isFinite(c)) break
      hh = -h
    }
    for (let i = 0; i < m; i++) J[j * m + i] = (rt[i] - r[i]) / hh
  }
}

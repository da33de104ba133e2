/**
 * Uncertainties at the optimum from the inverse Fisher information. For Gaussian data with
 * variance parameters the information is block-diagonal: Jᵀ V⁻¹ J (+ Gaussian-prior terms) for
 * the mean parameters (free Keplerian parameters, then offsets and trend) and ½ Σ (∂V/∂s)² / V²
 * for each jitter (e.g. Kay 1993, Fundamentals of Statistical Signal Processing I, §3.9).
 * Errors of the reported elements (P, K, e, ω, Tp, Tc) follow by linear propagation G C Gᵀ.
 */
import { invertSymmetric } from './linalg.ts'
import { nearestEpoch } from './model.ts'
import type { PlanetFit } from './orbit-fit-types.ts'
import { priorValue, project, unpack, wrapDegrees, type FitElements, type FitLayout } from './orbit-fit-layout.ts'
import { linearColumn } from './orbit-fit-linear.ts'
import { keplerModel, type Workspace } from './orbit-fit-objective.ts'

const TWO_PI = 2 * Math.PI
const DEG = Math.PI / 180

/** Covariance of the mean parameters [free Keplerian | linear] (row-major, np = nFree + nLin). */
export interface MeanCovariance { cov: Float64Array; np: number; ok: boolean }

/** No covariance (skipped or not computable): all NaN. */
export function emptyCovariance(L: FitLayout): MeanCovariance {
  const np = L.nFree + L.nLin
  return { cov: new Float64Array(np * np).fill(NaN), np, ok: false }
}

/** Inverse Fisher information of the mean parameters at x, weights from the workspace. */
export function meanCovariance(L: FitLayout, ws: Workspace, x: Float64Array): MeanCovariance {
  const { n, nLin, nFree } = L
  const np = nFree + nLin
  const F = new Float64Array(np * np)
  const cols = new Float64Array(n * np)
  const up = new Float64Array(n), dn = new Float64Array(n)
  const xt = new Float64Array(nFree)
  for (let j = 0; j < nFree; j++) {
    const h = L.scales[j] * 10
    xt.set(x); xt[j] = x[j] + h; project(L, xt); const hu = xt[j] - x[j]; keplerModel(L, ws, xt, up)
    xt.set(x); xt[j] = x[j] - h; project(L, xt); const hd = x[j] - xt[j]; keplerModel(L, ws, xt, dn)
    const den = hu + hd
    for (let i = 0; i < n; i++) cols[i * np + j] = den > 0 ? (up[i] - dn[i]) / den : 0
  }
  for (let i = 0; i < n; i++) for (let j = 0; j < nLin; j++) cols[i * np + nFree + j] = linearColumn(L.data, L.nInst, L.epoch, i, j)
  for (let i = 0; i < n; i++) {
    const wi = ws.w[i]
    for (let a = 0; a < np; a++) {
      const ca = cols[i * np + a]
      if (ca === 0) continue
      for (let b = a; b < np; b++) F[a * np + b] += wi * ca * cols[i * np + b]
    }
  }
  // Gaussian priors: information of (g(x) − μ)/σ, by central differences of g
  for (const pr of L.priors) {
    if (!pr.gaussian) continue
    const gr = new Float64Array(np)
    for (let j = 0; j < nFree; j++) {
      const h = L.scales[j] * 10
      xt.set(x); xt[j] += h; const vu = priorValue(unpack(L, xt, pr.planet), pr.param)
      xt.set(x); xt[j] -= h; const vd = priorValue(unpack(L, xt, pr.planet), pr.param)
      let d = vu - vd
      if (pr.param === 'omegaDeg') d = wrapDegrees(d)
      gr[j] = d / (2 * h) / pr.gaussian.sigma
    }
    for (let a = 0; a < np; a++) for (let b = a; b < np; b++) F[a * np + b] += gr[a] * gr[b]
  }
  for (let a = 0; a < np; a++) for (let b = 0; b < a; b++) F[a * np + b] = F[b * np + a]
  const inv = invertSymmetric(F, np)
  return { cov: inv.inv, np, ok: !inv.singular }
}

/** 1σ error of mean parameter j (0 ≤ j < np). */
export function meanSd(c: MeanCovariance, j: number): number {
  return Math.sqrt(Math.max(c.cov[j * c.np + j], 0))
}

/** Planet k's reported elements with errors propagated from the covariance (NaN when skipped). */
export function planetWithErrors(L: FitLayout, x: Float64Array, k: number, c: MeanCovariance, skipUnc: boolean): PlanetFit {
  const { nFree } = L
  const { cov, np } = c
  const p = unpack(L, x, k)
  const tc = nearestEpoch(p.tc, p.period, L.epoch)
  const tp = nearestEpoch(p.tp, p.period, L.epoch)
  let omega = p.omega % TWO_PI
  if (omega < 0) omega += TWO_PI
  const vec = (pp: FitElements): number[] => [pp.period, pp.K, pp.e, pp.omega / DEG, pp.tp, pp.tc]
  const base = vec(p)
  const G: number[][] = []
  const xt = new Float64Array(nFree)
  for (let j = 0; j < nFree; j++) {
    const h = L.scales[j] * 10
    xt.set(x); xt[j] = x[j] + h; const vu = vec(unpack(L, xt, k))
    xt.set(x); xt[j] = x[j] - h; const vd = vec(unpack(L, xt, k))
    const gcol = vu.map((v, q) => {
      let d = v - vd[q]
      if (q === 3) d = wrapDegrees(d)
      if (q >= 4) {
        // Tp/Tc may jump by a period across the wrap; keep the small difference
        const P = base[0]
        d = d - P * Math.round(d / P)
      }
      return d / (2 * h)
    })
    G.push(gcol)
  }
  const prop = (q1: number, q2: number): number => {
    let s = 0
    for (let a = 0; a < nFree; a++) for (let b = 0; b < nFree; b++) s += G[a][q1] * G[b][q2] * cov[a * np + b]
    return s
  }
  const u = (q: number): number => (skipUnc ? NaN : Math.sqrt(Math.max(prop(q, q), 0)))
  const covPKe = [0, 1, 2].flatMap((a) => [0, 1, 2].map((b) => (skipUnc ? NaN : prop(a, b))))
  return {
    period: p.period, K: p.K, e: p.e, omega, omegaDeg: omega / DEG, tp, tc,
    secosw: Math.sqrt(p.e) * Math.cos(p.omega), sesinw: Math.sqrt(p.e) * Math.sin(p.omega),
    uncertainty: { period: u(0), K: u(1), e: u(2), omegaDeg: u(3), tp: u(4), tc: u(5) },
    covPKe,
  }
}

/**
 * 1σ error of a fitted jitter s from its Fisher information ½ Σ (2s)²/V² = 2 s² Σ 1/V²
 * (`sumInvV2` = Σ 1/V² over the instrument's points); NaN at s = 0 (boundary).
 */
export function jitterError(s: number, sumInvV2: number): number {
  return s > 0 ? 1 / Math.sqrt(2 * s * s * sumInvV2) : NaN
}

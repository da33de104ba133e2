/**
 * "No planet without a warrant": checks of a fitted signal that decide whether the search may
 * keep it, and flags that travel with it to every screen. Plain data with readable messages.
 *
 * - rejection: the fit of the model with the signal did not converge, or the signal's errors are
 *   unconstrained (σK ≥ K or σP ≥ P, or not finite: the data do not pin the orbit down);
 *   or it is carried by one instrument (≥ `oneInstrumentShare` of its likelihood gain) whose
 *   span covers fewer than three of its cycles (that instrument alone cannot tell a period from a
 *   drift of its zero point, and no other instrument confirms it).
 * - warning: carried by one instrument (otherwise); period longer than the span of the instrument
 *   that carries it; period beyond the baseline ("period poorly constrained": only a partial orbit
 *   is seen); one instrument's jitter far above its peers' (something unmodelled in that
 *   instrument, or a signal absorbed by its jitter).
 * - info: the runner-up alias partner and its ΔlnL; a trend that could be a long-period orbit
 *   (both fitted, both shown; added by the search).
 */
import { addKeplerian } from '../model.ts'
import type { RvData } from '../orbit-data.ts'
import type { FitResult, PlanetFit } from '../orbit-fit.ts'

export type SignalFlagKind =
  | 'not-converged' | 'unconstrained' | 'one-instrument-short-span'
  | 'one-instrument' | 'longer-than-instrument-span' | 'period-beyond-baseline' | 'jitter-above-peers'
  | 'alias-runner-up' | 'trend-or-long-orbit' | 'fap-threshold-unused'

export interface SignalFlag {
  kind: SignalFlagKind
  /** 'rejection': the signal is not kept; 'warning': kept, read with care; 'info': context. */
  severity: 'rejection' | 'warning' | 'info'
  /** Period of the signal concerned (d), null for model-level flags. */
  period: number | null
  /** Instrument concerned, if any. */
  instrument: string | null
  message: string
}

/** Share of one planet's likelihood gain contributed by each instrument. */
export interface InstrumentShare { name: string; dLnL: number; share: number; span: number }

/**
 * ΔlnL per instrument between the fit and the same fit with planet `index` removed (offsets,
 * trend and jitters held): how much each instrument's data "want" the signal.
 */
export function instrumentShares(data: RvData, fit: FitResult, index: number): InstrumentShare[] {
  const p = fit.planets[index]
  const n = data.t.length
  const kep = new Float64Array(n)
  addKeplerian(data.t, { period: p.period, K: p.K, e: p.e, omega: p.omega, tp: p.tp }, kep)
  const nInst = data.instrumentNames.length
  const d = new Float64Array(nInst), tmin = new Float64Array(nInst).fill(Infinity), tmax = new Float64Array(nInst).fill(-Infinity)
  for (let i = 0; i < n; i++) {
    const k = data.instrument[i], s = fit.instruments[k].jitter
    const V = data.dy[i] ** 2 + s * s
    const r = fit.residuals[i], r0 = r + kep[i]
    d[k] += 0.5 * (r0 * r0 - r * r) / V
    tmin[k] = Math.min(tmin[k], data.t[i]); tmax[k] = Math.max(tmax[k], data.t[i])
  }
  let tot = 0
  for (let k = 0; k < nInst; k++) tot += Math.max(0, d[k])
  return data.instrumentNames.map((name, k) => ({
    name, dLnL: d[k], share: tot > 0 ? Math.max(0, d[k]) / tot : 0, span: Number.isFinite(tmax[k]) ? tmax[k] - tmin[k] : 0,
  }))
}

const fmtP = (p: number): string => (p >= 100 ? p.toFixed(0) : p >= 10 ? p.toFixed(1) : p.toFixed(3))

/** Rejections of a newly added planet (empty: it may be kept). */
export function rejections(data: RvData, fit: FitResult, index: number, oneInstrumentShare: number): SignalFlag[] {
  const p: PlanetFit = fit.planets[index]
  const out: SignalFlag[] = []
  const base = { period: p.period, instrument: null, severity: 'rejection' as const }
  if (fit.status !== 'converged') {
    out.push({ ...base, kind: 'not-converged', message: `The ${fmtP(p.period)}-d signal was not kept: the fit with it did not converge (${fit.message}).` })
  }
  const u = p.uncertainty
  if (!(Number.isFinite(u.K) && u.K < p.K) || !(Number.isFinite(u.period) && u.period < p.period)) {
    out.push({
      ...base, kind: 'unconstrained',
      message: `The ${fmtP(p.period)}-d signal was not kept: its errors are unconstrained (K = ${p.K.toFixed(2)} ± ${u.K.toPrecision(3)} m/s, P = ${fmtP(p.period)} ± ${u.period.toPrecision(3)} d).`,
    })
  }
  if (data.instrumentNames.length > 1) {
    const shares = instrumentShares(data, fit, index)
    const top = shares.reduce((a, b) => (b.share > a.share ? b : a))
    if (top.share >= oneInstrumentShare && top.span < 3 * p.period) {
      out.push({
        ...base, kind: 'one-instrument-short-span', instrument: top.name,
        message: `The ${fmtP(p.period)}-d signal was not kept: ${(top.share * 100).toFixed(0)} % of its likelihood gain comes from ${top.name} alone, whose ${top.span.toFixed(0)}-d span covers fewer than three cycles; no other instrument confirms it.`,
      })
    }
  }
  return out
}

/** Warnings about the kept planets and the instruments of a final fit. */
export function warnings(data: RvData, fit: FitResult, opts: { oneInstrumentShare: number; jitterPeerFactor: number }): SignalFlag[] {
  const out: SignalFlag[] = []
  let tmin = Infinity, tmax = -Infinity
  for (const t of data.t) { tmin = Math.min(tmin, t); tmax = Math.max(tmax, t) }
  const baseline = tmax - tmin
  fit.planets.forEach((p, j) => {
    const base = { period: p.period, severity: 'warning' as const }
    if (p.period > baseline) {
      out.push({
        ...base, kind: 'period-beyond-baseline', instrument: null,
        message: `Period poorly constrained: ${fmtP(p.period)} d is longer than the ${baseline.toFixed(0)}-d baseline, so only part of one orbit is seen (P ± ${p.uncertainty.period.toPrecision(3)} d).`,
      })
    }
    if (data.instrumentNames.length > 1) {
      const shares = instrumentShares(data, fit, j)
      const top = shares.reduce((a, b) => (b.share > a.share ? b : a))
      if (top.share >= opts.oneInstrumentShare) {
        out.push({
          ...base, kind: 'one-instrument', instrument: top.name,
          message: `The ${fmtP(p.period)}-d signal is carried by one instrument: ${(top.share * 100).toFixed(0)} % of its likelihood gain comes from ${top.name}. Check it against that instrument's systematics.`,
        })
        if (p.period > top.span) {
          out.push({
            ...base, kind: 'longer-than-instrument-span', instrument: top.name,
            message: `The ${fmtP(p.period)}-d signal is longer than the ${top.span.toFixed(0)}-d span of ${top.name}, the instrument that carries it.`,
          })
        }
      }
    }
  })
  // jitter far above peers
  const nInst = fit.instruments.length
  if (nInst > 1) {
    fit.instruments.forEach((ins, k) => {
      const peers = fit.instruments.filter((_, j) => j !== k).map((i) => i.jitter).sort((a, b) => a - b)
      const med = peers[Math.floor(peers.length / 2)]
      const errs: number[] = []
      for (let i = 0; i < data.t.length; i++) if (data.instrument[i] === k) errs.push(data.dy[i])
      errs.sort((a, b) => a - b)
      const medErr = errs.length ? errs[Math.floor(errs.length / 2)] : 0
      if (ins.jitter > opts.jitterPeerFactor * Math.max(med, 1e-9) && ins.jitter > medErr && ins.jitter > 1) {
        out.push({
          kind: 'jitter-above-peers', severity: 'warning', period: null, instrument: ins.name,
          message: `${ins.name}'s jitter (${ins.jitter.toFixed(1)} m/s) is far above its peers' (median ${med.toFixed(1)} m/s): something in its data is not modelled (a missed signal, a zero-point drift or outliers).`,
        })
      }
    })
  }
  return out
}

/**
 * "No planet without a warrant": checks of a fitted signal that decide whether the search may
 * keep it, and flags that travel with it to every screen. Plain data with readable messages.
 *
 * - rejection: the fit of the model with the signal did not converge, or the signal's errors are
 *   unconstrained (σK ≥ K or σP ≥ P, or not finite: the data do not pin the orbit down); its
 *   eccentricity is at the fitter's limit (> 0.95) or its gain rests on fewer than about four
 *   measurements (a periastron spike through outliers);
 *   or it is carried by one instrument (≥ `oneInstrumentShare` of its likelihood gain) whose
 *   span covers fewer than three of its cycles (that instrument alone cannot tell a period from a
 *   drift of its zero point), or ≥ 60 % of it comes from one instrument whose data span less than
 *   a quarter of the baseline — in both cases only when the other instruments do not confirm it
 *   (their own gain ΔlnL < 10 at the signal's period).
 * - warning: e ≥ 0.8 (an orbit that rests on its periastron passages: check how many points and
 *   passages sample them); carried by one instrument (otherwise); period longer than the span of the instrument
 *   that carries it; period beyond the baseline ("period poorly constrained": only a partial orbit
 *   is seen); one instrument's jitter far above its peers' (something unmodelled in that
 *   instrument, or a signal absorbed by its jitter).
 * - candidate (a warning that stops the count): most (≥ half) of the signal's likelihood gain comes
 *   from one instrument whose span is shorter than the signal's period, while the data as a whole
 *   span more than the period: the instrument that "sees" it saw less than one cycle, and the
 *   instruments that could have seen several cycles contribute the minority. In 'auto' mode such a
 *   signal is reported as a flagged candidate with its fit, not counted as a planet
 *   ({@link candidateDoubts}).
 * - info: the runner-up alias partner and its ΔlnL; a trend that could be a long-period orbit
 *   (both fitted, both shown; added by the search).
 */
import { addKeplerian } from '../model.ts'
import type { RvData } from '../orbit-data.ts'
import type { FitResult, PlanetFit } from '../orbit-fit.ts'

export type SignalFlagKind =
  | 'not-converged' | 'unconstrained' | 'one-instrument-short-span' | 'eccentricity-at-limit' | 'few-points' | 'false-alarm'
  | 'one-instrument' | 'high-eccentricity' | 'longer-than-instrument-span' | 'period-beyond-baseline' | 'jitter-above-peers'
  | 'alias-runner-up' | 'trend-or-long-orbit' | 'fap-threshold-unused' | 'candidate-short-instrument' | 'candidate-eccentric-short-period'

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

/**
 * Effective number of measurements carrying planet `index`: the participation ratio
 * (Σ g_i)² / Σ g_i² of the positive per-point likelihood gains g_i (the same comparison as
 * {@link instrumentShares}, point by point). About N/2 for a sinusoid seen by N points; 1–3 for a
 * periastron spike fitted through one or two outliers.
 */
export function carryingPoints(data: RvData, fit: FitResult, index: number): number {
  const p = fit.planets[index]
  const n = data.t.length
  const kep = new Float64Array(n)
  addKeplerian(data.t, { period: p.period, K: p.K, e: p.e, omega: p.omega, tp: p.tp }, kep)
  let s1 = 0, s2 = 0
  for (let i = 0; i < n; i++) {
    const s = fit.instruments[data.instrument[i]].jitter
    const V = data.dy[i] ** 2 + s * s
    const r = fit.residuals[i], r0 = r + kep[i]
    const g = 0.5 * (r0 * r0 - r * r) / V
    if (g > 0) { s1 += g; s2 += g * g }
  }
  return s2 > 0 ? s1 * s1 / s2 : 0
}

/** Share of the gain from one instrument spanning under a quarter of the baseline that rejects an unconfirmed signal. */
export const SHORT_SPAN_SHARE = 0.6
/**
 * The other instruments confirm a signal when their own likelihood gain at its period reaches this:
 * for 4 parameters at a known period P(χ²₄ > 20) = 11 e⁻¹⁰ ≈ 5e-4.
 */
export const CONFIRM_LNL = 10
/** Eccentricity from which a kept orbit is flagged for its periastron coverage. */
export const E_HIGH = 0.8

/** Eccentricity above which a fitted orbit is taken as a spike at the fitter's limit (E_MAX = 0.99). */
export const E_SPIKE = 0.95
/** Fewest effective measurements ({@link carryingPoints}) a kept signal must rest on. */
export const MIN_CARRYING_POINTS = 4

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
  if (p.e > E_SPIKE) {
    out.push({ ...base, kind: 'eccentricity-at-limit', message: `The ${fmtP(p.period)}-d signal was not kept: its eccentricity ${p.e.toFixed(3)} is at the limit of the fit (> ${E_SPIKE}), the mark of a spike fitted through a few points.` })
  }
  const carrying = carryingPoints(data, fit, index)
  if (carrying < MIN_CARRYING_POINTS) {
    out.push({ ...base, kind: 'few-points', message: `The ${fmtP(p.period)}-d signal was not kept: its likelihood gain rests on about ${carrying.toFixed(1)} measurements (fewer than ${MIN_CARRYING_POINTS}); outliers can do that.` })
  }
  if (data.instrumentNames.length > 1) {
    const shares = instrumentShares(data, fit, index)
    const top = shares.reduce((a, b) => (b.share > a.share ? b : a))
    let tmin = Infinity, tmax = -Infinity
    for (const t of data.t) { tmin = Math.min(tmin, t); tmax = Math.max(tmax, t) }
    let others = 0
    for (const sh of shares) if (sh !== top) others += sh.dLnL
    const unconfirmed = others < CONFIRM_LNL
    const fewCycles = unconfirmed && top.share >= oneInstrumentShare && top.span < 3 * p.period
    const shortSpan = unconfirmed && top.share >= SHORT_SPAN_SHARE && top.span < (tmax - tmin) / 4
    if (fewCycles || shortSpan) {
      out.push({
        ...base, kind: 'one-instrument-short-span', instrument: top.name,
        message: fewCycles
          ? `The ${fmtP(p.period)}-d signal was not kept: ${(top.share * 100).toFixed(0)} % of its likelihood gain comes from ${top.name} alone, whose ${top.span.toFixed(0)}-d span covers fewer than three cycles; the other instruments do not confirm it (their ΔlnL ${others.toFixed(1)} < ${CONFIRM_LNL}).`
          : `The ${fmtP(p.period)}-d signal was not kept: ${(top.share * 100).toFixed(0)} % of its likelihood gain comes from ${top.name}, whose data span only ${top.span.toFixed(0)} of the ${(tmax - tmin).toFixed(0)} days; the instruments covering the rest do not confirm it (their ΔlnL ${others.toFixed(1)} < ${CONFIRM_LNL}).`,
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
    if (p.e >= E_HIGH) {
      // points within the periastron passage: |M| < the time the star spends within ±90° of periastron's anomaly
      const win = (1 - p.e) ** 1.5 / Math.sqrt(1 + p.e) / 2
      const passages = new Set<number>()
      let inside = 0
      for (const t of data.t) {
        const ph = (t - p.tp) / p.period
        const c = Math.round(ph)
        if (Math.abs(ph - c) < win) { inside++; passages.add(c) }
      }
      out.push({
        ...base, kind: 'high-eccentricity', instrument: null,
        message: `The ${fmtP(p.period)}-d orbit is highly eccentric (e = ${p.e.toFixed(2)}): it rests on ${inside} measurement${inside === 1 ? '' : 's'} near periastron in ${passages.size} passage${passages.size === 1 ? '' : 's'}. Check that they are not outliers or an instrument's drift.`,
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

/** Share of a signal's gain from one instrument above which that instrument "carries most of it" ({@link candidateDoubts}). */
export const CARRIER_SHARE = 0.5

/**
 * Doubts that make a newly added signal a flagged candidate instead of a planet (empty: none).
 * - ≥ {@link CARRIER_SHARE} of its likelihood gain comes from one instrument whose span is
 *   shorter than the period, while the whole data set spans more than the period, and the other
 *   instruments do not detect it on their own: their gain at the fitted orbit is below the BIC bar
 *   for one more planet in their data alone, (bicThreshold + 5 ln N_others) / 2 (Schwarz 1978; five
 *   orbital elements). A period beyond the baseline is not a doubt here (every instrument then sees
 *   part of an orbit; that is the 'period-beyond-baseline' warning).
 * - A short period with a high eccentricity ({@link SHORT_ECCENTRIC}): orbits this close are
 *   expected to be circularised by tides (common practice; the Keplerian periodogram's cells use the
 *   same thresholds), and on simulated noise such fits were the false alarms that passed every other
 *   rule (scripts/calibrate-false-alarm.ts): a narrow periastron spike fitted to a few points.
 */
export function candidateDoubts(data: RvData, fit: FitResult, index: number, bicThreshold = 10): SignalFlag[] {
  return [...shortInstrumentDoubt(data, fit, index, bicThreshold), ...eccentricShortPeriodDoubt(fit, index)]
}

/** Below this period (d) an orbit at or above this eccentricity is a doubt ({@link candidateDoubts}). */
export const SHORT_ECCENTRIC = Object.freeze({ period: 10, e: 0.5 })

function eccentricShortPeriodDoubt(fit: FitResult, index: number): SignalFlag[] {
  const p = fit.planets[index]
  if (!(p.period < SHORT_ECCENTRIC.period && p.e >= SHORT_ECCENTRIC.e)) return []
  return [{
    kind: 'candidate-eccentric-short-period', severity: 'warning', period: p.period, instrument: null,
    message: `The ${fmtP(p.period)}-d signal (K = ${p.K.toFixed(1)} m/s, e = ${p.e.toFixed(2)}) is a candidate, not counted as a planet: an orbit under ${SHORT_ECCENTRIC.period} d is expected to be nearly circular (tides), and a fit this eccentric at such a period usually rests on a few points near periastron. Check those points; a circular fit at this period (hold e = 0) or more data would decide.`,
  }]
}

function shortInstrumentDoubt(data: RvData, fit: FitResult, index: number, bicThreshold: number): SignalFlag[] {
  if (data.instrumentNames.length < 2) return []
  const p = fit.planets[index]
  let tmin = Infinity, tmax = -Infinity
  for (const t of data.t) { tmin = Math.min(tmin, t); tmax = Math.max(tmax, t) }
  const baseline = tmax - tmin
  const shares = instrumentShares(data, fit, index)
  const top = shares.reduce((a, b) => (b.share > a.share ? b : a))
  if (!(top.share >= CARRIER_SHARE && top.span < p.period && p.period < baseline)) return []
  const k = data.instrumentNames.indexOf(top.name)
  let nOthers = 0
  for (let i = 0; i < data.t.length; i++) if (data.instrument[i] !== k) nOthers++
  let others = 0
  for (const sh of shares) if (sh !== top) others += sh.dLnL
  const bar = nOthers > 0 ? (bicThreshold + 5 * Math.log(nOthers)) / 2 : 0
  if (others >= bar) return []
  return [{
    kind: 'candidate-short-instrument', severity: 'warning', period: p.period, instrument: top.name,
    message: `The ${fmtP(p.period)}-d signal (K = ${p.K.toFixed(1)} m/s, e = ${p.e.toFixed(2)}) is a candidate, not counted as a planet: ${(top.share * 100).toFixed(0)} % of its likelihood gain comes from ${top.name}, whose ${top.span.toFixed(0)}-d span is shorter than the period, and the other instruments (${nOthers} points over the ${baseline.toFixed(0)}-d baseline) give ΔlnL = ${others.toFixed(1)}, below the ${bar.toFixed(1)} that would detect it on their own. Check ${top.name}'s systematics; more data from the other instruments would decide.`,
  }]
}

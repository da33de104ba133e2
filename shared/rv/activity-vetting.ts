/**
 * Activity vetting of velocity signals: a candidate whose period matches a significant peak of an
 * activity indicator — within the peak's width, or at a harmonic of it — or whose velocity curve
 * follows an indicator, is an activity candidate, not a planet (Queloz et al. 2001, A&A 379, 279;
 * Boisse et al. 2011, A&A 528, A4: spots give power at the rotation period and its harmonics P/2,
 * P/3; common practice). Every decision comes with a caution in plain words.
 *
 * Match tolerance: one over the baseline T in frequency (the width of a periodogram peak, common
 * practice), also at the harmonics: a 12.3-d planet beside a 23.5-d rotation (harmonic at 11.75 d)
 * stays apart once T exceeds about 270 d; on a shorter baseline the two cannot be told apart and the
 * signal is labelled activity, with its caution. Harmonics label a signal only when taken of the
 * indicator's strongest significant peak (the best estimate of the rotation period): the secondary
 * peaks of a broad, evolving rotation signal would otherwise catch planets near P/2. A harmonic of a
 * secondary peak gives a caution and no label.
 */
import type { RvData } from './orbit-data.ts'
import { radialVelocity, type Keplerian } from './model.ts'
import { baseline } from './orbit-data.ts'
import { correlate, type Correlation } from './correlation.ts'
import { periodRelation } from './peak-coincidence.ts'
import { centrePerInstrument, indicatorDiagnostics, type IndicatorColumn, type IndicatorDiagnostics, type IndicatorOptions } from './activity-indicators.ts'

/** A signal to vet: its period and, if known, its velocity at each data row (m/s). */
export interface VettingCandidate {
  period: number
  signal?: Float64Array | null
}

export interface ActivityMatch {
  indicator: string
  /** 'period': same period as a significant peak; 'harmonic': P/2, P/3 or 2P of the strongest peak. */
  kind: 'period' | 'harmonic' | 'correlation'
  /** e.g. 'the same period', 'half the period', 'twice the period' (of the indicator's peak). */
  relation: string | null
  indicatorPeriod: number | null
  fap: number | null
  correlation: Correlation | null
}

export interface CandidateVetting {
  period: number
  /** True: labelled an activity candidate (not counted as a planet in automatic mode). */
  activity: boolean
  matches: ActivityMatch[]
  cautions: string[]
}

export interface ActivityVetting {
  candidates: CandidateVetting[]
  indicators: IndicatorDiagnostics[]
  /** Whole-data cautions: velocities or residuals that follow an indicator. */
  cautions: string[]
  settings: { peakFap: number; correlationP: number; minAbsR: number; baseline: number }
}

export interface VettingOptions extends IndicatorOptions {
  /** An indicator peak counts when its FAP is below this (default 1e-3, the search's detection level). */
  peakFap?: number
  /** A correlation counts when its p-value is below this … (default 1e-3) */
  correlationP?: number
  /** … and |r| is at least this (default 0.3). */
  minAbsR?: number
  /** Residuals of the current model, to check what the model leaves unexplained. */
  residuals?: Float64Array | null
}

export const VETTING_DEFAULTS = { peakFap: 1e-3, correlationP: 1e-3, minAbsR: 0.3 } as const

const fmtP = (p: number): string => (p >= 100 ? p.toFixed(0) : p >= 10 ? p.toFixed(1) : p.toFixed(2))
const fmtFap = (f: number): string => (f < 1e-3 ? f.toExponential(0) : f.toPrecision(2))
const fmtR = (c: Correlation): string => `Pearson r = ${c.pearson.toFixed(2)}, p = ${fmtFap(c.pearsonP)}; Spearman ρ = ${c.spearman.toFixed(2)}`

function significant(c: Correlation | null, pMax: number, minAbsR: number): boolean {
  return !!c && Number.isFinite(c.pearson) && c.pearsonP < pMax && Math.abs(c.pearson) >= minAbsR
}

/**
 * Vets candidate signals against activity indicators (one value per velocity row). Returns each
 * candidate's label, matches and cautions, each indicator's diagnostics, and whole-data cautions.
 */
export function activityVetting(data: RvData, candidates: readonly VettingCandidate[], indicators: readonly IndicatorColumn[], opts: VettingOptions = {}): ActivityVetting {
  const peakFap = opts.peakFap ?? VETTING_DEFAULTS.peakFap
  const correlationP = opts.correlationP ?? VETTING_DEFAULTS.correlationP
  const minAbsR = opts.minAbsR ?? VETTING_DEFAULTS.minAbsR
  for (const [name, v] of [['peakFap', peakFap], ['correlationP', correlationP]] as const) {
    if (!(v > 0 && v < 1)) throw new RangeError(`${name} must be in (0, 1) (got ${v})`)
  }
  if (!(minAbsR >= 0 && minAbsR < 1)) throw new RangeError(`minAbsR must be in [0, 1) (got ${minAbsR})`)
  const span = baseline(data.t)
  const n = data.t.length
  const diags = indicators.map((col) => indicatorDiagnostics(data, col, opts.residuals ?? null, opts))
  const cautions: string[] = []
  for (const d of diags) {
    if (significant(d.rv, correlationP, minAbsR)) {
      cautions.push(`The velocities follow '${d.name}' (${fmtR(d.rv)}): part of the velocity variation is likely stellar activity.`)
    }
    if (significant(d.residual, correlationP, minAbsR)) {
      cautions.push(`The residuals of the model still follow '${d.name}' (${fmtR(d.residual!)}): activity the model does not include; a GP noise model may account for it.`)
    }
    for (const note of d.notes) cautions.push(`Note: ${note}.`)
  }
  const nInst = data.instrumentNames.length
  const out: CandidateVetting[] = candidates.map((cand) => {
    if (!(cand.period > 0)) throw new RangeError(`candidate period must be > 0 (got ${cand.period})`)
    if (cand.signal && cand.signal.length !== n) throw new RangeError(`candidate signal has ${cand.signal.length} rows, the data have ${n}`)
    const matches: ActivityMatch[] = []
    const notes: string[] = []
    for (let k = 0; k < diags.length; k++) {
      const d = diags[k]
      const rel = periodRelation(cand.period, d.peaks, span, peakFap)
      const strongest = d.peaks.find((q) => q.fap < peakFap)
      if (rel && (rel.ratio === 1 || rel.peak === strongest)) {
        const kind = rel.ratio === 1 ? 'period' : 'harmonic'
        matches.push({ indicator: d.name, kind, relation: rel.relation, indicatorPeriod: rel.peak.period, fap: rel.peak.fap, correlation: null })
        notes.push(`The ${fmtP(cand.period)}-d signal has ${rel.relation} a peak of '${d.name}' (${fmtP(rel.peak.period)} d, FAP ${fmtFap(rel.peak.fap)}): likely stellar rotation or activity, not a planet.`)
      } else if (rel) {
        notes.push(`The ${fmtP(cand.period)}-d signal has ${rel.relation} a secondary peak of '${d.name}' (${fmtP(rel.peak.period)} d, FAP ${fmtFap(rel.peak.fap)}); the strongest peak is at ${fmtP(strongest!.period)} d, so it is kept, but check it is not a harmonic of the rotation.`)
      }
      if (cand.signal) {
        const col = indicators[k]
        const use = new Uint8Array(n)
        for (let i = 0; i < n; i++) use[i] = Number.isFinite(col.value[i]) ? 1 : 0
        const s = centrePerInstrument(cand.signal, null, data.instrument, nInst, use)
        const v = centrePerInstrument(col.value, null, data.instrument, nInst, use)
        const c = correlate(s, v)
        if (significant(c, correlationP, minAbsR)) {
          matches.push({ indicator: d.name, kind: 'correlation', relation: null, indicatorPeriod: null, fap: null, correlation: c })
          notes.push(`The ${fmtP(cand.period)}-d signal follows '${d.name}' (${fmtR(c)}): likely stellar activity, not a planet.`)
        }
      }
    }
    return { period: cand.period, activity: matches.length > 0, matches, cautions: notes }
  })
  return { candidates: out, indicators: diags, cautions, settings: { peakFap, correlationP, minAbsR, baseline: span } }
}

/**
 * Vets fitted orbits (a search's or a model's planets): each orbit's velocity curve is the candidate's
 * signal, so both the period match and the correlation test apply. `planets` and `activity` list the
 * indices of the orbits kept as planets and of those labelled activity candidates.
 */
export function vetOrbits(data: RvData, orbits: readonly Keplerian[], indicators: readonly IndicatorColumn[], opts: VettingOptions = {}):
  ActivityVetting & { planets: number[]; activity: number[] } {
  const candidates = orbits.map((o) => ({ period: o.period, signal: radialVelocity(data.t, [o]) }))
  const v = activityVetting(data, candidates, indicators, opts)
  const planets: number[] = [], activity: number[] = []
  v.candidates.forEach((c, k) => (c.activity ? activity : planets).push(k))
  return { ...v, planets, activity }
}

/**
 * Activity-indicator diagnostics (bisector span, FWHM, S-index, Hα …): the indicator's periodogram
 * peaks, and how the velocities (and the residuals of a model) correlate with it. A velocity signal
 * that shares a period with an indicator, or velocities that follow an indicator, point to the star
 * rather than a planet (Queloz et al. 2001, A&A 379, 279; Boisse et al. 2011, A&A 528, A4 for the
 * rotation period and its harmonics; common practice).
 *
 * Instruments measure indicators (and velocities) on their own zero points, so both series are centred
 * per instrument (each instrument's weighted mean removed) before the periodogram and the correlations.
 */
import { periodogram, findPeaks, type Peak } from './periodogram.ts'
import { correlate, type Correlation } from './correlation.ts'
import type { RvData } from './orbit-data.ts'

/** One indicator, one value per velocity row (NaN where the row has none). */
export interface IndicatorColumn {
  name: string
  value: Float64Array
  /** Per-row 1σ errors (NaN or ≤ 0 where unknown); omitted → equal weights. */
  error?: Float64Array | null
}

export interface IndicatorPeak {
  period: number
  frequency: number
  power: number
  /** Baluev 2008 false-alarm probability. */
  fap: number
}

export interface InstrumentCorrelation { instrument: string; correlation: Correlation }

export interface IndicatorDiagnostics {
  name: string
  /** Rows with a value. */
  n: number
  /** Strongest peaks of the indicator's periodogram (centred per instrument), by power. */
  peaks: IndicatorPeak[]
  /** Velocity vs indicator, both centred per instrument. */
  rv: Correlation
  /** Residual vs indicator (null when no residuals were given). */
  residual: Correlation | null
  /** The same, instrument by instrument (velocity vs indicator). */
  byInstrument: InstrumentCorrelation[]
  /** Why part of the diagnostics is missing (too few rows, constant indicator …), plain words. */
  notes: string[]
}

export interface IndicatorOptions {
  minPeriod?: number
  maxPeriod?: number
  oversample?: number
  /** Peaks listed per indicator (default 5). */
  peaks?: number
}

/** Fewest rows for an indicator periodogram (below this the peaks are not computed). */
export const INDICATOR_MIN_ROWS = 8

/**
 * Each instrument's (inverse-variance) weighted mean removed from v over the rows in `use`;
 * rows outside `use` become NaN.
 */
export function centrePerInstrument(v: Float64Array, w: Float64Array | null, instrument: Int32Array, nInst: number, use: Uint8Array): Float64Array {
  const sw = new Float64Array(nInst), swv = new Float64Array(nInst)
  for (let i = 0; i < v.length; i++) {
    if (!use[i]) continue
    const wi = w ? w[i] : 1
    sw[instrument[i]] += wi; swv[instrument[i]] += wi * v[i]
  }
  const out = new Float64Array(v.length)
  for (let i = 0; i < v.length; i++) out[i] = use[i] ? v[i] - swv[instrument[i]] / sw[instrument[i]] : NaN
  return out
}

function pick(a: Float64Array, use: Uint8Array): Float64Array {
  const out: number[] = []
  for (let i = 0; i < a.length; i++) if (use[i]) out.push(a[i])
  return Float64Array.from(out)
}

/** Diagnostics of one indicator against the velocities and, optionally, a model's residuals. */
export function indicatorDiagnostics(data: RvData, column: IndicatorColumn, residuals: Float64Array | null = null, opts: IndicatorOptions = {}): IndicatorDiagnostics {
  const n = data.t.length
  if (column.value.length !== n) throw new RangeError(`indicator '${column.name}' has ${column.value.length} values, the data have ${n} rows`)
  if (column.error && column.error.length !== n) throw new RangeError(`indicator '${column.name}' has ${column.error.length} errors, the data have ${n} rows`)
  if (residuals && residuals.length !== n) throw new RangeError(`residuals have ${residuals.length} rows, the data have ${n}`)
  const nInst = data.instrumentNames.length
  const use = new Uint8Array(n)
  let count = 0
  for (let i = 0; i < n; i++) if (Number.isFinite(column.value[i])) { use[i] = 1; count++ }
  const notes: string[] = []
  // Indicator errors: where every used row has one, weight by them; otherwise equal weights.
  let errors: Float64Array | null = null
  if (column.error) {
    let all = true
    for (let i = 0; i < n; i++) if (use[i] && !(column.error[i] > 0 && Number.isFinite(column.error[i]))) { all = false; break }
    if (all) errors = column.error
    else notes.push(`'${column.name}' has errors on some rows only; its periodogram weights every row equally`)
  }
  const w = errors ? Float64Array.from(errors, (e) => 1 / (e * e)) : null
  const ind = centrePerInstrument(column.value, w, data.instrument, nInst, use)
  const rvW = Float64Array.from(data.dy, (e) => 1 / (e * e))
  const rv = centrePerInstrument(data.y, rvW, data.instrument, nInst, use)
  const res = residuals ? centrePerInstrument(residuals, rvW, data.instrument, nInst, use) : null

  let peaks: IndicatorPeak[] = []
  if (count >= INDICATOR_MIN_ROWS) {
    const t = pick(data.t, use), y = pick(ind, use)
    const dy = errors ? pick(errors, use) : new Float64Array(t.length).fill(1)
    try {
      const pg = periodogram(t, y, dy, { minPeriod: opts.minPeriod, maxPeriod: opts.maxPeriod, oversample: opts.oversample })
      peaks = findPeaks(t, y, dy, pg, { count: opts.peaks ?? 5 }).map((p: Peak) => ({ period: p.period, frequency: p.frequency, power: p.power, fap: p.fap }))
    } catch (err) {
      notes.push(`no periodogram of '${column.name}': ${(err as Error).message}`)
    }
  } else {
    notes.push(`'${column.name}' has ${count} values; its periodogram needs at least ${INDICATOR_MIN_ROWS}`)
  }
  const rvCorr = correlate(rv, ind)
  if (rvCorr.note) notes.push(`velocity vs '${column.name}': ${rvCorr.note}`)
  const byInstrument = data.instrumentNames.map((name, k) => {
    const a: number[] = [], b: number[] = []
    for (let i = 0; i < n; i++) if (use[i] && data.instrument[i] === k) { a.push(data.y[i]); b.push(column.value[i]) }
    return { instrument: name, correlation: correlate(a, b) }
  })
  return { name: column.name, n: count, peaks, rv: rvCorr, residual: res ? correlate(res, ind) : null, byInstrument, notes }
}

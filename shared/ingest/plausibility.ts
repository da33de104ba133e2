import { PLAUSIBLE_JD, timeOffset } from './time.ts'
import type { ParsedRow, RowProblem, TimeFormat } from './types.ts'

/** |rv| above this (m/s) is beyond any star's radial velocity (1000 km/s; common practice). */
export const MAX_ABS_RV = 1e6
/** Errors below this (m/s, 1 mm/s) are beyond any spectrograph: a unit slip. */
export const MIN_ERROR = 1e-3
/** A value this far (×) from its column's typical size is a unit jump (km/s rows among m/s). */
const JUMP = 1000

function fmt(v: number): string {
  return Math.abs(v) >= 1e8 || (Math.abs(v) < 1e-3 && v !== 0) ? v.toExponential(3) : String(Number(v.toPrecision(10)))
}

/**
 * Physical-range checks of one row (values already in full JD and m/s), the message of the first
 * that fails, or null: a non-finite value; a time outside 1850–2100 (with a special word when
 * full and reduced dates are mixed); |rv| > 1000 km/s; an error below 1 mm/s.
 */
export function rowImplausibility(written: number, time: number, rv: number, error: number, format: TimeFormat): string | null {
  if (!Number.isFinite(time)) return `time ${fmt(written)} is not a finite number`
  if (!Number.isFinite(rv)) return `velocity ${fmt(rv)} is not a finite number`
  if (!Number.isFinite(error)) return `error ${fmt(error)} is not a finite number`
  if (format !== 'days' && (time < PLAUSIBLE_JD.min || time > PLAUSIBLE_JD.max)) {
    const offset = timeOffset(format)
    if (offset > 0 && written >= 2_300_000) {
      return `time ${fmt(written)} is a full Julian day in a column of reduced dates (JD − ${offset}): the column mixes full and reduced dates; write every row the same way, or skip this row`
    }
    if (offset === 0 && written > -100_000 && written < 1_000_000) {
      return `time ${fmt(written)} looks like a reduced date in a column of full Julian days: the column mixes full and reduced dates; write every row the same way, or skip this row`
    }
    return `time ${fmt(written)} is JD ${fmt(time)}, outside 1850–2100: check the time format`
  }
  if (Math.abs(rv) > MAX_ABS_RV) return `velocity ${fmt(rv)} m/s is beyond ±1000 km/s: check the velocity unit, or skip this row`
  if (error < MIN_ERROR) return `error ${fmt(error)} m/s is below 1 mm/s: check the error unit, or skip this row`
  return null
}

function medianOf(values: Float64Array): number {
  const s = values.slice().sort()
  const m = s.length >> 1
  return s.length === 0 ? NaN : s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2
}

/**
 * Checks of whole columns over the good rows: a velocity ~1000× off its column (a km/s value among
 * m/s ones, or the reverse) and an error ~1000× off the typical error are problems; an error larger
 * than the whole velocity spread is a warning. Returns the index of each row with a problem.
 */
export function columnImplausibility(rows: ParsedRow[], problems: RowProblem[], warnings: RowProblem[], names: { rv: string; error: string | null }): Set<number> {
  const bad = new Set<number>()
  const n = rows.length
  if (n < 5) return bad
  const rv = new Float64Array(n)
  const err = new Float64Array(n)
  for (let k = 0; k < n; k++) { rv[k] = rows[k]!.rv; err[k] = rows[k]!.error }
  const med = medianOf(rv)
  const dev = new Float64Array(n)
  for (let k = 0; k < n; k++) dev[k] = Math.abs(rv[k]! - med)
  const spread = Math.max(1.4826 * medianOf(dev), medianOf(err))
  const medErr = medianOf(err)
  for (let k = 0; k < n; k++) {
    const v = rv[k]!
    if (spread > 0 && Math.abs(med) > 100 * spread && Math.abs(v - med) > 100 * spread) {
      if (Math.abs(v * JUMP - med) < 0.01 * Math.abs(med)) {
        problems.push({ line: rows[k]!.line, column: names.rv, message: `velocity ${fmt(v)} m/s is ~1000× smaller than the column's typical ${fmt(med)} m/s (a km/s value among m/s?): fix it, or skip this row` })
        bad.add(k)
        continue
      }
      if (Math.abs(v / JUMP - med) < 0.01 * Math.abs(med)) {
        problems.push({ line: rows[k]!.line, column: names.rv, message: `velocity ${fmt(v)} m/s is ~1000× larger than the column's typical ${fmt(med)} m/s (an m/s value among km/s?): fix it, or skip this row` })
        bad.add(k)
        continue
      }
    }
    if (names.error !== null && medErr > 0 && (err[k]! > 300 * medErr || err[k]! < medErr / 300)) {
      problems.push({ line: rows[k]!.line, column: names.error, message: `error ${fmt(err[k]!)} m/s is ~1000× off the column's typical ${fmt(medErr)} m/s (a unit slip?): fix it, or skip this row` })
      bad.add(k)
    }
  }
  let lo = Infinity
  let hi = -Infinity
  for (let k = 0; k < n; k++) if (!bad.has(k)) { lo = Math.min(lo, rv[k]!); hi = Math.max(hi, rv[k]!) }
  const range = hi - lo
  if (range > 0 && names.error !== null) {
    for (let k = 0; k < n; k++) {
      if (!bad.has(k) && err[k]! > range) {
        warnings.push({ line: rows[k]!.line, column: names.error, message: `error ${fmt(err[k]!)} m/s is larger than the whole velocity spread (${fmt(range)} m/s): check the error column and its unit` })
      }
    }
  }
  return bad
}

import type { TimeFormat, TimeScale } from './types.ts'

/** Days added to a time written in each of the usual formats to make it a full Julian day. */
export const TIME_OFFSETS: Readonly<Record<'jd' | 'bjd' | 'mjd' | 'jd-2400000' | 'jd-2450000' | 'jd-2457000' | 'days', number>> = {
  jd: 0,
  bjd: 0,
  mjd: 2400000.5,
  'jd-2400000': 2400000,
  'jd-2450000': 2450000,
  'jd-2457000': 2457000,
  days: 0,
}

const JD_MINUS = /^jd-(\d{1,7}(?:\.\d{1,6})?)$/

/** Whether `f` is a time format: 'jd', 'bjd', 'mjd', 'days' or 'jd-N' with 0 ≤ N < 10 000 000. */
export function isTimeFormat(f: unknown): f is TimeFormat {
  return f === 'jd' || f === 'bjd' || f === 'mjd' || f === 'days' || (typeof f === 'string' && JD_MINUS.test(f))
}

/** Days added to a time written in `format` to make it a full Julian day ('days': 0). */
export function timeOffset(format: TimeFormat): number {
  if (format === 'mjd') return 2400000.5
  const m = JD_MINUS.exec(format)
  return m ? Number(m[1]) : 0
}

/** The format 'jd-N' for an offset N (N = 0 gives 'jd', 2400000.5 gives 'mjd'). */
export function formatForOffset(n: number): TimeFormat {
  if (n === 0) return 'jd'
  if (n === 2400000.5) return 'mjd'
  return `jd-${n}`
}

/** Convert a time as written to a full Julian day ('days' is returned unchanged). */
export function toFullJd(t: number, format: TimeFormat): number {
  return t + timeOffset(format)
}

export const TIME_SCALES: readonly TimeScale[] = ['bjd_tdb', 'bjd_utc', 'hjd_utc', 'jd_utc', 'jd_tt', 'jd_tdb', 'unknown']

/** Words for a time scale, for notes and choices. */
export function describeTimeScale(s: TimeScale): string {
  switch (s) {
    case 'bjd_tdb': return 'barycentric, TDB (BJD_TDB)'
    case 'bjd_utc': return 'barycentric, UTC (BJD_UTC)'
    case 'hjd_utc': return 'heliocentric, UTC (HJD)'
    case 'jd_utc': return 'at the observatory, UTC (JD_UTC)'
    case 'jd_tt': return 'at the observatory, TT (JD_TT)'
    case 'jd_tdb': return 'at the observatory, TDB (JD_TDB)'
    case 'unknown': return 'not stated'
  }
}

/** Human name of a time format, for notes ('JD − 2 457 000'). */
export function describeTimeFormat(f: TimeFormat): string {
  if (f === 'jd') return 'full Julian days'
  if (f === 'bjd') return 'full barycentric Julian days'
  if (f === 'mjd') return 'modified Julian days (JD − 2400000.5)'
  if (f === 'days') return 'plain days'
  return `JD − ${timeOffset(f)}`
}

/** Julian day of 1970-01-01T00:00Z (common practice; JD = Unix ms / 86400000 + 2440587.5). */
const UNIX_EPOCH_JD = 2440587.5

/** Full JD of 1850-01-01T00:00 and 2100-01-01T00:00 (UTC; from calendarToJd): the plausible span of RV times. */
export const PLAUSIBLE_JD = { min: 2396758.5, max: 2488069.5 } as const

/**
 * Julian day (UTC) of a calendar date or date-time such as '2015-06-01' or '2015-06-01T12:00Z'.
 * A date without a time means 00:00 UTC. Used to turn user-given split dates into boundaries.
 */
export function calendarToJd(date: string): number {
  const s = date.trim()
  const iso = /^\d{4}-\d{2}-\d{2}$/.test(s) ? `${s}T00:00:00Z` : s
  const ms = Date.parse(/[zZ]|[+-]\d{2}:?\d{2}$/.test(iso) ? iso : `${iso}Z`)
  if (!Number.isFinite(ms)) throw new RangeError(`date must be a calendar date like 2015-06-01 (got '${date}')`)
  return ms / 86400000 + UNIX_EPOCH_JD
}

import type { TimeFormat } from './types.ts'

/** Days added to a time written in each format to make it a full Julian day. */
export const TIME_OFFSETS: Readonly<Record<TimeFormat, number>> = {
  jd: 0,
  bjd: 0,
  mjd: 2400000.5,
  'jd-2400000': 2400000,
  'jd-2450000': 2450000,
  days: 0,
}

/** Convert a time as written to a full Julian day ('days' is returned unchanged). */
export function toFullJd(t: number, format: TimeFormat): number {
  return t + TIME_OFFSETS[format]
}

/** Julian day of 1970-01-01T00:00Z (common practice; JD = Unix ms / 86400000 + 2440587.5). */
const UNIX_EPOCH_JD = 2440587.5

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

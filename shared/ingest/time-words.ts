import type { TimeScale } from './types.ts'

/** What a header, units row or metadata text says about the times. */
export interface TimeWords {
  /** A zero point written in the text (`BJD_TDB-2457000` → 2457000, `RJD` → 2400000, `MJD` → 2400000.5). */
  offset?: number
  /** The text names Julian days in some form (JD, BJD, HJD, MJD, RJD, Julian). */
  julian: boolean
  /** The text says plain days and no Julian day. */
  days: boolean
  /** The time scale named, if any. */
  scale?: TimeScale
}

/** Texts are read up to this length (keeps the regexes linear on hostile input). */
const MAX_CHARS = 200

/**
 * Read the time format and scale words of a header text (common practice of archives and papers):
 * `JD − N` for any N written (thousands separators and a Unicode minus allowed), `RJD` (JD − 2400000),
 * `MJD` or `2400000.5`, `BTJD` (BJD_TDB − 2457000, the space-photometry follow-up convention);
 * scales `BJD` (TDB unless UTC is named), `HJD` (UTC), `TDB`, `TT`, `UTC`, and the words
 * barycentric / heliocentric.
 */
export function readTimeWords(raw: string): TimeWords {
  const s = raw.slice(0, MAX_CHARS).toLowerCase()
    .replace(/[−–—]/g, '-')
    .replace(/(\d)[\s,_'](?=\d{3}(?:\D|$))/g, '$1')
  const word = (w: string): boolean => new RegExp(`(?:^|[^a-z])${w}(?:[^a-z]|$)`).test(s)
  const out: TimeWords = { julian: /jd|julian/.test(s), days: false }
  const minus = /-\s*\(?\s*(2\d{6}(?:\.\d+)?)/.exec(s)
  if (minus) out.offset = Number(minus[1])
  else if (/2400000\.5/.test(s) || /(?:^|[^a-z])mjd/.test(s)) out.offset = 2400000.5
  else if (/(?:^|[^a-z])rjd/.test(s)) out.offset = 2400000
  else if (/(?:^|[^a-z])btjd/.test(s)) out.offset = 2457000
  out.days = !out.julian && /(?:^|[^a-z])days?(?:[^a-z]|$)/.test(s)

  const utc = word('utc')
  if (/bjd|btjd|barycentric/.test(s)) out.scale = utc ? 'bjd_utc' : 'bjd_tdb'
  else if (/hjd|heliocentric/.test(s)) out.scale = 'hjd_utc'
  else if (word('tdb')) out.scale = 'jd_tdb'
  else if (word('tt') || /terrestrial time/.test(s)) out.scale = 'jd_tt'
  else if (utc) out.scale = 'jd_utc'
  return out
}

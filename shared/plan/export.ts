/**
 * The recommended list as CSV (one header row, comma-separated, RFC 4180 quoting) and as an
 * iCalendar file (RFC 5545: VCALENDAR with one VEVENT per instant, UTC times, CRLF line ends,
 * lines folded at 75 octets, TEXT values escaped). Both are deterministic for the same input
 * (the calendar's DTSTAMP is passed in).
 */
import type { Recommendation } from './schedule.ts'
import { jdToDate } from './sky.ts'

export const PLAN_CSV_COLUMNS = [
  'utc', 'jd_utc', 'information_nats', 'spread_m_s', 'predicted_m_s', 'altitude_deg', 'airmass',
  'moon_separation_deg', 'moon_illumination', 'sun_altitude_deg',
] as const

/** ISO 8601 UTC to the second, e.g. 2026-12-10T03:20:00Z. */
function isoSeconds(jd: number): string {
  return jdToDate(jd).toISOString().replace(/\.\d{3}Z$/, 'Z')
}

function csvField(v: string): string {
  return /[",\r\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v
}

/** CSV of the recommendations; `comment` lines (e.g. star, site, model) go first, prefixed by `#`. */
export function planToCsv(recs: readonly Recommendation[], comment: readonly string[] = []): string {
  const lines = comment.map((c) => `# ${c.replace(/[\r\n]+/g, ' ')}`)
  lines.push(PLAN_CSV_COLUMNS.join(','))
  for (const r of recs) {
    lines.push([
      isoSeconds(r.jdUtc), r.jdUtc.toFixed(6), r.information.toFixed(4), r.spread.toFixed(3), r.predicted.toFixed(3),
      r.starAltDeg.toFixed(2), r.airmass.toFixed(3), r.moonSeparationDeg.toFixed(1), r.moonIllumination.toFixed(2), r.sunAltDeg.toFixed(1),
    ].map(csvField).join(','))
  }
  return lines.join('\r\n') + '\r\n'
}

/** RFC 5545 §3.3.11 TEXT escaping: backslash, semicolon, comma, newline. */
export function icsEscape(text: string): string {
  return text.replace(/\\/g, '\\\\').replace(/;/g, '\\;').replace(/,/g, '\\,').replace(/\r?\n/g, '\\n')
}

/** RFC 5545 §3.1 folding: lines longer than 75 octets continue on the next line after CRLF + space (never inside a UTF-8 character). */
export function icsFold(line: string): string {
  const enc = new TextEncoder()
  const parts: string[] = []
  let cur = '', size = 0
  for (const ch of line) {
    const n = enc.encode(ch).length
    const limit = parts.length === 0 ? 75 : 74 // continuation lines start with one space
    if (size + n > limit) { parts.push(cur); cur = ''; size = 0 }
    cur += ch; size += n
  }
  parts.push(cur)
  return parts.join('\r\n ')
}

/** Basic UTC date-time form of RFC 5545 §3.3.5, e.g. 20261210T032000Z. */
export function icsDateTime(jd: number): string {
  return isoSeconds(jd).replace(/[-:]/g, '')
}

export interface CalendarOptions {
  /** Star name, used in every event's summary. */
  star: string
  /** Site name or description (the events' LOCATION). */
  site: string
  /** Length of each event, minutes (default 30). */
  durationMinutes?: number
  /** Creation time of the file (DTSTAMP), Julian day UTC. */
  stampJd: number
  /** Domain for the UIDs (default starsway.invalid). */
  uidDomain?: string
}

/** iCalendar text (RFC 5545) with one event per recommendation. */
export function planToIcs(recs: readonly Recommendation[], opts: CalendarOptions): string {
  const dur = opts.durationMinutes ?? 30
  if (!(dur > 0 && dur <= 1440)) throw new RangeError(`durationMinutes must be in (0, 1440], got ${dur}`)
  const domain = opts.uidDomain ?? 'starsway.invalid'
  const stamp = icsDateTime(opts.stampJd)
  const slug = opts.star.replace(/[^A-Za-z0-9]+/g, '-').replace(/^-|-$/g, '').toLowerCase() || 'star'
  const lines = ['BEGIN:VCALENDAR', 'VERSION:2.0', 'PRODID:-//Starsway//Observation planner//EN', 'CALSCALE:GREGORIAN', 'METHOD:PUBLISH']
  recs.forEach((r) => {
    const description = [
      `Expected information ${r.information.toFixed(3)} nats; predicted velocity ${r.predicted.toFixed(2)} ± ${r.spread.toFixed(2)} m/s (spread across posterior draws).`,
      `Altitude ${r.starAltDeg.toFixed(1)} deg, air mass ${r.airmass.toFixed(2)}, Moon ${r.moonSeparationDeg.toFixed(0)} deg away (${Math.round(100 * r.moonIllumination)} % lit).`,
      `JD (UTC) ${r.jdUtc.toFixed(5)}.`,
    ].join('\n')
    lines.push(
      'BEGIN:VEVENT',
      `UID:${slug}-${icsDateTime(r.jdUtc)}@${domain}`,
      `DTSTAMP:${stamp}`,
      `DTSTART:${icsDateTime(r.jdUtc)}`,
      `DTEND:${icsDateTime(r.jdUtc + dur / 1440)}`,
      `SUMMARY:${icsEscape(`Observe ${opts.star} (RV)`)}`,
      `LOCATION:${icsEscape(opts.site)}`,
      `DESCRIPTION:${icsEscape(description)}`,
      'TRANSP:TRANSPARENT',
      'END:VEVENT',
    )
  })
  lines.push('END:VCALENDAR')
  return lines.map(icsFold).join('\r\n') + '\r\n'
}

/**
 * How a time system is written beside every time: axes, tables, exports and reports.
 * Scale names follow common practice (Eastman, Siverd & Gaudi 2010 recommend "BJD_TDB" written out
 * in full); reduced dates name their offset: "BJD_TDB − 2 457 000".
 */

/**
 * The time scale of stored times, as datasets record it (`bjd_tdb` barycentric TDB, `bjd_utc`,
 * `hjd_utc` heliocentric UTC, at the observatory `jd_utc`, `jd_tt`, `jd_tdb`; `unknown` when
 * neither the file nor the user said). The short names of `toBjdTdb` (`utc`, `tt`, `tdb` = already
 * barycentric, `hjd-utc`) and `hjd` are read too.
 */
export type TimeScaleName = 'bjd_tdb' | 'bjd_utc' | 'hjd_utc' | 'jd_utc' | 'jd_tt' | 'jd_tdb' | 'unknown'

/** A time system: the scale, and how the times are written (`jd`, `mjd`, `jd-N`, `days`) or an explicit offset. */
export interface TimeSystem {
  scale?: string | null
  /** 'jd' (full), 'bjd' (full, barycentric), 'mjd' (JD − 2 400 000.5), 'jd-N' (JD − N), 'days' (no zero point). */
  format?: string | null
  /** Days subtracted from full JDs before display; overrides the offset implied by `format`. */
  offset?: number | null
}

const ALIASES: Record<string, TimeScaleName> = {
  bjd_tdb: 'bjd_tdb', tdb: 'bjd_tdb', bjd_utc: 'bjd_utc', hjd_utc: 'hjd_utc', 'hjd-utc': 'hjd_utc', hjd: 'hjd_utc',
  jd_utc: 'jd_utc', utc: 'jd_utc', jd_tt: 'jd_tt', tt: 'jd_tt', jd_tdb: 'jd_tdb', unknown: 'unknown',
}

const NAMES: Record<TimeScaleName, { reference: string; scale: string }> = {
  bjd_tdb: { reference: 'BJD', scale: 'TDB' }, bjd_utc: { reference: 'BJD', scale: 'UTC' },
  hjd_utc: { reference: 'HJD', scale: 'UTC' }, jd_utc: { reference: 'JD', scale: 'UTC' },
  jd_tt: { reference: 'JD', scale: 'TT' }, jd_tdb: { reference: 'JD', scale: 'TDB' }, unknown: { reference: 'JD', scale: '' },
}

/** The canonical scale name of any accepted spelling; anything else (null, '') is 'unknown'. */
export function timeScaleName(scale: string | null | undefined): TimeScaleName {
  return ALIASES[(scale ?? 'unknown').toLowerCase()] ?? 'unknown'
}

/** True when the times are barycentric dynamical time, the only scale fit for timing and fitting across years. */
export function isBarycentricTdb(scale: string | null | undefined): boolean {
  return timeScaleName(scale) === 'bjd_tdb'
}

/**
 * The doubt to show beside an analysis of times that are not BJD_TDB, or null when they are.
 * Times at the observatory swing by up to ±8.3 min over the year (the light time across the
 * Earth's orbit), which blurs periods and moves conjunction times; HJD and BJD_UTC are off by up to
 * 4 s and by the leap seconds (Eastman et al. 2010 §4).
 */
export function timeScaleWarning(scale: string | null | undefined): string | null {
  const name = timeScaleName(scale)
  switch (name) {
    case 'bjd_tdb': return null
    case 'unknown': return 'The time scale of these data was not recorded: they are treated as given. If they are not BJD_TDB, times at the observatory are off by up to ±8.3 min over the year; record the scale and convert at upload.'
    case 'jd_utc': case 'jd_tt': case 'jd_tdb':
      return `These times are at the observatory (${label(name)}), not barycentric: they are off by up to ±8.3 min over the year, which blurs long periods and moves conjunction times. Upload them again with the observatory chosen, to store BJD_TDB.`
    case 'hjd_utc': return 'These times are heliocentric (HJD_UTC): up to 4 s from BJD_TDB plus the leap seconds (over a minute). Upload them again with the observatory chosen, to store BJD_TDB.'
    case 'bjd_utc': return 'These times are BJD_UTC: barycentric, but on the UTC scale, which jumps by each leap second (over a minute from TDB). Upload them again as BJD_TDB.'
  }
}

function label(name: TimeScaleName): string {
  const n = NAMES[name]
  return n.scale ? `${n.reference}_${n.scale}` : n.reference
}

/** Groups the digits of an offset in threes with spaces: 2457000 → "2 457 000", 2400000.5 → "2 400 000.5". */
export function groupDigits(n: number): string {
  const [whole, frac] = String(n).split('.')
  const grouped = whole!.replace(/\B(?=(\d{3})+(?!\d))/g, ' ')
  return frac !== undefined ? `${grouped}.${frac}` : grouped
}

/** Days subtracted from full JDs for display in this system. */
export function timeSystemOffset(sys: TimeSystem): number {
  if (sys.offset !== undefined && sys.offset !== null) return sys.offset
  const f = (sys.format ?? 'jd').toLowerCase()
  if (f === 'mjd') return 2400000.5
  const m = /^jd-(\d+(?:\.\d+)?)$/.exec(f)
  return m ? Number(m[1]) : 0
}

/**
 * The label of a time system: "BJD_TDB", "JD_UTC", "BJD_TDB − 2 457 000", "MJD_UTC",
 * "HJD_UTC − 2 450 000"; "JD" alone when the scale is unknown; "days (no zero point)" for a day count.
 */
export function timeSystemLabel(sys: TimeSystem): string {
  const format = (sys.format ?? 'jd').toLowerCase()
  if (format === 'days') return 'days (no zero point)'
  const name = format === 'bjd' && !sys.scale ? 'bjd_tdb' : timeScaleName(sys.scale)
  const offset = timeSystemOffset(sys)
  const n = NAMES[name]
  if (offset === 2400000.5 && n.reference === 'JD') return n.scale ? `MJD_${n.scale}` : 'MJD'
  const base = label(name)
  return offset ? `${base} − ${groupDigits(offset)}` : base
}

/** An axis or column title: "Time (BJD_TDB − 2 457 000, d)". */
export function timeAxisTitle(sys: TimeSystem, what = 'Time'): string {
  return `${what} (${timeSystemLabel(sys)}, d)`
}

/** A full JD as shown in this system, e.g. 2459123.456789 → "2123.45679" for BJD_TDB − 2 457 000. */
export function formatTime(jd: number, sys: TimeSystem, decimals = 5): string {
  if (!Number.isFinite(jd)) return '—'
  return (jd - timeSystemOffset(sys)).toFixed(decimals)
}

/**
 * The display offset for a set of times: the largest multiple of 10 000 days below the earliest
 * (common practice: 2 450 000 for data of the 2000s), 0 for times that are not full JDs.
 */
export function displayOffset(times: ArrayLike<number>): number {
  let t0 = Infinity
  for (let i = 0; i < times.length; i++) if (Number.isFinite(times[i]!) && times[i]! < t0) t0 = times[i]!
  return Number.isFinite(t0) && t0 > 2_000_000 ? Math.floor(t0 / 10_000) * 10_000 : 0
}

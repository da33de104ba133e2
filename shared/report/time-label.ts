/**
 * The time system of a frozen report, as printed beside every time in its tables and exports.
 * Stored times are full Julian dates; the scale comes from the datasets (BJD_TDB when the data are
 * barycentric). Printed times are reduced by a round epoch so that a column stays narrow:
 * "BJD_TDB − 2 450 000" (the thin spaces group the digits).
 */
import type { ReportSnapshot } from '../api/reports.ts'

export interface ReportTimeSystem {
  /** The scale's short name: "BJD_TDB", "JD_UTC", "HJD", or "JD" when the scale was not recorded. */
  scale: string
  /** Subtracted from full JDs before printing (0: full JD). */
  offset: number
  /** Plain text: "BJD_TDB − 2 450 000". */
  label: string
  /** LaTeX: "BJD$_\\mathrm{TDB}$ $-$ 2\\,450\\,000". */
  tex: string
  /** LaTeX of the scale alone: "BJD$_\\mathrm{TDB}$". */
  texScale: string
  /** For CSV and ECSV column names: "bjd_tdb". */
  column: string
}

const SCALES: Record<string, { name: string; tex: string; column: string }> = {
  tdb: { name: 'BJD_TDB', tex: 'BJD$_\\mathrm{TDB}$', column: 'bjd_tdb' },
  utc: { name: 'JD_UTC', tex: 'JD$_\\mathrm{UTC}$', column: 'jd_utc' },
  tt: { name: 'JD_TT', tex: 'JD$_\\mathrm{TT}$', column: 'jd_tt' },
  hjd: { name: 'HJD', tex: 'HJD', column: 'hjd' },
  unknown: { name: 'JD', tex: 'JD', column: 'jd' },
}

function grouped(n: number, sep: string): string {
  return String(n).replace(/\B(?=(\d{3})+(?!\d))/g, sep)
}

/** The system of a scale name ('tdb', 'utc', 'tt', 'hjd'; anything else: not recorded) and a print offset. */
export function timeSystemOf(scale: string | null | undefined, offset: number): ReportTimeSystem {
  const s = SCALES[scale ?? 'unknown'] ?? SCALES.unknown!
  return {
    scale: s.name, offset,
    label: offset ? `${s.name} − ${grouped(offset, ' ')}` : s.name,
    tex: offset ? `${s.tex} $-$ ${grouped(offset, '\\,')}` : s.tex,
    texScale: s.tex,
    column: s.column,
  }
}

/** The epoch subtracted for printing: whole multiples of 50 000 d below the earliest time (2 450 000 for 1995–2132; common practice), as the app's axes. */
export function printEpoch(times: number[]): number {
  let t0 = Infinity
  for (const t of times) if (Number.isFinite(t) && t < t0) t0 = t
  return t0 >= 100_000 && t0 < Infinity ? Math.floor(t0 / 50_000) * 50_000 : 0
}

/** The time system of a snapshot (older snapshots carry no scale: "JD", named as not recorded). */
export function snapshotTimeSystem(s: ReportSnapshot): ReportTimeSystem {
  const times = s.data.points.length ? s.data.points.map((p) => p.time) : s.result.planets.map((p) => p.tc)
  return timeSystemOf(s.data.timeScale ?? null, printEpoch(times))
}

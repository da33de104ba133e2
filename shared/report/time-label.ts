/**
 * The time system of a frozen report, as printed beside every time in its tables and exports.
 * Stored times are full Julian dates; the scale comes from the datasets (`bjd_tdb` when the data
 * are barycentric). Labels are shared/time's (one home for how a time system is written); printed
 * times are reduced by a round epoch so that a column stays narrow ("BJD_TDB − 2 450 000").
 */
import type { ReportSnapshot } from '../api/reports.ts'
import { displayOffset, groupDigits, timeScaleName, timeSystemLabel } from '../time/labels.ts'

export interface ReportTimeSystem {
  /** The scale's label: "BJD_TDB", "JD_UTC", "HJD_UTC", or "JD" when the scale was not recorded. */
  scale: string
  /** Subtracted from full JDs before printing (0: full JD). */
  offset: number
  /** Plain text: "BJD_TDB − 2 450 000". */
  label: string
  /** LaTeX: "BJD$_\\mathrm{TDB}$ $-$ 2\\,450\\,000". */
  tex: string
  /** LaTeX of the scale alone: "BJD$_\\mathrm{TDB}$". */
  texScale: string
  /** For CSV and ECSV column names: "bjd_tdb" ("jd" when not recorded). */
  column: string
}

/** The system of a stored scale name ('bjd_tdb', 'jd_utc', …; anything else: not recorded) and a print offset. */
export function timeSystemOf(scale: string | null | undefined, offset: number): ReportTimeSystem {
  const name = timeScaleName(scale)
  const plain = timeSystemLabel({ scale: name, offset: 0 })
  const [reference, sub] = plain.split('_')
  const texScale = sub ? `${reference}$_\\mathrm{${sub}}$` : reference!
  return {
    scale: plain, offset,
    label: timeSystemLabel({ scale: name, offset }),
    tex: offset ? `${texScale} $-$ ${groupDigits(offset).replace(/ /g, '\\,')}` : texScale,
    texScale,
    column: name === 'unknown' ? 'jd' : name,
  }
}

/** The epoch subtracted for printing (shared/time's display offset: 2 450 000 for data of the 2000s). */
export function printEpoch(times: number[]): number {
  return displayOffset(times)
}

/** The time system of a snapshot (older snapshots carry no scale: "JD", named as not recorded). */
export function snapshotTimeSystem(s: ReportSnapshot): ReportTimeSystem {
  const times = s.data.points.length ? s.data.points.map((p) => p.time) : s.result.planets.map((p) => p.tc)
  return timeSystemOf(s.data.timeScale ?? null, printEpoch(times))
}

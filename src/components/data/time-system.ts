import { timeScaleName, timeScaleWarning, timeSystemLabel, type TimeScaleName } from '@shared/time/index.ts'

export interface StarTimeSystem {
  /** The scale's label for axes and columns: "BJD_TDB", "JD_UTC", "JD" (not recorded), "mixed time scales". */
  label: string
  /** The one scale of all points, or 'mixed'. */
  scale: TimeScaleName | 'mixed'
  /** The doubt to show wherever these times are analysed (null when every point is BJD_TDB). */
  warning: string | null
}

/**
 * The time system of a star's points (each carries its dataset's scale). One scale gives its label
 * and, unless it is BJD_TDB, the warning of `shared/time`; several scales on one axis are a doubt of their own.
 */
export function starTimeSystem(points: ReadonlyArray<{ timeScale?: string | null }>): StarTimeSystem {
  const scales = [...new Set(points.map((p) => timeScaleName(p.timeScale)))]
  if (scales.length === 0) return { label: 'BJD_TDB', scale: 'bjd_tdb', warning: null }
  if (scales.length === 1) {
    const scale = scales[0]!
    return { label: timeSystemLabel({ scale }), scale, warning: timeScaleWarning(scale) }
  }
  const names = scales.map((s) => timeSystemLabel({ scale: s })).join(', ')
  return {
    label: 'mixed time scales',
    scale: 'mixed',
    warning: `The datasets of this star are on different time scales (${names}), shown on one axis as stored: times can disagree by up to ±8.3 min. Upload the non-barycentric tables again with the observatory chosen, to store BJD_TDB.`,
  }
}

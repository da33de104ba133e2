/**
 * Reading the map: the 50 % and 90 % completeness contours as a mass per period, and a table of
 * limits per period range for a paper. A contour at period P is the smallest mass above which
 * every cell of the column is at least that complete (so a noisy dip at high mass is not hidden),
 * interpolated linearly in ln M between the two cells that straddle the level.
 */
import type { LimitMap } from './run.ts'

export type ContourFlag = 'inside' | 'below-grid' | 'not-reached'

export interface ContourPoint {
  period: number
  /** Earth masses; null when the column never reaches the level (flag 'not-reached'). */
  massEarth: number | null
  /** 'below-grid': even the smallest mass is this complete (the limit is lower than the grid shows). */
  flag: ContourFlag
}

/** The completeness contour at `level` (0…1), one point per grid period. */
export function completenessContour(map: LimitMap, level: number): ContourPoint[] {
  if (!(level > 0 && level <= 1)) throw new RangeError(`level must be in (0, 1], got ${level}`)
  const { periods, massesEarth } = map.grid
  const nM = massesEarth.length
  return Array.from(periods, (period, iP) => {
    const f = (iM: number): number => map.fraction[iP * nM + iM]
    let m = nM // smallest index from which every cell reaches the level
    while (m > 0 && f(m - 1) >= level) m--
    if (m === nM) return { period, massEarth: null, flag: 'not-reached' as const }
    if (m === 0) return { period, massEarth: massesEarth[0], flag: 'below-grid' as const }
    const f0 = f(m - 1), f1 = f(m)
    const u = f1 > f0 ? (level - f0) / (f1 - f0) : 1
    const lnM = Math.log(massesEarth[m - 1]) + u * (Math.log(massesEarth[m]) - Math.log(massesEarth[m - 1]))
    return { period, massEarth: Math.exp(lnM), flag: 'inside' as const }
  })
}

export interface LimitTableRow {
  /** Period range, days [from, to). */
  from: number
  to: number
  /** Largest 50 % / 90 % contour mass over the range's grid periods (Earth masses; null: not reached somewhere in the range). */
  mass50Earth: number | null
  mass90Earth: number | null
  /** Mean recovered fraction over the range's cells. */
  meanCompleteness: number
}

/** Default period edges of the table, days. */
export const TABLE_EDGES = [0.5, 1, 3, 10, 30, 100, 300, 1000, 3000, 10000, 30000]

/** Limits per period range (the conservative, largest, contour mass in each range). */
export function limitTable(map: LimitMap, edges: readonly number[] = TABLE_EDGES): LimitTableRow[] {
  const c50 = completenessContour(map, 0.5), c90 = completenessContour(map, 0.9)
  const nM = map.grid.massesEarth.length
  const rows: LimitTableRow[] = []
  for (let b = 0; b + 1 < edges.length; b++) {
    const idx = Array.from(map.grid.periods.keys()).filter((i) => map.grid.periods[i] >= edges[b] && map.grid.periods[i] < edges[b + 1])
    if (!idx.length) continue
    const worst = (c: ContourPoint[]): number | null => (idx.some((i) => c[i].massEarth === null) ? null : Math.max(...idx.map((i) => c[i].massEarth!)))
    let s = 0
    for (const i of idx) for (let m = 0; m < nM; m++) s += map.fraction[i * nM + m]
    rows.push({ from: edges[b], to: edges[b + 1], mass50Earth: worst(c50), mass90Earth: worst(c90), meanCompleteness: s / (idx.length * nM) })
  }
  return rows
}

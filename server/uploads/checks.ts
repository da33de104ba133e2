import { QueryTypes, type Transaction } from 'sequelize'
import type { Services } from '../services.ts'
import type { OverlapReport } from '../../shared/api/uploads.ts'

/** Velocities whose median is this far from zero (m/s) are absolute (a star's systemic velocity), not relative. */
export const ABSOLUTE_RV = 1000
const EXAMPLES = 5

/**
 * Rows of a file whose (time, instrument) pair is already stored for the star: a count, the first
 * few, and the index of every such row. Times are compared exactly (both full JD as stored).
 */
export async function findOverlap(
  s: Services, starId: number, lines: Int32Array, times: Float64Array, instrumentOf: Int32Array, names: string[], transaction?: Transaction,
): Promise<{ report: OverlapReport; rows: Set<number> } | null> {
  if (times.length === 0) return null
  let lo = Infinity
  let hi = -Infinity
  for (const x of times) { if (x < lo) lo = x; if (x > hi) hi = x }
  // One range scan of the (star_id, time) index, matched here (an ANY over 100 000 times is far slower).
  const found = await s.sequelize.query<{ time: number; instrument: string; file_name: string }>(
    `SELECT meas.time, d.instrument, d.file_name FROM measurements meas JOIN datasets d ON d.id = meas.dataset_id
      WHERE meas.star_id = $1 AND meas.time BETWEEN $2 AND $3`,
    { bind: [starId, lo, hi], type: QueryTypes.SELECT, transaction },
  )
  if (found.length === 0) return null
  const earlier = new Map<string, string>()
  for (const r of found) earlier.set(`${Number(r.time)}\u0001${r.instrument}`, r.file_name)
  const rows = new Set<number>()
  const examples: OverlapReport['examples'] = []
  for (let k = 0; k < times.length; k++) {
    const instrument = names[instrumentOf[k]!]!
    const file = earlier.get(`${times[k]}\u0001${instrument}`)
    if (file === undefined) continue
    rows.add(k)
    if (examples.length < EXAMPLES) examples.push({ line: lines[k]!, time: times[k]!, instrument, earlierFile: file })
  }
  return rows.size ? { report: { count: rows.size, examples }, rows } : null
}

/** Median stored velocity (m/s) per instrument of the star. */
export async function storedMedians(s: Services, starId: number): Promise<Map<string, number>> {
  const rows = await s.sequelize.query<{ instrument: string; median: number }>(
    `SELECT d.instrument, percentile_cont(0.5) WITHIN GROUP (ORDER BY meas.rv) AS median
       FROM measurements meas JOIN datasets d ON d.id = meas.dataset_id WHERE meas.star_id = $1 GROUP BY d.instrument`,
    { bind: [starId], type: QueryTypes.SELECT },
  )
  return new Map(rows.map((r) => [r.instrument, Number(r.median)]))
}

const km = (v: number) => `${(v / 1000).toFixed(3)} km/s`

/**
 * Absolute velocities (median ≥ 1 km/s from zero) next to relative ones under one instrument name
 * would share one zero point: one sentence per case, naming the file, the instrument and both levels.
 */
export function absoluteNextToRelative(
  groups: Array<{ where: string; instrument: string; median: number }>, stored: Map<string, number>,
): Array<{ fileName: string; message: string }> {
  const out: Array<{ fileName: string; message: string }> = []
  const abs = (v: number) => Math.abs(v) >= ABSOLUTE_RV
  for (const g of groups) {
    const others: Array<{ what: string; median: number }> = []
    const prior = stored.get(g.instrument)
    if (prior !== undefined) others.push({ what: 'the data already stored', median: prior })
    for (const h of groups) if (h !== g && h.instrument === g.instrument && h.where < g.where) others.push({ what: h.where, median: h.median })
    for (const o of others) {
      if (abs(g.median) === abs(o.median)) continue
      const [a, r] = abs(g.median) ? [g.median, o.median] : [o.median, g.median]
      out.push({
        fileName: g.where,
        message: `Instrument '${g.instrument}': ${g.where} has velocities near ${km(g.median)} and ${o.what} near ${km(o.median)} — absolute (${km(a)}) next to relative (${km(r)}) under one name would share one zero point. Give ${g.where} its own instrument name unless they really are one series.`,
      })
    }
  }
  return out
}

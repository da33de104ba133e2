import { createHash } from 'node:crypto'
import { QueryTypes } from 'sequelize'
import type { Services } from '../services.ts'
import type { Star } from '../db/models.ts'
import { ValidationError } from '../errors.ts'
import { toRvData, INDICATOR_MIN_ROWS, type IndicatorColumn, type RvData } from '../../shared/rv/index.ts'
import type { DataSelection } from '../../shared/api/analyses.ts'

export interface Row {
  id: number; instrument: string; time: number; rv: number; error: number
  indicators: Record<string, number>; excluded: boolean
}

/** Every measurement of a star with its instrument, in time order (excluded ones flagged). */
export async function starRows(s: Services, star: Star): Promise<Row[]> {
  return s.sequelize.query<Row>(
    `SELECT m.id, d.instrument, m.time, m.rv, m.error, m.indicators, m.excluded
       FROM measurements m JOIN datasets d ON d.id = m.dataset_id
      WHERE m.star_id = :id ORDER BY m.time, m.id`,
    { replacements: { id: star.id }, type: QueryTypes.SELECT },
  )
}

export function instrumentsOf(rows: Row[]): string[] {
  return [...new Set(rows.map((r) => r.instrument))]
}

/** The rows of the chosen instruments (all when `instruments` is empty); unknown names → 400 naming `field`. */
export function selectRows(rows: Row[], instruments: string[] | null | undefined, field: string): { used: Row[]; nExcluded: number; instruments: string[] } {
  const all = instrumentsOf(rows)
  let chosen = all
  if (instruments && instruments.length) {
    const unknown = instruments.filter((i) => !all.includes(i))
    if (unknown.length) {
      throw new ValidationError(`${field}: the star has no instrument "${unknown[0]}" (it has ${all.length ? all.join(', ') : 'no data yet'}).`, field)
    }
    chosen = all.filter((i) => instruments.includes(i))
  }
  const set = new Set(chosen)
  const inSel = rows.filter((r) => set.has(r.instrument))
  const used = inSel.filter((r) => !r.excluded && Number.isFinite(r.time) && Number.isFinite(r.rv) && r.error > 0)
  return { used, nExcluded: inSel.filter((r) => r.excluded).length, instruments: chosen.filter((i) => used.some((r) => r.instrument === i)) }
}

/** SHA-256 over "id:value:value…" lines of the points used: two runs on the same data share it. */
export function contentHash(lines: string[]): string {
  return createHash('sha256').update(lines.join('\n')).digest('hex')
}

export function selection(used: Row[], nExcluded: number, instruments: string[], hash: string): DataSelection {
  const first = used.length ? used[0]!.time : 0
  const last = used.length ? used[used.length - 1]!.time : 0
  return { instruments, nPoints: used.length, nExcluded, hash, firstTime: first, lastTime: last, baseline: last - first }
}

/** Velocity data for the numerical core, with the measurement id of every row. */
export function rvDataOf(used: Row[]): { data: RvData; ids: number[] } {
  const { data } = toRvData({ time: used.map((r) => r.time), rv: used.map((r) => r.rv), error: used.map((r) => r.error), instrument: used.map((r) => r.instrument) })
  return { data, ids: used.map((r) => r.id) }
}

export function rvHash(used: Row[]): string {
  return contentHash(used.map((r) => `${r.id}:${r.time}:${r.rv}:${r.error}`))
}

/** Loads the star's velocities of `instruments` (exclusions honoured) ready for a fit. */
export async function loadRv(s: Services, star: Star, instruments: string[] | null | undefined, field: string, minPoints: number) {
  const rows = await starRows(s, star)
  const { used, nExcluded, instruments: names } = selectRows(rows, instruments, field)
  if (used.length < minPoints) {
    throw new ValidationError(`${field}: ${used.length} usable velocities (excluded points left out); at least ${minPoints} are needed.`, field)
  }
  const { data, ids } = rvDataOf(used)
  return { rows, used, data, ids, selection: selection(used, nExcluded, names, rvHash(used)) }
}

/**
 * The activity indicators of the rows used (one value per row, NaN where a row has none), in name
 * order; indicators with fewer than the core's INDICATOR_MIN_ROWS values are left out.
 */
export function indicatorColumns(used: Row[]): IndicatorColumn[] {
  const names = [...new Set(used.flatMap((r) => Object.keys(r.indicators ?? {})))].sort()
  return names.map((name) => ({ name, value: Float64Array.from(used, (r) => { const v = r.indicators?.[name]; return typeof v === 'number' && Number.isFinite(v) ? v : NaN }) }))
    .filter((c) => c.value.filter(Number.isFinite).length >= INDICATOR_MIN_ROWS)
}

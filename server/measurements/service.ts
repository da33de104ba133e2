import { QueryTypes } from 'sequelize'
import type { Services } from '../services.ts'
import type { Measurement, Star, User } from '../db/models.ts'
import type { Measurement as MeasurementJson } from '../../shared/api/measurements.ts'
import { record } from '../audit/service.ts'
import { timeScaleName } from '../../shared/time/index.ts'

interface Row {
  id: number; dataset_id: number; instrument: string; time_scale: string | null; time_format: string; time: number; rv: number; error: number
  indicators: Record<string, number>; excluded: boolean; excluded_reason: string | null
  excluded_by: number | null; excluder_name: string | null; excluded_at: Date | null
}

// d.time_scale exists since migration 0005 (to_jsonb(d) here built the whole dataset row as JSON
// for every point: most of this query's time under load, issue 11).
const SELECT = `SELECT m.id, m.dataset_id, d.instrument, d.time_scale, d.time_format, m.time, m.rv, m.error, m.indicators, m.excluded,
       m.excluded_reason, m.excluded_by, u.name AS excluder_name, m.excluded_at
  FROM measurements m JOIN datasets d ON d.id = m.dataset_id LEFT JOIN users u ON u.id = m.excluded_by`

/** A dataset's time scale: as recorded at upload; a 'bjd' time format without one means BJD_TDB; else unknown. */
export function datasetTimeScale(scale: string | null, timeFormat: string): string {
  if (scale && timeScaleName(scale) !== 'unknown') return timeScaleName(scale)
  return timeFormat === 'bjd' ? 'bjd_tdb' : 'unknown'
}

function json(r: Row): MeasurementJson {
  return {
    id: r.id, datasetId: r.dataset_id, instrument: r.instrument, timeScale: datasetTimeScale(r.time_scale, r.time_format), time: r.time, rv: r.rv, error: r.error,
    indicators: r.indicators ?? {}, excluded: r.excluded, excludedReason: r.excluded_reason,
    excludedBy: r.excluded_by !== null ? { id: r.excluded_by, name: r.excluder_name ?? '' } : null,
    excludedAt: r.excluded_at ? new Date(r.excluded_at).toISOString() : null,
  }
}

/** Every measurement of a star (excluded ones too, flagged), in time order. */
export async function listForStar(s: Services, star: Star): Promise<MeasurementJson[]> {
  const rows = await s.sequelize.query<Row>(`${SELECT} WHERE m.star_id = :id ORDER BY m.time, m.id`,
    { replacements: { id: star.id }, type: QueryTypes.SELECT })
  return rows.map(json)
}

async function one(s: Services, id: number): Promise<MeasurementJson> {
  const [row] = await s.sequelize.query<Row>(`${SELECT} WHERE m.id = :id`, { replacements: { id }, type: QueryTypes.SELECT })
  return json(row!)
}

/** Excludes a point (with a reason) or restores it; both are recorded in the audit log. */
export async function setExcluded(
  s: Services, actor: User, star: Star, m: Measurement, excluded: boolean, reason?: string,
): Promise<MeasurementJson> {
  await s.sequelize.transaction(async (transaction) => {
    const before = { excluded: m.excluded, reason: m.excludedReason }
    if (excluded) {
      m.set({ excluded: true, excludedReason: reason ?? null, excludedBy: actor.id, excludedAt: new Date() })
    } else {
      m.set({ excluded: false, excludedReason: null, excludedBy: null, excludedAt: null })
    }
    await m.save({ transaction })
    await record(s, {
      teamId: star.teamId, userId: actor.id, action: excluded ? 'measurement.exclude' : 'measurement.restore',
      entity: 'measurement', entityId: m.id,
      detail: { starId: star.id, time: m.time, ...(excluded ? { reason } : { previousReason: before.reason }) },
    }, transaction)
  })
  return one(s, m.id)
}

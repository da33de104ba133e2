import { ForeignKeyConstraintError, QueryTypes, type Transaction } from 'sequelize'
import type { Services } from '../services.ts'
import type { Dataset, Star, User } from '../db/models.ts'
import { ConflictError } from '../errors.ts'
import type { DatasetUsage } from '../../shared/api/measurements.ts'
import { record } from '../audit/service.ts'

/**
 * What uses a dataset's measurements: fitted model versions (their residuals name every point
 * fitted), sampling runs (the measurement ids frozen in their input) and frozen report versions
 * (the points in their snapshot). Periodogram runs keep their own copy of the result and do not count.
 */
export async function datasetUsage(s: Services, star: Star, ds: Dataset, transaction?: Transaction): Promise<DatasetUsage> {
  const q = async (sql: string) => {
    const [row] = await s.sequelize.query<{ n: string }>(sql, { replacements: { star: star.id, ds: ds.id }, type: QueryTypes.SELECT, transaction })
    return Number(row?.n ?? 0)
  }
  const inDataset = `SELECT id FROM measurements WHERE dataset_id = :ds`
  const arrayOf = (expr: string) => `CASE WHEN jsonb_typeof(${expr}) = 'array' THEN ${expr} ELSE '[]'::jsonb END`
  const [nMeasurements, modelVersions, samplingRuns, reportVersions] = await Promise.all([
    q(`SELECT count(*) AS n FROM measurements WHERE dataset_id = :ds`),
    q(`SELECT count(DISTINCT v.id) AS n FROM fit_model_versions v JOIN fit_models f ON f.id = v.model_id
         CROSS JOIN LATERAL jsonb_array_elements(${arrayOf("v.result->'residuals'")}) r
        WHERE f.star_id = :star AND (r->>'measurementId')::int IN (${inDataset})`),
    q(`SELECT count(DISTINCT sr.id) AS n FROM sampling_runs sr
         CROSS JOIN LATERAL jsonb_array_elements_text(${arrayOf("sr.input->'data'->'measurementIds'")}) i
        WHERE sr.star_id = :star AND i::int IN (${inDataset})`),
    q(`SELECT count(DISTINCT rv.id) AS n FROM report_versions rv JOIN reports r ON r.id = rv.report_id
         CROSS JOIN LATERAL jsonb_array_elements(${arrayOf("rv.snapshot->'data'->'points'")}) p
        WHERE r.star_id = :star AND (p->>'id')::int IN (${inDataset})`),
  ])
  const uses: string[] = []
  if (modelVersions) uses.push(`${modelVersions} fitted model version${modelVersions === 1 ? '' : 's'}`)
  if (samplingRuns) uses.push(`${samplingRuns} sampling run${samplingRuns === 1 ? '' : 's'}`)
  if (reportVersions) uses.push(`${reportVersions} report version${reportVersions === 1 ? '' : 's'}`)
  return {
    datasetId: ds.id, nMeasurements, modelVersions, samplingRuns, reportVersions, deletable: uses.length === 0,
    reason: uses.length ? `Its measurements are used by ${uses.join(', ')}: exclude the points instead (reversible), or archive the star.` : null,
  }
}

/**
 * Deletes a mistaken dataset that nothing uses: its measurements and the dataset row go, in one
 * transaction with an audit entry that keeps what was removed (file, instrument, count, time span).
 * The raw file stays (raw files are never deleted), so the upload can be read again.
 * A dataset in use is refused with 409 and what uses it.
 */
export async function deleteDataset(s: Services, actor: User, star: Star, ds: Dataset, reason: string | undefined): Promise<DatasetUsage> {
  try {
    return await removeUnused(s, actor, star, ds, reason)
  } catch (err) {
    // a table added later that points at the dataset or its measurements keeps them (nothing half-deleted)
    if (err instanceof ForeignKeyConstraintError) throw new ConflictError('This dataset cannot be deleted: other records still refer to it.')
    throw err
  }
}

async function removeUnused(s: Services, actor: User, star: Star, ds: Dataset, reason: string | undefined): Promise<DatasetUsage> {
  return s.sequelize.transaction(async (transaction) => {
    // lock the dataset row: two deletions (or a deletion and a commit into it) do not interleave
    await s.sequelize.query(`SELECT id FROM datasets WHERE id = :ds FOR UPDATE`, { replacements: { ds: ds.id }, transaction })
    const usage = await datasetUsage(s, star, ds, transaction)
    if (!usage.deletable) throw new ConflictError(`This dataset cannot be deleted. ${usage.reason}`)
    const [span] = await s.sequelize.query<{ first: number | null; last: number | null; excluded: string }>(
      `SELECT min(time) AS first, max(time) AS last, count(*) FILTER (WHERE excluded) AS excluded FROM measurements WHERE dataset_id = :ds`,
      { replacements: { ds: ds.id }, type: QueryTypes.SELECT, transaction },
    )
    await s.sequelize.query(`DELETE FROM measurements WHERE dataset_id = :ds`, { replacements: { ds: ds.id }, transaction })
    await ds.destroy({ transaction })
    await record(s, {
      teamId: star.teamId, userId: actor.id, action: 'dataset.delete', entity: 'dataset', entityId: ds.id,
      detail: {
        starId: star.id, instrument: ds.instrument, fileName: ds.fileName, fileSha256: ds.fileSha256, rawFileId: ds.rawFileId,
        measurements: usage.nMeasurements, excludedMeasurements: Number(span?.excluded ?? 0),
        firstTime: span?.first ?? null, lastTime: span?.last ?? null, uploadedBy: ds.uploadedBy, uploadedAt: ds.createdAt.toISOString(),
        ...(reason ? { reason } : {}),
      },
    }, transaction)
    return usage
  })
}

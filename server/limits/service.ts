// Detection-limit runs: requested from a fitted model version, split into chunks (slices of the
// injection grid), one pg-boss job per chunk on the `limits` queue; any worker process on any
// machine takes any chunk. The run freezes its input and seed, so the merged map is the same bit
// for bit whoever ran which chunk (shared/limits). See README.md.
import { randomInt } from 'node:crypto'
import { QueryTypes, type Sequelize } from 'sequelize'
import type PgBoss from 'pg-boss'
import type { Services } from '../services.ts'
import type { Star, User } from '../db/models.ts'
import { analysisModels, type FitModel } from '../db/models-analysis.ts'
import { ConflictError, NotFoundError, ValidationError } from '../errors.ts'
import { record } from '../audit/service.ts'
import { createJobSender } from '../jobs/boss.ts'
import { minimumMass } from '../../shared/rv/index.ts'
import {
  prepareLimits, mergeChunks, chunkRanges, completenessContour, limitTable, solarSystemGiants, type ChunkResult,
} from '../../shared/limits/index.ts'
import { LIMITS_DEFAULTS, type LimitsRun, type LimitsResult, type LimitsSettings, type LimitsState, type StartLimitsRequest, startLimitsRequestSchema } from '../../shared/api/limits.ts'
import { problemOf, type LimitsInput } from './problem.ts'

export const LIMITS_QUEUE = 'limits'

const senders = new WeakMap<Sequelize, PgBoss>()
function jobSender(s: Services): PgBoss {
  let b = senders.get(s.sequelize)
  if (!b) { b = createJobSender(s.sequelize); senders.set(s.sequelize, b) }
  return b
}

interface RunRow {
  id: number; star_id: number; model_id: number | null; model_version: number | null; settings: LimitsSettings; seed: string | number
  input?: LimitsInput; trials: number; chunk_count: number; state: LimitsState; result: LimitsResult | null; error: string | null
  requested_by: number | null; requester_name: string | null; created_at: Date; started_at: Date | null; finished_at: Date | null
  chunks_done: string | number; chunks_running: string | number; trials_done: string | number | null
}

const iso = (d: Date | null): string | null => (d ? new Date(d).toISOString() : null)

function runJson(r: RunRow, withResult = true): LimitsRun {
  return {
    id: r.id, starId: r.star_id, modelId: r.model_id, modelVersion: r.model_version, settings: r.settings, seed: Number(r.seed),
    state: r.state, trials: r.trials, chunkCount: r.chunk_count,
    progress: { trialsDone: Number(r.trials_done ?? 0), chunksDone: Number(r.chunks_done), chunksRunning: Number(r.chunks_running) },
    error: r.error, requestedBy: r.requested_by && r.requester_name ? { id: r.requested_by, name: r.requester_name } : null,
    createdAt: new Date(r.created_at).toISOString(), startedAt: iso(r.started_at), finishedAt: iso(r.finished_at),
    result: withResult ? r.result : null,
  }
}

const SELECT_RUN = `SELECT r.id, r.star_id, r.model_id, r.model_version, r.settings, r.seed, r.trials, r.chunk_count, r.state, r.error,
    r.requested_by, u.name AS requester_name, r.created_at, r.started_at, r.finished_at, %RESULT%
    (SELECT count(*) FROM limit_chunks c WHERE c.run_id = r.id AND c.state = 'done') AS chunks_done,
    (SELECT count(*) FROM limit_chunks c WHERE c.run_id = r.id AND c.state = 'running') AS chunks_running,
    (SELECT sum(c."end" - c.start) FROM limit_chunks c WHERE c.run_id = r.id AND c.state = 'done') AS trials_done
  FROM limit_runs r LEFT JOIN users u ON u.id = r.requested_by`

/** A run by id (without its input), or null. */
export async function loadRun(s: Services, id: number, withResult = true): Promise<LimitsRun | null> {
  const rows = await s.sequelize.query<RunRow>(`${SELECT_RUN.replace('%RESULT%', withResult ? 'r.result,' : 'NULL AS result,')} WHERE r.id = :id`, { replacements: { id }, type: QueryTypes.SELECT })
  return rows.length ? runJson(rows[0], withResult) : null
}

/** The star's runs, newest first, without their maps. */
export async function listRuns(s: Services, star: Star): Promise<LimitsRun[]> {
  const rows = await s.sequelize.query<RunRow>(`${SELECT_RUN.replace('%RESULT%', 'NULL AS result,')} WHERE r.star_id = :star ORDER BY r.created_at DESC, r.id DESC LIMIT 200`, { replacements: { star: star.id }, type: QueryTypes.SELECT })
  return rows.map((r) => runJson(r, false))
}

/** Freezes what a run injects into: the residuals of the model's latest fitted version, errors with its jitters, the star's mass. */
async function inputOf(s: Services, star: Star, model: FitModel): Promise<{ input: LimitsInput; versionId: number; version: number }> {
  const { FitModelVersion } = analysisModels(s.sequelize, s.models)
  const version = await FitModelVersion.findOne({ where: { modelId: model.id }, order: [['version', 'DESC']] })
  const result = version?.result
  if (!version || version.status !== 'fitted' || !result) throw new ConflictError('The latest version of this model is not fitted: fit it first (the limits use its residuals).')
  if (!(star.massMsun > 0)) throw new ConflictError('The star has no mass: set it on the star first (the map is in M sin i).')
  const byId = new Map(result.residuals.map((r) => [r.measurementId, r.residual]))
  const ids = [...byId.keys()]
  const rows = await s.sequelize.query<{ id: number; instrument: string; time: number; error: number }>(
    `SELECT m.id, d.instrument, m.time, m.error FROM measurements m JOIN datasets d ON d.id = m.dataset_id
      WHERE m.star_id = :star AND m.id IN (:ids) ORDER BY m.time, m.id`,
    { replacements: { star: star.id, ids: ids.length ? ids : [0] }, type: QueryTypes.SELECT },
  )
  if (rows.length < 10) throw new ConflictError(`The fit used ${rows.length} measurements; detection limits need at least 10.`)
  const jitter = new Map(result.instruments.map((i) => [i.name, i.jitter ?? 0]))
  const planets = result.planets.map((p, k) => ({
    label: String.fromCharCode(98 + k), period: p.period, massEarth: minimumMass(p.period, Math.abs(p.K), Math.min(p.e, 0.99), star.massMsun).msiniMearth,
  }))
  return {
    version: version.version, versionId: version.id,
    input: {
      measurementIds: rows.map((r) => r.id), t: rows.map((r) => Number(r.time)), residuals: rows.map((r) => byId.get(r.id)!),
      dy: rows.map((r) => Math.hypot(Number(r.error), jitter.get(r.instrument) ?? 0)), starMass: star.massMsun, planets,
    },
  }
}

export function settingsOf(body: ReturnType<typeof startLimitsRequestSchema.parse>): LimitsSettings {
  return {
    periods: body.periods ?? LIMITS_DEFAULTS.periods, masses: body.masses ?? LIMITS_DEFAULTS.masses, phases: body.phases ?? LIMITS_DEFAULTS.phases,
    eccentricities: body.eccentricities ?? [0], minPeriod: body.minPeriod ?? null, maxPeriod: body.maxPeriod ?? null,
    minMassEarth: body.minMassEarth ?? null, maxMassEarth: body.maxMassEarth ?? null,
    criterion: body.criterion ?? LIMITS_DEFAULTS.criterion, fapThreshold: body.fapThreshold ?? LIMITS_DEFAULTS.fapThreshold,
    chunks: body.chunks ?? LIMITS_DEFAULTS.chunks,
  }
}

/** Job options of a chunk: retried when its worker fails; expiry is only a backstop (the stale-chunk check requeues sooner). */
function chunkJobs(s: Services, runId: number, indices: number[]): PgBoss.JobInsert[] {
  return indices.map((index) => ({ name: LIMITS_QUEUE, data: { runId, chunk: index }, retryLimit: s.config.jobs.retryLimit, retryDelay: 1, expireInSeconds: 3600 }))
}

export async function startRun(s: Services, actor: User, star: Star, model: FitModel, raw: StartLimitsRequest): Promise<LimitsRun> {
  const body = startLimitsRequestSchema.parse(raw)
  const settings = settingsOf(body)
  const { input, versionId, version } = await inputOf(s, star, model)
  const seed = body.seed ?? randomInt(0, 2 ** 32 - 1)
  let trials: number
  try {
    trials = prepareLimits(problemOf(input, settings, seed)).grid.trials
  } catch (e) {
    if (e instanceof RangeError) throw new ValidationError(`The grid cannot be built for these data: ${e.message}`)
    throw e
  }
  const count = Math.min(settings.chunks, trials)
  const ranges = chunkRanges(trials, count)
  const runId = await s.sequelize.transaction(async (transaction) => {
    const [rows] = await s.sequelize.query(
      `INSERT INTO limit_runs (star_id, model_id, model_version_id, model_version, settings, seed, input, trials, chunk_count, requested_by, created_at, updated_at)
       VALUES (:star, :model, :versionId, :version, :settings, :seed, :input, :trials, :count, :user, now(), now()) RETURNING id`,
      { replacements: { star: star.id, model: model.id, versionId, version, settings: JSON.stringify(settings), seed, input: JSON.stringify(input), trials, count, user: actor.id }, transaction },
    )
    const id = (rows as Array<{ id: number }>)[0].id
    await s.sequelize.query(
      `INSERT INTO limit_chunks (run_id, index, start, "end") SELECT :id, i, s, e FROM unnest(:idx::int[], :starts::int[], :ends::int[]) AS x(i, s, e)`,
      { replacements: { id, idx: `{${ranges.map((_, i) => i).join(',')}}`, starts: `{${ranges.map((r) => r.start).join(',')}}`, ends: `{${ranges.map((r) => r.end).join(',')}}` }, transaction },
    )
    await record(s, { teamId: star.teamId, userId: actor.id, action: 'limits.start', entity: 'limits', entityId: id, detail: { starId: star.id, modelId: model.id, version, seed, settings } }, transaction)
    return id
  })
  await jobSender(s).insert(chunkJobs(s, runId, ranges.map((_, i) => i)))
  return (await loadRun(s, runId))!
}

export async function cancelRun(s: Services, actor: User, star: Star, run: LimitsRun): Promise<LimitsRun> {
  if (run.state !== 'queued' && run.state !== 'running') throw new ConflictError(`The run has already ${run.state === 'cancelled' ? 'been cancelled' : run.state}.`)
  const [, n] = await s.sequelize.query(
    `UPDATE limit_runs SET state = 'cancelled', finished_at = now(), updated_at = now(), error = :msg WHERE id = :id AND state IN ('queued', 'running')`,
    { replacements: { id: run.id, msg: `Cancelled by ${actor.name}.` } },
  )
  if (!n) throw new ConflictError('The run finished in the meantime.')
  await record(s, { teamId: star.teamId, userId: actor.id, action: 'limits.cancel', entity: 'limits', entityId: run.id, detail: { starId: star.id, was: run.state } })
  return (await loadRun(s, run.id))!
}

/** Queues the unfinished chunks of a cancelled or failed run again (the finished ones are kept). */
export async function resumeRun(s: Services, actor: User, star: Star, run: LimitsRun): Promise<LimitsRun> {
  if (run.state !== 'cancelled' && run.state !== 'failed') throw new ConflictError(`Only a cancelled or failed run can be resumed; this one is ${run.state}.`)
  const chunks = await s.sequelize.transaction(async (transaction) => {
    const [, n] = await s.sequelize.query(
      `UPDATE limit_runs SET state = 'queued', finished_at = NULL, error = NULL, updated_at = now() WHERE id = :id AND state IN ('cancelled', 'failed')`,
      { replacements: { id: run.id }, transaction },
    )
    if (!n) throw new ConflictError('The run changed in the meantime.')
    const rows = await s.sequelize.query<{ index: number }>(
      `UPDATE limit_chunks SET state = 'queued', worker_id = NULL WHERE run_id = :id AND state <> 'done' RETURNING index`,
      { replacements: { id: run.id }, type: QueryTypes.SELECT, transaction },
    )
    await record(s, { teamId: star.teamId, userId: actor.id, action: 'limits.resume', entity: 'limits', entityId: run.id, detail: { starId: star.id, chunks: rows.length } }, transaction)
    return rows.map((r) => r.index)
  })
  if (chunks.length) await jobSender(s).insert(chunkJobs(s, run.id, chunks))
  else await finishIfComplete(s, run.id)
  return (await loadRun(s, run.id))!
}

// ---------------------------------------------------------------------------------------------
// The worker side (server/limits/worker.ts)

/** Takes chunk `index` of run `runId` for `workerId` if it is queued, or running without a heartbeat for `staleSeconds`. */
export async function claimChunk(s: Services, runId: number, index: number, workerId: string, staleSeconds: number) {
  const rows = await s.sequelize.query<{ start: number; end: number; settings: LimitsSettings; seed: string; input: LimitsInput }>(
    `WITH c AS (
       UPDATE limit_chunks SET state = 'running', worker_id = :w, heartbeat_at = now(), attempts = attempts + 1
        WHERE run_id = :run AND index = :index
          AND (state = 'queued' OR (state = 'running' AND heartbeat_at < now() - make_interval(secs => :stale)))
          AND EXISTS (SELECT 1 FROM limit_runs r WHERE r.id = :run AND r.state IN ('queued', 'running'))
        RETURNING start, "end")
     SELECT c.start, c."end", r.settings, r.seed, r.input FROM c, limit_runs r WHERE r.id = :run`,
    { replacements: { run: runId, index, w: workerId, stale: staleSeconds }, type: QueryTypes.SELECT },
  )
  if (!rows.length) return null
  await s.sequelize.query(`UPDATE limit_runs SET state = 'running', started_at = coalesce(started_at, now()), updated_at = now() WHERE id = :run AND state = 'queued'`, { replacements: { run: runId } })
  const r = rows[0]
  return { start: r.start, end: r.end, settings: r.settings, seed: Number(r.seed), input: r.input }
}

export async function heartbeat(s: Services, runId: number, index: number, workerId: string): Promise<void> {
  await s.sequelize.query(`UPDATE limit_chunks SET heartbeat_at = now() WHERE run_id = :run AND index = :index AND worker_id = :w AND state = 'running'`, { replacements: { run: runId, index, w: workerId } })
}

/** Stores a chunk's outcomes (only if this worker still holds it), then finishes the run if it was the last. */
export async function completeChunk(s: Services, runId: number, index: number, workerId: string, recovered: Uint8Array): Promise<void> {
  await s.sequelize.query(
    `UPDATE limit_chunks SET state = 'done', recovered = :bytes, finished_at = now() WHERE run_id = :run AND index = :index AND worker_id = :w AND state = 'running'`,
    { replacements: { run: runId, index, w: workerId, bytes: Buffer.from(recovered) } },
  )
  await finishIfComplete(s, runId)
}

/** When every chunk is done: merge (one worker wins the row lock), store the map, contours and table. */
export async function finishIfComplete(s: Services, runId: number): Promise<boolean> {
  return s.sequelize.transaction(async (transaction) => {
    const runs = await s.sequelize.query<{ state: LimitsState; settings: LimitsSettings; seed: string; input: LimitsInput }>(
      `SELECT state, settings, seed, input FROM limit_runs WHERE id = :run FOR UPDATE`, { replacements: { run: runId }, type: QueryTypes.SELECT, transaction },
    )
    const run = runs[0]
    if (!run || (run.state !== 'running' && run.state !== 'queued')) return false
    const chunks = await s.sequelize.query<{ start: number; end: number; state: string; recovered: Buffer | null }>(
      `SELECT start, "end", state, recovered FROM limit_chunks WHERE run_id = :run ORDER BY index`, { replacements: { run: runId }, type: QueryTypes.SELECT, transaction },
    )
    if (chunks.some((c) => c.state !== 'done' || !c.recovered)) return false
    const prep = prepareLimits(problemOf(run.input, run.settings, Number(run.seed)))
    const parts: ChunkResult[] = chunks.map((c) => ({ start: c.start, end: c.end, recovered: new Uint8Array(c.recovered!) }))
    const map = mergeChunks(prep.grid, parts)
    const nM = prep.grid.massesEarth.length
    const result: LimitsResult = {
      periods: Array.from(prep.grid.periods), massesEarth: Array.from(prep.grid.massesEarth),
      fraction: Array.from(prep.grid.periods, (_, i) => Array.from(map.fraction.subarray(i * nM, (i + 1) * nM))),
      perCell: map.perCell,
      contour50: completenessContour(map, 0.5), contour90: completenessContour(map, 0.9), table: limitTable(map),
      planets: run.input.planets, giants: solarSystemGiants(run.input.starMass).map((g) => ({ name: g.name, period: g.period, massEarth: g.massEarth })),
      level: prep.recovery.level, nPoints: prep.recovery.nPoints, baseline: prep.recovery.baseline, starMass: run.input.starMass,
    }
    await s.sequelize.query(
      `UPDATE limit_runs SET state = 'succeeded', result = :result, finished_at = now(), updated_at = now() WHERE id = :run`,
      { replacements: { run: runId, result: JSON.stringify(result) }, transaction },
    )
    return true
  })
}

/** Marks a run failed (a chunk's computation threw: the same input would throw again). */
export async function failRun(s: Services, runId: number, message: string): Promise<void> {
  await s.sequelize.query(`UPDATE limit_runs SET state = 'failed', error = :msg, finished_at = now(), updated_at = now() WHERE id = :run AND state IN ('queued', 'running')`, { replacements: { run: runId, msg: message } })
}

/**
 * Chunks marked running whose heartbeat is older than `staleSeconds` lost their worker (killed,
 * machine gone): they go back to queued with a fresh job, which any worker takes. Returns how many.
 */
export async function requeueStaleChunks(s: Services, boss: PgBoss, staleSeconds: number): Promise<number> {
  const rows = await s.sequelize.query<{ run_id: number; index: number }>(
    `UPDATE limit_chunks c SET state = 'queued', worker_id = NULL
      WHERE c.state = 'running' AND c.heartbeat_at < now() - make_interval(secs => :stale)
        AND EXISTS (SELECT 1 FROM limit_runs r WHERE r.id = c.run_id AND r.state IN ('queued', 'running'))
      RETURNING c.run_id, c.index`,
    { replacements: { stale: staleSeconds }, type: QueryTypes.SELECT },
  )
  for (const r of rows) await boss.insert(chunkJobs(s, r.run_id, [r.index]))
  return rows.length
}

export function notFound(): never { throw new NotFoundError('Detection-limit run') }

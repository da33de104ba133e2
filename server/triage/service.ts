// Survey triage: the automatic search queued per star on the pg-boss queue `triage` (one job per
// star; any worker process on any machine sharing the PostgreSQL takes any job). A row per star
// per run in `triage_results` (migration 0011) holds the state, the worker's heartbeat and the
// search's summary; a worker that dies stops beating and any worker's stale check requeues its
// star. See README.md.
import { QueryTypes, type Sequelize } from 'sequelize'
import type PgBoss from 'pg-boss'
import type { Services } from '../services.ts'
import type { User } from '../db/models.ts'
import { ValidationError } from '../errors.ts'
import { record } from '../audit/service.ts'
import { createJobSender } from '../jobs/boss.ts'
import type { TriageQueueStatus, TriageRow, TriageState, TriageSummary } from '../../shared/api/survey.ts'

export const TRIAGE_QUEUE = 'triage'

const senders = new WeakMap<Sequelize, PgBoss>()
function jobSender(s: Services): PgBoss {
  let b = senders.get(s.sequelize)
  if (!b) { b = createJobSender(s.sequelize); senders.set(s.sequelize, b) }
  return b
}

/** Job of one star: retried when its worker fails; expiry only a backstop (the stale check requeues sooner). */
function jobsOf(s: Services, ids: number[]): PgBoss.JobInsert[] {
  return ids.map((resultId) => ({ name: TRIAGE_QUEUE, data: { resultId }, retryLimit: s.config.jobs.retryLimit, retryDelay: 1, expireInSeconds: 3600 }))
}

/** Queues the search of `starIds` (stars of team `teamId`, not archived) as one run. */
export async function queueStars(s: Services, actor: User, teamId: number, starIds: number[] | null, via: string): Promise<{ runId: number; queued: number }> {
  const stars = await s.sequelize.query<{ id: number }>(
    `SELECT id FROM stars WHERE team_id = :team AND archived_at IS NULL ${starIds ? 'AND id IN (:ids)' : ''} ORDER BY id`,
    { replacements: { team: teamId, ids: starIds?.length ? starIds : [0] }, type: QueryTypes.SELECT },
  )
  if (starIds) {
    const found = new Set(stars.map((r) => r.id))
    const missing = starIds.filter((id) => !found.has(id))
    if (missing.length) throw new ValidationError(`starIds: star ${missing[0]} is not an active star of this team.`, 'starIds')
  }
  if (!stars.length) throw new ValidationError('The team has no active star to search: upload data first.', 'starIds')
  const { runId, ids } = await s.sequelize.transaction(async (transaction) => {
    const [rows] = await s.sequelize.query(
      `INSERT INTO triage_runs (team_id, requested_by, star_count, created_at) VALUES (:team, :user, :n, now()) RETURNING id`,
      { replacements: { team: teamId, user: actor.id, n: stars.length }, transaction },
    )
    const runId = (rows as Array<{ id: number }>)[0]!.id
    const inserted = await s.sequelize.query<{ id: number }>(
      `INSERT INTO triage_results (run_id, team_id, star_id, created_at) SELECT :run, :team, x, now() FROM unnest(:stars::int[]) AS x RETURNING id`,
      { replacements: { run: runId, team: teamId, stars: `{${stars.map((r) => r.id).join(',')}}` }, type: QueryTypes.SELECT, transaction },
    )
    await record(s, { teamId, userId: actor.id, action: 'triage.queue', entity: 'team', entityId: teamId, detail: { runId, stars: stars.length, via } }, transaction)
    return { runId, ids: inserted.map((r) => r.id) }
  })
  await jobSender(s).insert(jobsOf(s, ids))
  return { runId, queued: ids.length }
}

interface RowDb {
  star_id: number; star_name: string; id: number; run_id: number; state: TriageState; attempts: number; error: string | null
  result: TriageSummary | null; created_at: Date; finished_at: Date | null
}

/** The team table: each active star's latest triage (stars never triaged are left out). */
export async function teamTable(s: Services, teamId: number): Promise<TriageRow[]> {
  const rows = await s.sequelize.query<RowDb>(
    `SELECT DISTINCT ON (r.star_id) r.star_id, st.name AS star_name, r.id, r.run_id, r.state, r.attempts, r.error, r.result, r.created_at, r.finished_at
       FROM triage_results r JOIN stars st ON st.id = r.star_id
      WHERE r.team_id = :team AND st.archived_at IS NULL
      ORDER BY r.star_id, r.id DESC`,
    { replacements: { team: teamId }, type: QueryTypes.SELECT },
  )
  return rows.map((r) => ({
    starId: r.star_id, starName: r.star_name, resultId: r.id, runId: r.run_id, state: r.state, attempts: r.attempts, error: r.error,
    summary: r.result, queuedAt: new Date(r.created_at).toISOString(), finishedAt: r.finished_at ? new Date(r.finished_at).toISOString() : null,
  })).sort((a, b) => a.starName.localeCompare(b.starName))
}

/** Depth and throughput of the whole queue (every team shares the workers) and the team's own share. */
export async function queueStatus(s: Services, teamId: number): Promise<TriageQueueStatus> {
  const [mine] = await s.sequelize.query<{ queued: string; running: string }>(
    `SELECT count(*) FILTER (WHERE state = 'queued') AS queued, count(*) FILTER (WHERE state = 'running') AS running FROM triage_results WHERE team_id = :team`,
    { replacements: { team: teamId }, type: QueryTypes.SELECT },
  )
  const [all] = await s.sequelize.query<{ depth: string; done: string; failed: string }>(
    `SELECT count(*) FILTER (WHERE state IN ('queued', 'running')) AS depth,
            count(*) FILTER (WHERE state = 'done' AND finished_at > now() - interval '1 hour') AS done,
            count(*) FILTER (WHERE state = 'failed' AND finished_at > now() - interval '1 hour') AS failed
       FROM triage_results`, { type: QueryTypes.SELECT },
  )
  const workers = await s.sequelize.query<{ worker: string; last_seen: Date; jobs: string }>(
    `SELECT split_part(worker_id, ':triage:', 1) AS worker, max(coalesce(heartbeat_at, finished_at)) AS last_seen, count(*) AS jobs
       FROM triage_results WHERE worker_id IS NOT NULL AND coalesce(heartbeat_at, finished_at) > now() - interval '10 minutes'
      GROUP BY 1 ORDER BY 2 DESC LIMIT 100`, { type: QueryTypes.SELECT },
  )
  const done = Number(all!.done)
  return {
    queued: Number(mine!.queued), running: Number(mine!.running), queueDepth: Number(all!.depth),
    doneLastHour: done, perMinute: done / 60, failedLastHour: Number(all!.failed),
    workers: workers.map((w) => ({ id: w.worker, lastSeen: new Date(w.last_seen).toISOString(), jobs: Number(w.jobs) })),
  }
}

// ---------------------------------------------------------------------------------------------
// The worker side (server/triage/worker.ts)

/** Takes star result `id` for `workerId` if it is queued, or running without a heartbeat for `staleSeconds`. */
export async function claim(s: Services, id: number, workerId: string, staleSeconds: number): Promise<{ starId: number } | null> {
  const rows = await s.sequelize.query<{ star_id: number }>(
    `UPDATE triage_results SET state = 'running', worker_id = :w, heartbeat_at = now(), attempts = attempts + 1, started_at = coalesce(started_at, now())
      WHERE id = :id AND (state = 'queued' OR (state = 'running' AND heartbeat_at < now() - make_interval(secs => :stale)))
      RETURNING star_id`,
    { replacements: { id, w: workerId, stale: staleSeconds }, type: QueryTypes.SELECT },
  )
  return rows.length ? { starId: rows[0]!.star_id } : null
}

export async function heartbeat(s: Services, id: number, workerId: string): Promise<void> {
  await s.sequelize.query(`UPDATE triage_results SET heartbeat_at = now() WHERE id = :id AND worker_id = :w AND state = 'running'`, { replacements: { id, w: workerId } })
}

/** Stores the summary (only if this worker still holds the row). */
export async function complete(s: Services, id: number, workerId: string, summary: TriageSummary): Promise<void> {
  await s.sequelize.query(
    `UPDATE triage_results SET state = 'done', result = :result, error = NULL, finished_at = now(), heartbeat_at = now() WHERE id = :id AND worker_id = :w AND state = 'running'`,
    { replacements: { id, w: workerId, result: JSON.stringify(summary) } },
  )
}

/** The search refused the star's data (too few points…): every retry would too. */
export async function fail(s: Services, id: number, workerId: string, message: string): Promise<void> {
  await s.sequelize.query(
    `UPDATE triage_results SET state = 'failed', error = :msg, finished_at = now(), heartbeat_at = now() WHERE id = :id AND worker_id = :w AND state = 'running'`,
    { replacements: { id, w: workerId, msg: message } },
  )
}

/** Rows marked running whose heartbeat is older than `staleSeconds` lost their worker: back to queued with a fresh job. */
export async function requeueStale(s: Services, boss: PgBoss, staleSeconds: number): Promise<number> {
  const rows = await s.sequelize.query<{ id: number }>(
    `UPDATE triage_results SET state = 'queued', worker_id = NULL
      WHERE state = 'running' AND heartbeat_at < now() - make_interval(secs => :stale) RETURNING id`,
    { replacements: { stale: staleSeconds }, type: QueryTypes.SELECT },
  )
  if (rows.length) await boss.insert(jobsOf(s, rows.map((r) => r.id)))
  return rows.length
}

// The `triage` queue's handlers, registered by server/jobs/index.ts beside the sampling and limits
// ones. A job is one star: claim its row (queued, or stale), heartbeat every second while a thread
// runs the search, store the summary. A stale check requeues stars whose worker died. See README.md.
import type PgBoss from 'pg-boss'
import type { Services } from '../services.ts'
import { starRows, selectRows, rvDataOf } from '../analyses/data.ts'
import { runInThread, setThreadCount } from '../limits/threads.ts'
import { claim, complete, fail, heartbeat, requeueStale, TRIAGE_QUEUE } from './service.ts'
import type { TriageInput } from './summary.ts'

export interface TriageWorkerOptions {
  concurrency: number
  staleSeconds: number
  workerId: string
  pollingIntervalSeconds?: number
  log?: (msg: string) => void
}

/** Fewest usable velocities the search is run on (as the search route). */
export const MIN_POINTS = 10

/** The star's usable velocities (exclusions honoured) and its indicator columns (NaN where a row has none). */
export async function triageInput(s: Services, starId: number): Promise<TriageInput | string> {
  const star = await s.models.Star.findByPk(starId)
  if (!star || star.archivedAt) return 'The star was archived before its search ran.'
  const { used } = selectRows(await starRows(s, star), null, 'instruments')
  if (used.length < MIN_POINTS) return `${used.length} usable velocities (excluded points left out); the search needs at least ${MIN_POINTS}.`
  const { data } = rvDataOf(used)
  const names = [...new Set(used.flatMap((r) => Object.keys(r.indicators ?? {})))].sort()
  const indicators = names.map((name) => ({ name, value: Float64Array.from(used, (r) => { const v = r.indicators?.[name]; return typeof v === 'number' ? v : NaN }) }))
    .filter((c) => c.value.filter(Number.isFinite).length >= MIN_POINTS)
  return { data, indicators }
}

/** One star's job. Returns normally when there is nothing to do (done, or held by a live worker). */
export async function runTriageJob(s: Services, resultId: number, workerId: string, staleSeconds: number): Promise<void> {
  const c = await claim(s, resultId, workerId, staleSeconds)
  if (!c) return
  const beat = setInterval(() => { heartbeat(s, resultId, workerId).catch(() => undefined) }, 1000)
  beat.unref()
  try {
    const input = await triageInput(s, c.starId)
    if (typeof input === 'string') { await fail(s, resultId, workerId, input); return }
    const summary = await runInThread('triage', input)
    await complete(s, resultId, workerId, summary)
  } catch (e) {
    // the search refused the data: a retry would too
    await fail(s, resultId, workerId, `The search could not run: ${e instanceof Error ? e.message : String(e)}`)
  } finally {
    clearInterval(beat)
  }
}

/** Registers `concurrency` handlers on the triage queue and the stale check; returns a stop function. */
export async function registerTriageWorkers(s: Services, boss: PgBoss, o: TriageWorkerOptions): Promise<() => void> {
  setThreadCount(o.concurrency)
  if (!(await boss.getQueue(TRIAGE_QUEUE))) await boss.createQueue(TRIAGE_QUEUE)
  for (let i = 0; i < o.concurrency; i++) {
    await boss.work<{ resultId: number }>(TRIAGE_QUEUE, { batchSize: 1, pollingIntervalSeconds: o.pollingIntervalSeconds ?? 2 }, async ([job]) => {
      if (!job) return
      await runTriageJob(s, job.data.resultId, `${o.workerId}:triage:${i}`, o.staleSeconds)
    })
  }
  const reaper = setInterval(() => {
    requeueStale(s, boss, o.staleSeconds).then((n) => { if (n) o.log?.(`requeued ${n} stale triage stars`) })
      .catch((err) => o.log?.(`stale triage check failed: ${String(err)}`))
  }, Math.max(500, (o.staleSeconds * 1000) / 2))
  reaper.unref()
  boss.on('stopped', () => clearInterval(reaper))
  return () => clearInterval(reaper)
}

// The `limits` queue's handlers, registered by server/jobs/index.ts beside the sampling ones. A job
// is one chunk: claim it (queued, or stale), heartbeat every second while a thread computes it,
// store its outcomes, merge the run when it was the last. A stale-chunk check requeues chunks whose
// worker died. See README.md.
import type PgBoss from 'pg-boss'
import type { Services } from '../services.ts'
import { claimChunk, completeChunk, failRun, heartbeat, requeueStaleChunks, LIMITS_QUEUE } from './service.ts'
import { runInThread, setThreadCount } from './threads.ts'

export interface LimitWorkerOptions {
  concurrency: number
  staleSeconds: number
  workerId: string
  pollingIntervalSeconds?: number
  log?: (msg: string) => void
}

/** One chunk job. Returns normally when there is nothing to do (run cancelled, chunk done or held by a live worker). */
export async function runChunkJob(s: Services, runId: number, index: number, workerId: string, staleSeconds: number): Promise<void> {
  const claim = await claimChunk(s, runId, index, workerId, staleSeconds)
  if (!claim) return
  const beat = setInterval(() => { heartbeat(s, runId, index, workerId).catch(() => undefined) }, 1000)
  beat.unref()
  try {
    const out = await runInThread('chunk', { input: claim.input, settings: claim.settings, seed: claim.seed, start: claim.start, end: claim.end })
    clearInterval(beat)
    await completeChunk(s, runId, index, workerId, Uint8Array.from(out))
  } catch (e) {
    clearInterval(beat)
    // the computation refused the input: every retry would too
    await failRun(s, runId, `Chunk ${index} could not be computed: ${e instanceof Error ? e.message : String(e)}`)
  }
}

/** Registers `concurrency` handlers on the limits queue and the stale-chunk check; returns a stop function. */
export async function registerLimitWorkers(s: Services, boss: PgBoss, o: LimitWorkerOptions): Promise<() => void> {
  setThreadCount(o.concurrency)
  if (!(await boss.getQueue(LIMITS_QUEUE))) await boss.createQueue(LIMITS_QUEUE)
  for (let i = 0; i < o.concurrency; i++) {
    await boss.work<{ runId: number; chunk: number }>(LIMITS_QUEUE, { batchSize: 1, pollingIntervalSeconds: o.pollingIntervalSeconds ?? 2 }, async ([job]) => {
      if (!job) return
      await runChunkJob(s, job.data.runId, job.data.chunk, `${o.workerId}:limits:${i}`, o.staleSeconds)
    })
  }
  const reaper = setInterval(() => {
    requeueStaleChunks(s, boss, o.staleSeconds).then((n) => { if (n) o.log?.(`requeued ${n} stale detection-limit chunks`) })
      .catch((err) => o.log?.(`stale-chunk check failed: ${String(err)}`))
  }, Math.max(500, (o.staleSeconds * 1000) / 2))
  reaper.unref()
  boss.on('stopped', () => clearInterval(reaper))
  return () => clearInterval(reaper)
}

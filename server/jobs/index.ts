// Job workers: a started pg-boss working on the queues, in the API process (when the config says
// so) or in a process of its own (`scripts/worker.ts`), on this machine or another one, against
// the same DATABASE_URL. See README.md.
import { hostname } from 'node:os'
import type PgBoss from 'pg-boss'
import type { Services } from '../services.ts'
import { SAMPLING_QUEUE, startBoss } from './boss.ts'
import { runSamplingJob, type RunControl } from '../sampling/runner.ts'
import { reapStaleRuns } from '../sampling/service.ts'
import { jobsAppName } from '../sampling/ensembles.ts'
import { registerLimitWorkers } from '../limits/worker.ts'
import { registerTriageWorkers } from '../triage/worker.ts'

export interface JobWorkerOptions {
  /** Sampling runs worked on at once by this process (each takes one core). */
  concurrency?: number
  /** Seconds without a heartbeat after which a running run's worker is taken for dead. */
  staleSeconds?: number
  /** Steps between the checkpoints of a sampling run. */
  checkpointEvery?: number
  /** Least time between checkpoints, ms (default from the config: 10 s). */
  checkpointMinMs?: number
  /** Queue polling interval, seconds (pg-boss minimum 0.5). */
  pollingIntervalSeconds?: number
  log?: (msg: string, extra?: Record<string, unknown>) => void
}

export interface JobWorkers {
  boss: PgBoss
  workerId: string
  /** Stops taking jobs; running samplers checkpoint and stop, their jobs go back to the queue. */
  stop(): Promise<void>
}

let counter = 0

/** Starts the job workers of this process. */
export async function startJobWorkers(s: Services, opts: JobWorkerOptions = {}): Promise<JobWorkers> {
  const cfg = s.config.jobs
  const concurrency = opts.concurrency ?? cfg.concurrency
  if (!(Number.isInteger(concurrency) && concurrency >= 1)) throw new RangeError(`concurrency must be an integer ≥ 1, got ${concurrency}`)
  const staleSeconds = opts.staleSeconds ?? cfg.staleSeconds
  const checkpointEvery = opts.checkpointEvery ?? cfg.checkpointEvery
  const log = opts.log ?? (() => {})
  const workerId = `${hostname()}:${process.pid}:${++counter}`
  // the connections' name carries the slots: how the API counts the workers seen (parallel sampling)
  const boss = await startBoss(s.config.databaseUrl, (err) => log(`job queue error: ${err.message}`), jobsAppName(workerId, concurrency))

  let stopping = false
  const listeners = new Set<() => void>()
  const control: RunControl = {
    shuttingDown: () => stopping,
    onShutdown: (fn) => { listeners.add(fn); return () => listeners.delete(fn) },
  }
  for (let i = 0; i < concurrency; i++) {
    await boss.work<{ runId: number }>(SAMPLING_QUEUE, { batchSize: 1, pollingIntervalSeconds: opts.pollingIntervalSeconds ?? cfg.pollingIntervalSeconds }, async ([job]) => {
      if (!job) return
      return runSamplingJob(s, job.data.runId, job.id, { workerId: `${workerId}:${i}`, checkpointEvery, checkpointMinMs: opts.checkpointMinMs ?? cfg.checkpointMinMs, staleSeconds, log }, control)
    })
  }
  await registerLimitWorkers(s, boss, { concurrency, staleSeconds, workerId, pollingIntervalSeconds: opts.pollingIntervalSeconds ?? cfg.pollingIntervalSeconds, log }) // detection-limit chunks (server/limits)
  await registerTriageWorkers(s, boss, { concurrency, staleSeconds, workerId, pollingIntervalSeconds: opts.pollingIntervalSeconds ?? cfg.pollingIntervalSeconds, log }) // survey triage, one star per job (server/triage)
  // runs whose worker died (no heartbeat): fail their jobs so pg-boss retries them (they resume)
  const reaper = setInterval(() => {
    reapStaleRuns(s, boss, staleSeconds).catch((err) => log(`stale-run check failed: ${String(err)}`))
  }, Math.max(500, (staleSeconds * 1000) / 2))
  reaper.unref()
  log(`job workers started (${workerId}, concurrency ${concurrency})`)

  return {
    boss, workerId,
    async stop() {
      if (stopping) return
      stopping = true
      clearInterval(reaper)
      for (const fn of listeners) fn()
      await boss.stop({ graceful: true, wait: true, timeout: 20_000 })
      log(`job workers stopped (${workerId})`)
    },
  }
}

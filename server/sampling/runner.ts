// The job handler of one sampling run. It claims the run's row, runs the sampler in a dedicated
// worker thread (a run lasts minutes, longer than the compute pool's time limit), writes progress
// and a heartbeat every second, saves checkpoints, stops the thread when the run is cancelled,
// stores the result, and e-mails the requester. A retried job resumes from the last checkpoint.
import { Worker } from 'node:worker_threads'
import { QueryTypes } from 'sequelize'
import type { Services } from '../services.ts'
import { samplingModels, type SamplingRun } from '../db/models-sampling.ts'
import { STOP_CANCEL, STOP_SHUTDOWN, type ThreadData, type ThreadMessage } from './thread.ts'
import type { SamplingProgress, SamplingResult } from '../../shared/api/sampling.ts'
import type { ChainRows } from '../../shared/rv/chain-store.ts'
import { ensembleEnded, parentOf, scheduleMergeCheck } from './ensembles.ts'

export interface RunnerOptions {
  /** Who is working (host:pid:n), written to the row while the run is claimed. */
  workerId: string
  /** Steps between checkpoints. */
  checkpointEvery: number
  /** Least time between checkpoints, ms (a fast run would otherwise write its growing chain too often). */
  checkpointMinMs: number
  /** A running run whose heartbeat is older than this is taken to have lost its worker. */
  staleSeconds: number
  /** Interval of the progress/heartbeat writes, ms (default 1000). */
  heartbeatMs?: number
  log?: (msg: string, extra?: Record<string, unknown>) => void
}

/** Thrown when the process stops mid-run: the job is retried elsewhere and resumes from its checkpoint. */
export class ShutdownError extends Error {
  constructor(runId: number, step: number) { super(`sampling run ${runId} interrupted by a worker shutdown at step ${step}; it will resume from its checkpoint`) }
}

function threadScript(): URL {
  const ts = import.meta.url.endsWith('.ts')
  return new URL(ts ? './thread-boot.mjs' : './thread.js', import.meta.url)
}

const bytes = (a: Float64Array): Buffer => Buffer.from(a.buffer, a.byteOffset, a.byteLength)

/** Every chunk of a run's kept chain up to `upToStep`, concatenated in order, and the next chunk number. */
export async function loadChunks(s: Services, runId: number, upToStep: number): Promise<{ rows: ChainRows; nextSeq: number }> {
  const chunks = await s.sequelize.query<{ seq: number; steps: Buffer; chain: Buffer; lnprob: Buffer }>(
    'SELECT seq, steps, chain, lnprob FROM sampling_chunks WHERE run_id = :id AND last_step <= :step ORDER BY seq',
    { replacements: { id: runId, step: upToStep }, type: QueryTypes.SELECT },
  )
  const cat = (bufs: Buffer[]): Uint8Array => {
    const out = new Uint8Array(bufs.reduce((n, b) => n + b.length, 0))
    let o = 0
    for (const b of bufs) { out.set(b, o); o += b.length }
    return out
  }
  const steps = cat(chunks.map((c) => c.steps)), chain = cat(chunks.map((c) => c.chain)), lnp = cat(chunks.map((c) => c.lnprob))
  return {
    rows: { steps: new Int32Array(steps.buffer, 0, steps.length / 4), chain: new Float64Array(chain.buffer, 0, chain.length / 8), lnProb: new Float64Array(lnp.buffer, 0, lnp.length / 8) },
    nextSeq: chunks.length ? chunks[chunks.length - 1]!.seq + 1 : 0,
  }
}

/**
 * Claims run `runId` for this worker: a queued run, or a running one whose heartbeat is stale (its
 * worker died). Returns false when the run is finished or another live worker has it.
 */
async function claim(s: Services, runId: number, jobId: string, opts: RunnerOptions): Promise<boolean> {
  const rows = await s.sequelize.query<{ id: number }>(
    `UPDATE sampling_runs SET state = 'running', worker_id = :worker, job_id = :job, heartbeat_at = now(),
       attempts = attempts + 1, started_at = COALESCE(started_at, now()), updated_at = now()
     WHERE id = :id AND COALESCE((settings->>'ensembles')::int, 1) <= 1 AND (state = 'queued' OR (state = 'running' AND (heartbeat_at IS NULL OR heartbeat_at < now() - make_interval(secs => :stale))))
     RETURNING id`,
    { replacements: { id: runId, worker: opts.workerId, job: jobId, stale: opts.staleSeconds }, type: QueryTypes.SELECT },
  )
  return rows.length === 1
}

export interface RunControl {
  /** Set when the process is stopping: the thread checkpoints and stops, the job is retried. */
  shuttingDown(): boolean
  onShutdown(fn: () => void): () => void
}

/** Runs one sampling job to its end (or to a cancellation or a shutdown). */
export async function runSamplingJob(s: Services, runId: number, jobId: string, opts: RunnerOptions, control: RunControl): Promise<{ state: string }> {
  const { SamplingRun } = samplingModels(s.sequelize, s.models)
  if (!(await claim(s, runId, jobId, opts))) {
    const row = await SamplingRun.findByPk(runId, { attributes: ['id', 'state'] })
    opts.log?.(`sampling run ${runId}: nothing to do (${row?.state ?? 'missing'})`)
    return { state: row?.state ?? 'missing' }
  }
  const run = (await SamplingRun.findByPk(runId))!
  // an ensemble of a parallel run: the parallel run is running once one of its ensembles is
  const parentId = parentOf(run.settings)
  if (parentId !== null) {
    await s.sequelize.query(`UPDATE sampling_runs SET state = 'running', started_at = COALESCE(started_at, now()), updated_at = now() WHERE id = :p AND state = 'queued'`, { replacements: { p: parentId } })
  }
  const resumeStep = run.checkpoint && run.checkpointStep > 0 ? run.checkpointStep : 0
  await SamplingRun.update({ resumedFromStep: resumeStep || null }, { where: { id: runId } })
  opts.log?.(`sampling run ${runId}: started (attempt ${run.attempts}${resumeStep ? `, resuming at step ${resumeStep}` : ''})`)
  // chunks past the checkpoint cannot exist (one transaction writes both); a fresh start has none
  await s.sequelize.query('DELETE FROM sampling_chunks WHERE run_id = :id AND last_step > :step', { replacements: { id: runId, step: resumeStep } })
  let seq = 0
  let rows: ChainRows | null = null
  if (resumeStep) {
    const loaded = await loadChunks(s, runId, resumeStep)
    rows = loaded.rows
    seq = loaded.nextSeq
  }

  const stopBuf = new SharedArrayBuffer(4)
  const stop = new Int32Array(stopBuf)
  const data: ThreadData = {
    input: run.input, settings: run.settings, stop: stopBuf, checkpointEvery: opts.checkpointEvery, checkpointMinMs: opts.checkpointMinMs,
    resume: resumeStep && rows ? { state: run.checkpoint!.state, rows } : null,
  }
  const t0 = Date.now()
  let progress: SamplingProgress = run.progress ?? { stepsDone: resumeStep, stepsTotal: run.settings.steps, tau: null, etaSeconds: null, acceptance: null, updatedAt: new Date().toISOString() }
  let lostClaim = false
  let writes: Promise<unknown> = Promise.resolve()
  const serial = (fn: () => Promise<unknown>) => { writes = writes.then(fn).catch((err) => opts.log?.(`sampling run ${runId}: write failed: ${String(err)}`)) }
  const mine = { id: runId, workerId: opts.workerId }

  const beat = async () => {
    const rows = await s.sequelize.query<{ state: string }>(
      `UPDATE sampling_runs SET progress = :progress::jsonb, heartbeat_at = now(), updated_at = now()
       WHERE id = :id AND worker_id = :workerId RETURNING state`,
      { replacements: { ...mine, progress: JSON.stringify(progress) }, type: QueryTypes.SELECT },
    )
    if (rows.length === 0) { lostClaim = true; Atomics.store(stop, 0, STOP_CANCEL) }
    else if (rows[0]!.state === 'cancelled') Atomics.store(stop, 0, STOP_CANCEL)
  }
  // append-only checkpoints: every chunk is written, in order, one at a time (a chunk and the
  // run's state at its step in one transaction)
  const appendChunk = async (msg: { step: number; rows: ChainRows; state?: Record<string, unknown> }): Promise<void> => {
    try {
      await s.sequelize.transaction(async (transaction) => {
        if (msg.state) {
          const [, n] = await s.sequelize.query(
            `UPDATE sampling_runs SET checkpoint = :checkpoint::jsonb, checkpoint_step = :step, checkpoint_chain = NULL, checkpoint_lnprob = NULL, updated_at = now()
              WHERE id = :id AND worker_id = :workerId`,
            { replacements: { ...mine, step: msg.step, checkpoint: JSON.stringify({ state: msg.state, nKept: msg.rows.steps.length, savedAt: new Date().toISOString() }) }, transaction },
          ) as unknown as [unknown, number]
          if (!n) throw new Error('the run is no longer ours')
        }
        if (msg.rows.steps.length === 0) return
        const st = msg.rows.steps
        await s.sequelize.query(
          `INSERT INTO sampling_chunks (run_id, seq, first_step, last_step, n_rows, steps, chain, lnprob, created_at)
           VALUES (:id, :seq, :first, :last, :n, :steps, :chain, :lnprob, now())`,
          {
            replacements: {
              id: runId, seq: seq++, first: st[0], last: st[st.length - 1], n: st.length,
              steps: Buffer.from(st.buffer, st.byteOffset, st.byteLength), chain: bytes(msg.rows.chain), lnprob: bytes(msg.rows.lnProb),
            },
            transaction,
          },
        )
      })
    } catch (err) { opts.log?.(`sampling run ${runId}: checkpoint failed: ${String(err)}`); return }
    // an ensemble's new rows: check whether the parallel run's ensembles agree now
    if (parentId !== null && msg.state) scheduleMergeCheck(s, parentId, 1000, opts.log)
  }
  let chunkWrites: Promise<void> = Promise.resolve()
  const queueChunk = (msg: { step: number; rows: ChainRows; state?: Record<string, unknown> }) => { chunkWrites = chunkWrites.then(() => appendChunk(msg)) }
  // cancel is read four times a second (a light query), so the thread stops within about 1/4 s + 10 steps;
  // an ensemble also stops once its parallel run has ended (merged, or cancelled)
  const cancelPoll = setInterval(() => {
    void s.sequelize.query<{ state: string; parent: string | null }>(
      'SELECT r.state, p.state AS parent FROM sampling_runs r LEFT JOIN sampling_runs p ON p.id = :parent WHERE r.id = :id',
      { replacements: { id: runId, parent: parentId ?? 0 }, type: QueryTypes.SELECT },
    )
      .then((r) => { if (r[0]?.state === 'cancelled' || (r[0]?.parent && ['succeeded', 'failed', 'cancelled'].includes(r[0].parent))) Atomics.store(stop, 0, STOP_CANCEL) })
      .catch(() => undefined)
  }, 250)
  const timer = setInterval(() => serial(beat), opts.heartbeatMs ?? 1000)
  const t0Steps = resumeStep
  const offShutdown = control.onShutdown(() => Atomics.compareExchange(stop, 0, 0, STOP_SHUTDOWN))
  if (control.shuttingDown()) Atomics.store(stop, 0, STOP_SHUTDOWN)

  const outcome = await new Promise<{ result?: unknown; error?: string }>((resolve) => {
    const worker = new Worker(threadScript(), { workerData: data })
    let settled = false
    const finish = (v: { result?: unknown; error?: string }) => { if (!settled) { settled = true; resolve(v); void worker.terminate() } }
    worker.on('message', (msg: ThreadMessage) => {
      if (msg.type === 'progress') {
        const elapsed = (Date.now() - t0) / 1000
        const rate = elapsed > 0.5 ? (msg.stepsDone - t0Steps) / elapsed : 0
        const target = run.settings.untilConverged ? (msg.expectedSteps ?? msg.stepsTotal) : msg.stepsTotal
        progress = {
          stepsDone: msg.stepsDone, stepsTotal: msg.stepsTotal, tau: msg.tau, acceptance: msg.acceptance,
          minNOverTau: msg.minNOverTau, maxRhat: msg.maxRhat, expectedSteps: msg.expectedSteps,
          etaSeconds: rate > 0 ? Math.max(0, target - msg.stepsDone) / rate : null, updatedAt: new Date().toISOString(),
        }
      } else if (msg.type === 'checkpoint') {
        queueChunk({ step: msg.step, rows: msg.rows, state: msg.state })
      } else if (msg.type === 'rows') {
        queueChunk({ step: msg.step, rows: msg.rows })
      } else if (msg.type === 'done') finish({ result: msg.result })
      else if (msg.type === 'error') finish({ error: msg.message })
    })
    worker.on('error', (err) => finish({ error: `the sampling thread crashed: ${err.message}` }))
    worker.on('exit', (code) => finish({ error: `the sampling thread stopped (exit code ${code})` }))
  })
  clearInterval(timer)
  clearInterval(cancelPoll)
  offShutdown()
  await writes
  await chunkWrites

  const flag = Atomics.load(stop, 0)
  if (lostClaim) {
    opts.log?.(`sampling run ${runId}: another worker took over; stopping`)
    return { state: 'lost' }
  }
  const now = new Date()
  if (flag === STOP_SHUTDOWN && !outcome.error) {
    // back in the queue; the job is retried (here or on another worker) and resumes
    await SamplingRun.update({ state: 'queued', workerId: null, heartbeatAt: null, progress }, { where: { ...mine, state: 'running' } })
    throw new ShutdownError(runId, progress.stepsDone)
  }
  if (outcome.error) {
    await SamplingRun.update({ state: 'failed', error: outcome.error, finishedAt: now, progress }, { where: { ...mine, state: 'running' } })
  } else {
    const result = outcome.result as SamplingResult
    const stepsDone = result.settings.stepsDone
    progress = { ...progress, stepsDone, etaSeconds: 0, updatedAt: now.toISOString() }
    // a cancelled run keeps its partial result (it says it was stopped); checkpoints are dropped
    const [n] = await SamplingRun.update(
      { state: 'succeeded', result, progress, finishedAt: now, checkpoint: null, checkpointChain: null, checkpointLnprob: null, checkpointStep: stepsDone },
      { where: { ...mine, state: 'running' } },
    )
    if (n === 0) await SamplingRun.update({ result, progress, finishedAt: now, checkpoint: null, checkpointChain: null, checkpointLnprob: null, checkpointStep: stepsDone }, { where: { ...mine, state: 'cancelled' } })
  }
  const final = (await SamplingRun.findByPk(runId))!
  opts.log?.(`sampling run ${runId}: ${final.state}`)
  if (parentId !== null) {
    // an ensemble mails nobody: its parallel run does, once merged
    await ensembleEnded(s, parentId).catch((err) => opts.log?.(`parallel sampling run ${parentId}: closing failed: ${String(err)}`))
  } else if (final.state === 'succeeded' || final.state === 'failed') await notify(s, final)
  return { state: final.state }
}

/** E-mails the requester that the run finished (a failure to send is logged, never fatal). */
export async function notify(s: Services, run: SamplingRun): Promise<void> {
  if (!run.requestedBy) return
  const user = await s.models.User.findByPk(run.requestedBy)
  const star = await s.models.Star.findByPk(run.starId)
  if (!user || !star) return
  const link = `${s.config.appUrl}/stars/${run.starId}/analysis?sampling=${run.id}`
  const ok = run.state === 'succeeded'
  const conv = ok && run.result ? (run.result.diagnostics.converged ? 'The chains converged.' : 'The chains did NOT converge: read the warnings before using the intervals.') : ''
  const text = ok
    ? `Hello ${user.name},\n\nThe posterior sampling of ${star.name} (run ${run.id}, model version ${run.modelVersion ?? '?'}, ` +
      `${run.settings.walkers} walkers × ${run.settings.steps} steps, seed ${run.settings.seed}) has finished. ${conv}\n\nResults: ${link}\n`
    : `Hello ${user.name},\n\nThe posterior sampling of ${star.name} (run ${run.id}) failed: ${run.error ?? 'unknown error'}\n\nDetails: ${link}\n`
  try {
    await s.mailer.send({ to: user.email, subject: `Sampling of ${star.name} ${ok ? 'finished' : 'failed'} (run ${run.id})`, text })
  } catch { /* the run's state is what matters; mail is best effort */ }
}

// A sampling job whose worker process is killed (SIGKILL, no chance to clean up) after its first
// checkpoint is taken over by another worker, which resumes it from that checkpoint: the run ends
// with exactly the requested steps, and the step it resumed from is the checkpoint's (> 0).
import { spawn, type ChildProcess } from 'node:child_process'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startJobWorkers, type JobWorkers } from '../../server/jobs/index.ts'
import { sampleInput } from '../../server/sampling/thread.ts'
import { startSamplingWorld, waitForRun, type SamplingWorld } from './sampling-setup.ts'

let w: SamplingWorld
let workers: JobWorkers | undefined
let child: ChildProcess | undefined
let childLog = ''
beforeAll(async () => { w = await startSamplingWorld() }, 180_000) // a demo seed, an upload and a fit: slow on a busy machine
afterAll(async () => {
  if (child && child.exitCode === null && child.signalCode === null) child.kill('SIGKILL')
  await workers?.stop()
  w?.services.mailer.close()
  await w?.t.close()
})

function startWorkerProcess(): ChildProcess {
  // node --import tsx (not npx) so that the pid killed is the worker itself, not a wrapper
  const p = spawn(process.execPath, ['--import', 'tsx', 'scripts/worker.ts'], {
    env: {
      ...process.env, NODE_ENV: 'test', DATABASE_URL: w.t.db.url, APP_URL: w.t.config.appUrl, LOG_LEVEL: 'warn',
      SMTP_HOST: '127.0.0.1', SMTP_PORT: String(w.t.config.smtp.port), JOB_CONCURRENCY: '1', JOB_STALE_SECONDS: '2',
      SAMPLING_CHECKPOINT_STEPS: '1000', SAMPLING_CHECKPOINT_MIN_SECONDS: '0.5',
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  p.stdout!.on('data', (c: Buffer) => { childLog += c.toString() })
  p.stderr!.on('data', (c: Buffer) => { childLog += c.toString() })
  return p
}

describe('a worker killed mid-run', () => {
  it('leaves a job that another worker resumes from its checkpoint and finishes', async () => {
    const steps = 8000
    const res = await w.analyst.post(`/api/models/${w.modelId}/sampling`, { walkers: 16, steps, thin: 10, seed: 21, untilConverged: false }).expect(201)
    const id = res.body.id as number
    child = startWorkerProcess()
    let before
    try {
      before = await waitForRun(w, id, (r) => r.state === 'running' && r.checkpointStep > 0, 40_000, 'a first checkpoint')
    } catch (err) { throw new Error(`${(err as Error).message}\nworker output:\n${childLog}`) }
    child.kill('SIGKILL')
    await new Promise<void>((r) => (child!.exitCode !== null || child!.signalCode !== null ? r() : child!.once('exit', () => r())))
    const killedAt = (await waitForRun(w, id, () => true)).checkpointStep
    console.log(`[jobs-resume] killed after the checkpoint at step ${killedAt} of ${steps}`)
    expect(before.attempts).toBe(1)
    expect(killedAt).toBeGreaterThan(0)
    expect(killedAt).toBeLessThan(steps)

    // another worker (this process): notices the silent run, fails its job so pg-boss retries it, resumes
    workers = await startJobWorkers(w.services, { concurrency: 1, pollingIntervalSeconds: 0.5, staleSeconds: 2, checkpointEvery: 5000 })
    const run = await waitForRun(w, id, (r) => r.state === 'succeeded' || r.state === 'failed', 60_000, 'succeeded')
    expect(run.error).toBeNull()
    expect(run.state).toBe('succeeded')
    expect(run.attempts).toBe(2)
    expect(run.resumedFromStep).toBeGreaterThanOrEqual(killedAt)
    expect(run.resumedFromStep).toBeGreaterThan(0)
    expect(run.result!.settings).toMatchObject({ steps, stepsDone: steps, stopped: false, seed: 21 })
    expect(run.progress!.stepsDone).toBe(steps)
    let job = await workers.boss.getJobById('sampling', run.jobId!)
    for (let i = 0; i < 50 && job?.state !== 'completed'; i++) { // the handler returns just after the row is written
      await new Promise((r) => setTimeout(r, 100))
      job = await workers.boss.getJobById('sampling', run.jobId!)
    }
    expect(job?.state).toBe('completed')
    expect(job?.retryCount).toBe(1)
    // the resumed run is the uninterrupted run: same chain, so the same summaries (sampler.ts promise)
    const whole = sampleInput(run.input, run.settings)
    expect(run.result!.parameters).toEqual(JSON.parse(JSON.stringify(whole.parameters)))
    const shown = await w.reviewer.get(`/api/sampling/${id}`).expect(200)
    expect(shown.body).toMatchObject({ attempts: 2, state: 'succeeded', resumedFromStep: run.resumedFromStep })
  }, 120_000) // a second Node process starts from the TypeScript sources: slow on a busy machine
})

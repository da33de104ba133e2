// Parallel mode of a sampling run (server/sampling/ensembles.ts): K ensembles on as many workers,
// merged when they agree. Two workers give the posterior one long run gives (medians within Monte
// Carlo error), cancel stops every ensemble, more ensembles than workers are refused, and an
// ensemble whose worker process is killed resumes from its checkpoint on another worker.
import { spawn, type ChildProcess } from 'node:child_process'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startJobWorkers, type JobWorkers } from '../../server/jobs/index.ts'
import { sampleInput } from '../../server/sampling/thread.ts'
import { ensemblesOf, workersSeen } from '../../server/sampling/ensembles.ts'
import { startSamplingWorld, runRow, waitForRun, type SamplingWorld } from './sampling-setup.ts'
import type { SamplingRun } from '../../server/db/models-sampling.ts'

let w: SamplingWorld
let workers: JobWorkers | undefined
let child: ChildProcess | undefined
let childLog = ''
const WORKER_OPTS = { pollingIntervalSeconds: 0.5, staleSeconds: 2, checkpointEvery: 500, checkpointMinMs: 200, log: (m: string) => { if (/failed/.test(m)) console.log(m) } }

beforeAll(async () => { w = await startSamplingWorld() }, 180_000) // a demo seed, an upload and a fit: slow on a busy machine
afterAll(async () => {
  if (child && child.exitCode === null && child.signalCode === null) child.kill('SIGKILL')
  await workers?.stop()
  w?.services.mailer.close()
  await w?.t.close()
})

const ended = (r: SamplingRun) => ['succeeded', 'failed', 'cancelled'].includes(r.state)
async function kids(id: number): Promise<SamplingRun[]> {
  return ensemblesOf(w.services, await runRow(w, id), true)
}
async function until<T>(what: string, fn: () => Promise<T | null | undefined | false>, timeoutMs: number): Promise<T> {
  const end = Date.now() + timeoutMs
  for (;;) {
    const v = await fn()
    if (v) return v
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`)
    await new Promise((r) => setTimeout(r, 150))
  }
}

describe('parallel sampling runs', () => {
  it('refuses more ensembles than job workers are connected, saying what to do', async () => {
    expect(await workersSeen(w.services)).toBe(0)
    const res = await w.analyst.post(`/api/models/${w.modelId}/sampling`, { walkers: 16, ensembles: 2 })
    expect(res.status).toBe(400)
    expect(res.body.error.field).toBe('ensembles')
    expect(res.body.error.message).toMatch(/0 job workers are connected.*start more workers/)
  })

  it('two workers give the posterior of one long run; the merged chain is what the result and the CSV hold', async () => {
    workers = await startJobWorkers(w.services, { concurrency: 2, ...WORKER_OPTS })
    expect(await workersSeen(w.services)).toBe(2)
    const est = await w.reviewer.get(`/api/models/${w.modelId}/sampling/estimate?walkers=16&ensembles=2`).expect(200)
    expect(est.body).toMatchObject({ workers: 2, ensembles: 2 })
    const single = await w.reviewer.get(`/api/models/${w.modelId}/sampling/estimate?walkers=16`).expect(200)
    expect(est.body.expectedSteps).toBeLessThan(single.body.expectedSteps)

    const res = await w.analyst.post(`/api/models/${w.modelId}/sampling`, { walkers: 16, ensembles: 2, seed: 31 })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.settings).toMatchObject({ walkers: 16, ensembles: 2, untilConverged: true })
    const id = res.body.id as number
    const run = await waitForRun(w, id, ended, 150_000, 'the end of the parallel run')
    expect(run.error).toBeNull()
    expect(run.state).toBe('succeeded')
    const r = run.result!
    expect(r.diagnostics.converged).toBe(true)
    expect(r.settings).toMatchObject({ walkers: 32, rhatGroups: 2, untilConverged: true })
    expect(r.diagnostics.rhat.every((v) => v! < 1.01)).toBe(true)
    expect(r.diagnostics.nOverTau.every((v) => v! > 50)).toBe(true)
    // each ensemble: its own seed, stopped by the merge (its budget was not used up), no mail of its own
    const ks = await until('both ensembles to end', async () => { const k = await kids(id); return k.length === 2 && k.every(ended) ? k : null }, 30_000)
    expect(new Set(ks.map((k) => k.settings.seed)).size).toBe(2)
    for (const k of ks) {
      expect(k.state).toBe('succeeded')
      expect(k.result!.settings.stopped).toBe(true)
      expect(k.result!.settings.stepsDone).toBeGreaterThanOrEqual(r.settings.stepsDone)
    }
    // the list shows the parallel run, not its ensembles; the run shows each ensemble's progress
    const list = await w.reviewer.get(`/api/stars/${w.starId}/sampling`).expect(200)
    expect(list.body.map((x: { id: number }) => x.id)).toContain(id)
    expect(list.body.map((x: { id: number }) => x.id)).not.toContain(ks[0]!.id)
    const shown = await w.reviewer.get(`/api/sampling/${id}`).expect(200)
    expect(shown.body.progress.ensembles).toHaveLength(2)
    expect(shown.body.progress.ensembles[1]).toMatchObject({ index: 1, runId: ks[1]!.id, state: 'succeeded' })
    await w.analyst.post(`/api/sampling/${ks[0]!.id}/cancel`).expect(409)
    // the merged chain as CSV: every walker of both ensembles at every kept step
    const csv = await w.reviewer.get(`/api/sampling/${id}/chain.csv`).expect(200)
    const lines = (csv.text as string).trim().split('\n')
    expect(lines.length - 1).toBe(32 * r.settings.keptRows!)

    // one long run of the same posterior (in this process, by the rule on its own): medians within
    // Monte Carlo error. The error of a median is ≈ 1.25 sd / √n_eff (normal approximation) with
    // n_eff = walkers × N/τ; the difference of two medians is allowed 5 of its standard errors.
    const one = sampleInput(run.input, { walkers: 32, steps: 100_000, burn: null, thin: 1, seed: 77, untilConverged: true })
    expect(one.diagnostics.converged).toBe(true)
    const neff = (walkers: number, q: Array<number | null>) => walkers * Math.min(...q.map((v) => v ?? 0))
    const n1 = neff(32, r.diagnostics.nOverTau), n2 = neff(32, one.diagnostics.nOverTau)
    for (const name of ['P b', 'K b', 'e b', 'Tc b', 'offset rv', 'jitter rv']) {
      const a = r.parameters.find((p) => p.name === name), b = one.parameters.find((p) => p.name === name)
      if (!a || !b) continue
      const se = 1.25 * b.sd * Math.sqrt(1 / n1 + 1 / n2)
      console.log(`[parallel] ${name}: merged ${a.median.toPrecision(7)} ± ${a.sd.toPrecision(3)}, one run ${b.median.toPrecision(7)} ± ${b.sd.toPrecision(3)}, |Δ| / se = ${(Math.abs(a.median - b.median) / se).toFixed(2)}`)
      expect(Math.abs(a.median - b.median)).toBeLessThan(5 * se)
      expect(a.sd / b.sd).toBeGreaterThan(0.8)
      expect(a.sd / b.sd).toBeLessThan(1.25)
    }
    console.log(`[parallel] merged at ${r.settings.stepsDone} steps per ensemble; one run stopped at ${one.settings.stepsDone}`)
  }, 300_000)

  it('cancel stops every ensemble and keeps the merged rows so far, with a warning', async () => {
    const res = await w.analyst.post(`/api/models/${w.modelId}/sampling`, { walkers: 16, ensembles: 2, steps: 200_000, seed: 41, untilConverged: false }).expect(201)
    const id = res.body.id as number
    await until('both ensembles past their first checkpoint', async () => { const k = await kids(id); return k.length === 2 && k.every((x) => x.state === 'running' && x.checkpointStep > 0) }, 60_000)
    await w.reviewer.post(`/api/sampling/${id}/cancel`).expect(403)
    const c = await w.analyst.post(`/api/sampling/${id}/cancel`).expect(200)
    expect(c.body.state).toBe('cancelled')
    const ks = await until('both ensembles to stop', async () => { const k = await kids(id); return k.every((x) => x.state === 'cancelled' && x.result) ? k : null }, 20_000)
    for (const k of ks) expect(k.result!.settings.stepsDone).toBeLessThan(200_000)
    const run = await waitForRun(w, id, (x) => x.result !== null, 20_000, 'the merged partial result')
    expect(run.state).toBe('cancelled')
    expect(run.result!.settings.stopped).toBe(true)
    expect(run.result!.diagnostics.converged).toBe(false)
    expect(run.result!.diagnostics.warnings[0]).toMatch(/parallel run was stopped after \d+ common steps of each of its 2 ensembles/)
  }, 120_000)

  it('an ensemble whose worker process is killed resumes on another worker and the run still merges', async () => {
    await workers?.stop()
    workers = undefined
    child = spawn(process.execPath, ['--import', 'tsx', 'scripts/worker.ts'], {
      env: {
        ...process.env, NODE_ENV: 'test', DATABASE_URL: w.t.db.url, APP_URL: w.t.config.appUrl, LOG_LEVEL: 'warn',
        SMTP_HOST: '127.0.0.1', SMTP_PORT: String(w.t.config.smtp.port), JOB_CONCURRENCY: '2', JOB_STALE_SECONDS: '2',
        SAMPLING_CHECKPOINT_STEPS: '500', SAMPLING_CHECKPOINT_MIN_SECONDS: '0.3',
      },
      stdio: ['ignore', 'pipe', 'pipe'],
    })
    child.stdout!.on('data', (b: Buffer) => { childLog += b.toString() })
    child.stderr!.on('data', (b: Buffer) => { childLog += b.toString() })
    try {
      await until('the worker process to connect', async () => (await workersSeen(w.services)) === 2, 60_000)
    } catch (err) { throw new Error(`${(err as Error).message}\nworker output:\n${childLog}`) }
    // a fixed length the merge cannot cut short before the kill (walkers 16, 30 000 steps each)
    const res = await w.analyst.post(`/api/models/${w.modelId}/sampling`, { walkers: 16, ensembles: 2, steps: 30_000, seed: 51, untilConverged: false }).expect(201)
    const id = res.body.id as number
    await until('both ensembles past a checkpoint', async () => { const k = await kids(id); return k.length === 2 && k.every((x) => x.state === 'running' && x.checkpointStep > 0) }, 60_000)
    child.kill('SIGKILL')
    await new Promise<void>((r) => (child!.exitCode !== null || child!.signalCode !== null ? r() : child!.once('exit', () => r())))
    const at = (await kids(id)).map((k) => k.checkpointStep)
    console.log(`[parallel] worker killed with the ensembles' checkpoints at steps ${at.join(', ')}`)
    workers = await startJobWorkers(w.services, { concurrency: 2, ...WORKER_OPTS })
    const run = await waitForRun(w, id, ended, 240_000, 'the end of the parallel run')
    expect(run.error).toBeNull()
    expect(['succeeded']).toContain(run.state)
    const ks = await until('both ensembles to end', async () => { const k = await kids(id); return k.every(ended) ? k : null }, 30_000)
    for (const [i, k] of ks.entries()) {
      expect(k.attempts).toBe(2)
      expect(k.resumedFromStep).toBeGreaterThanOrEqual(at[i]!)
      expect(k.resumedFromStep).toBeGreaterThan(0)
    }
    expect(run.result!.settings.walkers).toBe(32)
  }, 400_000)
})

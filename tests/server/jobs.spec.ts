// Sampling runs on the job queue (pg-boss in the test database): a run completes and stores its
// result and mails its requester; cancel stops a running sampler.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startJobWorkers, type JobWorkers } from '../../server/jobs/index.ts'
import { startSamplingWorld, waitForRun, type SamplingWorld } from './sampling-setup.ts'

let w: SamplingWorld
let workers: JobWorkers
beforeAll(async () => {
  w = await startSamplingWorld()
  // checkpoints by steps alone (no least time): the chunk count then does not depend on the machine's speed
  workers = await startJobWorkers(w.services, { concurrency: 1, pollingIntervalSeconds: 0.5, staleSeconds: 5, checkpointEvery: 100, checkpointMinMs: 0 })
}, 180_000) // a demo seed, an upload and a fit: slow on a busy machine
afterAll(async () => {
  await workers?.stop()
  w?.services.mailer.close()
  await w?.t.close()
})

describe('sampling jobs', { timeout: 60_000 }, () => {
  it('runs to completion, stores the result with its settings and mails the requester a link', async () => {
    const t0 = Date.now()
    const res = await w.analyst.post(`/api/models/${w.modelId}/sampling`, { walkers: 16, steps: 600, seed: 11, untilConverged: false })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body).toMatchObject({ state: 'queued', settings: { walkers: 16, steps: 600, burn: null, thin: 1, seed: 11, untilConverged: false }, modelId: w.modelId, modelVersion: 2 })
    expect(res.body.estimateSeconds).toBeGreaterThan(0)
    const run = await waitForRun(w, res.body.id, (r) => r.state === 'succeeded' || r.state === 'failed', 30_000, 'succeeded')
    expect(run.error).toBeNull()
    expect(run.state).toBe('succeeded')
    expect(run.result!.settings).toMatchObject({ seed: 11, walkers: 16, steps: 600, stepsDone: 600, stopped: false })
    expect(run.progress!.stepsDone).toBe(600)
    const K = run.result!.parameters.find((p) => p.name === 'K b')!
    // the synthetic series was made with K = 30 m/s and 3 m/s noise on 40 points (sampling-setup.ts)
    expect(K.median).toBeGreaterThan(25)
    expect(K.median).toBeLessThan(35)
    expect(K.lo).toBeLessThan(K.median)
    expect(K.hi).toBeGreaterThan(K.median)
    expect(run.result!.parameters.some((p) => p.name === 'M sin i b')).toBe(true)
    expect(run.checkpointChain).toBeNull() // the old whole-chain column is no longer written
    // the kept chain is in append-only chunks, the last one written with the result
    const [chunks] = await w.services.sequelize.query(`SELECT first_step, last_step, n_rows FROM sampling_chunks WHERE run_id = ${run.id} ORDER BY seq`)
    const cs = chunks as Array<{ first_step: number; last_step: number; n_rows: number }>
    expect(cs.length).toBeGreaterThan(1)
    expect(cs[cs.length - 1]!.last_step).toBe(600)
    for (let i = 1; i < cs.length; i++) expect(cs[i]!.first_step).toBeGreaterThan(cs[i - 1]!.last_step)
    // … downloadable as CSV: one header row with units, every walker at every kept step
    const csv = await w.reviewer.get(`/api/sampling/${run.id}/chain.csv`).expect(200)
    expect(csv.headers['content-type']).toMatch(/text\/csv/)
    expect(csv.headers['content-disposition']).toMatch(/sampling-run-\d+-chain\.csv/)
    const lines = (csv.text as string).trim().split('\n')
    const head = lines[0]!.split(',')
    expect(head.slice(0, 3)).toEqual(['step', 'walker', 'after_burn_in'])
    expect(head).toContain('K b (m/s)')
    expect(head).toContain('M sin i b (M_Jup)')
    expect(head[head.length - 1]).toBe('ln posterior')
    expect(lines.length - 1).toBe(16 * run.result!.settings.keptRows!)
    const kCol = head.indexOf('K b (m/s)')
    const lastK = Number(lines[lines.length - 1]!.split(',')[kCol])
    expect(lastK).toBeGreaterThan(20)
    expect(lastK).toBeLessThan(40)
    const shown = await w.reviewer.get(`/api/sampling/${run.id}`).expect(200)
    expect(shown.body.result.parameters.length).toBeGreaterThan(5)
    expect(shown.body.requestedBy.name).toBeTruthy()
    const mail = await w.t.mail.waitFor((m) => m.subject.includes(`run ${run.id}`), 10_000)
    expect(mail.to).toContain('tomas.analyst@lanternfield.test')
    expect(mail.text).toContain(`${w.t.config.appUrl}/stars/${w.starId}/analysis?sampling=${run.id}`)
    expect(mail.subject).toMatch(/finished/)
    const audit = await w.owner.get(`/api/teams/${w.teamId}/audit`).expect(200)
    expect(audit.body.some((a: { action: string; entityId: number }) => a.action === 'sampling.start' && a.entityId === run.id)).toBe(true)
    // a report frozen with this run carries the posterior: every parameter's thinned draws, in its JSON too
    const frozen = await w.analyst.post(`/api/models/${w.modelId}/report`, { samplingRunId: run.id }).expect(201)
    const json = (await w.reviewer.get(`/api/reports/${frozen.body.id}/versions/1/json`).expect(200)).body
    const samples = json.sampling.samples
    const summaries = run.result!.parameters.filter((p) => !p.fixed).map((p) => p.name)
    for (const name of summaries) expect(samples.names, name).toContain(name)
    expect(samples.names).toContain('ln posterior')
    expect(samples.columns.length).toBe(samples.names.length)
    expect(samples.columns[0].length).toBe(samples.step.length)
    expect(samples.columns[0].length).toBeGreaterThan(500)
    expect(samples.units[samples.names.indexOf('K b')]).toBe('m / s') // astropy's spelling in the JSON
    expect(json.sampling.settings).toMatchObject({ walkers: 16, steps: 600, burn: 150, seed: 11 })
    console.log(`[jobs] 16 × 600 run done in ${Date.now() - t0} ms (estimate ${res.body.estimateSeconds} s)`)
  })

  it('streams progress as server-sent events until the run is done', async () => {
    const res = await w.analyst.post(`/api/models/${w.modelId}/sampling`, { walkers: 16, steps: 400, seed: 3, untilConverged: false }).expect(201)
    const ev = await w.reviewer.get(`/api/sampling/${res.body.id}/events`).buffer(true).parse((r, cb) => {
      let text = ''
      r.on('data', (c: Buffer) => { text += c.toString() })
      r.on('end', () => cb(null, text))
    }).expect(200)
    expect(ev.headers['content-type']).toMatch(/text\/event-stream/)
    const text = ev.body as string
    expect(text).toMatch(/event: progress\ndata: \{/)
    const done = /event: done\ndata: (.*)\n/.exec(text)
    expect(done).not.toBeNull()
    expect(JSON.parse(done![1]!)).toMatchObject({ id: res.body.id, state: 'succeeded', progress: { stepsDone: 400, stepsTotal: 400 } })
  })

  it('cancels a running sampler: it stops within about a second and keeps what it had, with a warning', async () => {
    const res = await w.analyst.post(`/api/models/${w.modelId}/sampling`, { walkers: 16, steps: 200_000, seed: 5, untilConverged: false }).expect(201)
    await waitForRun(w, res.body.id, (r) => r.state === 'running' && (r.progress?.stepsDone ?? 0) > 0, 20_000, 'running')
    await w.reviewer.post(`/api/sampling/${res.body.id}/cancel`).expect(403)
    const t0 = Date.now()
    const c = await w.analyst.post(`/api/sampling/${res.body.id}/cancel`).expect(200)
    expect(c.body.state).toBe('cancelled')
    const run = await waitForRun(w, res.body.id, (r) => r.result !== null, 15_000, 'a stored partial result')
    // about 1/4 s for the worker to read the cancel, 10 steps, the summaries of the bounded kept copy;
    // logged, not asserted (tests do not time the machine)
    console.log(`[jobs] cancel → partial result stored in ${Date.now() - t0} ms`)
    expect(run.state).toBe('cancelled')
    expect(run.result!.settings.stopped).toBe(true)
    expect(run.result!.settings.stepsDone).toBeLessThan(200_000)
    expect(run.result!.diagnostics.converged).toBe(false)
    expect(run.result!.diagnostics.warnings[0]).toMatch(/stopped after \d+ of 200000 steps/)
    await w.analyst.post(`/api/sampling/${res.body.id}/cancel`).expect(409)
  })

  it('runs until converged by default and stops by itself', async () => {
    const res = await w.analyst.post(`/api/models/${w.modelId}/sampling`, { walkers: 16, seed: 21 }).expect(201)
    expect(res.body.settings).toMatchObject({ untilConverged: true, steps: 100_000, burn: null })
    const run = await waitForRun(w, res.body.id, (r) => r.state === 'succeeded' || r.state === 'failed', 50_000, 'succeeded')
    expect(run.state).toBe('succeeded')
    expect(run.result!.diagnostics.converged).toBe(true)
    expect(run.result!.settings.stepsDone).toBeLessThan(100_000)
    expect(run.result!.diagnostics.nOverTau.every((q) => q! > 50)).toBe(true)
  })

  it('puts a run back in the queue when its worker stops gracefully; the next worker resumes it', async () => {
    // long enough that the poller (100 ms) sees it running between checkpoints on a loaded machine:
    // at 8000 steps a run once finished before it was seen
    const steps = 30_000
    const res = await w.analyst.post(`/api/models/${w.modelId}/sampling`, { walkers: 16, steps, thin: 10, seed: 9, untilConverged: false }).expect(201)
    await waitForRun(w, res.body.id, (r) => r.state === 'running' && (r.progress?.stepsDone ?? 0) > 500, 20_000, 'running')
    await workers.stop()
    const parked = await waitForRun(w, res.body.id, () => true)
    expect(parked.state).toBe('queued')
    expect(parked.checkpointStep).toBeGreaterThan(0)
    // checkpoints by steps alone (no least time): the chunk count then does not depend on the machine's speed
    workers = await startJobWorkers(w.services, { concurrency: 1, pollingIntervalSeconds: 0.5, staleSeconds: 5, checkpointEvery: 100, checkpointMinMs: 0 })
    const run = await waitForRun(w, res.body.id, (r) => r.state === 'succeeded' || r.state === 'failed', 90_000, 'succeeded')
    expect(run.state).toBe('succeeded')
    expect(run.attempts).toBe(2)
    expect(run.resumedFromStep).toBe(parked.checkpointStep)
    expect(run.result!.settings).toMatchObject({ steps, stepsDone: steps, stopped: false })
  }, 180_000)

  it('cancels a queued run before any worker takes it', async () => {
    await workers.stop()
    const res = await w.analyst.post(`/api/models/${w.modelId}/sampling`, { walkers: 16, steps: 400 }).expect(201)
    await w.owner.post(`/api/sampling/${res.body.id}/cancel`).expect(200)
    workers = await startJobWorkers(w.services, { concurrency: 1, pollingIntervalSeconds: 0.5, staleSeconds: 5 })
    await new Promise((r) => setTimeout(r, 1500))
    const run = await waitForRun(w, res.body.id, () => true)
    expect(run.state).toBe('cancelled')
    expect(run.attempts).toBe(0)
  })
})

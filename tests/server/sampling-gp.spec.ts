// Sampling a model as the user wrote it: a planets + GP model's run samples the GP hyperparameters
// (through the job queue, as any run), a model with every jitter pinned samples none, and the parallel mode says it takes white-noise models only.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startJobWorkers, type JobWorkers } from '../../server/jobs/index.ts'
import { startSamplingWorld, waitForRun, type SamplingWorld } from './sampling-setup.ts'

let w: SamplingWorld
let workers: JobWorkers
beforeAll(async () => {
  w = await startSamplingWorld({ points: 60 })
  workers = await startJobWorkers(w.services, { concurrency: 1, pollingIntervalSeconds: 0.5, staleSeconds: 5, checkpointEvery: 100, checkpointMinMs: 0 })
}, 180_000)
afterAll(async () => {
  await workers?.stop()
  w?.services.mailer.close()
  await w?.t.close()
})

async function fitted(name: string, spec: object): Promise<number> {
  const m = await w.analyst.post(`/api/stars/${w.starId}/models`, { name, spec })
  expect(m.status, JSON.stringify(m.body)).toBe(201)
  const f = await w.analyst.post(`/api/models/${m.body.id}/fit`, {})
  expect(f.status, JSON.stringify(f.body).slice(0, 400)).toBe(200)
  expect(f.body.current.status).toBe('fitted')
  return m.body.id as number
}

describe('sampling under the model\'s noise model', { timeout: 300_000 }, () => {
  it('samples the GP hyperparameters of a planets + GP model', async () => {
    const id = await fitted('planet + GP', {
      planets: [{ period: 12.3, K: 25 }],
      noise: { kind: 'gp', kernel: 'rotation', period: { value: 30, sigma: 3, source: 'a test value' } },
    })
    const est = await w.analyst.get(`/api/models/${id}/sampling/estimate?walkers=24&steps=400&untilConverged=false`).expect(200)
    expect(est.body.names).toEqual(expect.arrayContaining(['rotation period', 'ln GP decay time']))
    const res = await w.analyst.post(`/api/models/${id}/sampling`, { walkers: 24, steps: 400, seed: 5, untilConverged: false })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const run = await waitForRun(w, res.body.id, (r) => r.state === 'succeeded' || r.state === 'failed', 240_000, 'succeeded')
    expect(run.error).toBeNull()
    const names = run.result!.parameters.map((p) => p.name)
    expect(names).toContain('rotation period')
    const prot = run.result!.parameters.find((p) => p.name === 'rotation period')!
    expect(prot.unit).toBe('d')
    // the data carry no rotation signal: the draws stay near the stated prior N(30, 3²) d
    expect(Math.abs(prot.median - 30)).toBeLessThan(6)
    const K = run.result!.parameters.find((p) => p.name === 'K b')!
    expect(K.median).toBeGreaterThan(20)
    expect(K.median).toBeLessThan(40)

    const two = await w.analyst.post(`/api/models/${id}/sampling`, { walkers: 24, steps: 400, ensembles: 2 })
    expect(two.status).toBe(400)
    expect(two.body.error.field).toBe('ensembles')
    expect(two.body.error.message).toMatch(/white-noise models only/)
  })

  it('holds pinned jitters fixed', async () => {
    const first = await w.analyst.get(`/api/models/${w.modelId}`).expect(200)
    const instrument = first.body.current.result.instruments[0].name as string
    const all = await fitted('pinned', { planets: [{ period: 12.3, K: 25 }], instrumentTerms: [{ instrument, jitter: 1.5 }] })
    const est = await w.analyst.get(`/api/models/${all}/sampling/estimate?walkers=16&steps=200&untilConverged=false`).expect(200)
    expect(est.body.names.some((n: string) => /jitter/.test(n))).toBe(false)
  })
})

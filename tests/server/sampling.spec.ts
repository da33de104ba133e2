// Sampling routes without job workers: who may call each route (reviewers read, analysts start
// and cancel, another team gets 404), defaults, the time estimate, and refused requests.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { routes } from '../../server/routes.ts'
import * as samplingHandlers from '../../server/sampling/routes.ts'
import { anonymous, type Client } from './client.ts'
import { analyst, member, roleTable, type Expect, type Persona } from './roles.ts'
import { startSamplingWorld, type SamplingWorld } from './sampling-setup.ts'

const SMALL = { walkers: 16, steps: 100 }

let w: SamplingWorld
let doneRunId: number
beforeAll(async () => {
  w = await startSamplingWorld()
  const r = await w.analyst.post(`/api/models/${w.modelId}/sampling`, SMALL).expect(201)
  doneRunId = r.body.id
  await w.analyst.post(`/api/sampling/${doneRunId}/cancel`).expect(200)
}, 180_000) // a demo seed, an upload and a fit: slow on a busy machine
afterAll(async () => {
  w?.services.mailer.close()
  await w?.t.close()
})

async function freshRun(): Promise<number> {
  return (await w.analyst.post(`/api/models/${w.modelId}/sampling`, SMALL).expect(201)).body.id
}

interface Case { method: string; route: string; expect: Expect; path?: string; body?: object; prepare?: () => Promise<string> }
const cases: Case[] = [
  { method: 'post', route: '/api/models/:modelId/sampling', path: '/api/models/MODEL/sampling', body: SMALL, expect: analyst(201) },
  { method: 'get', route: '/api/models/:modelId/sampling/estimate', path: '/api/models/MODEL/sampling/estimate?walkers=16&steps=1000', expect: member(200) },
  { method: 'get', route: '/api/stars/:starId/sampling', path: '/api/stars/STAR/sampling', expect: member(200) },
  { method: 'get', route: '/api/sampling/:runId', path: '/api/sampling/RUN', expect: member(200) },
  // a finished run: the stream sends its state and `done`, then ends
  { method: 'get', route: '/api/sampling/:runId/events', path: '/api/sampling/RUN/events', expect: member(200) },
  { method: 'post', route: '/api/sampling/:runId/cancel', expect: analyst(200), prepare: async () => `/api/sampling/${await freshRun()}/cancel` },
  // a run cancelled before it started has no chain: past the guards the answer is 409 (the download itself: jobs.spec.ts)
  { method: 'get', route: '/api/sampling/:runId/chain.csv', path: '/api/sampling/RUN/chain.csv', expect: member(409) },
]

function client(p: Persona): Client {
  return p === 'anonymous' ? anonymous(w.t.app) : w[p]
}

describe('sampling routes', () => {
  roleTable({
    handlers: samplingHandlers, routes, cases, client, hidden: /walkers|settings/,
    request: async (c) => ({
      path: c.prepare ? await c.prepare() : c.path!.replace('MODEL', String(w.modelId)).replace('STAR', String(w.starId)).replace('RUN', String(doneRunId)),
      body: c.body,
    }),
  })

  it('starts with sensible defaults, an estimate, and an audit entry', async () => {
    const res = await w.analyst.post(`/api/models/${w.modelId}/sampling`, {}).expect(201)
    const b = res.body
    expect(b).toMatchObject({ state: 'queued', starId: w.starId, modelId: w.modelId, attempts: 0, checkpointStep: 0, resumedFromStep: null, result: null, error: null })
    expect(b.settings).toMatchObject({ walkers: 32, steps: 100_000, burn: null, thin: 1, untilConverged: true })
    expect(Number.isInteger(b.settings.seed)).toBe(true)
    expect(b.estimateSeconds).toBeGreaterThan(0)
    expect(b.progress).toMatchObject({ stepsDone: 0, stepsTotal: 100_000 })
    expect(b.modelVersionId).toBeGreaterThan(0)
    expect(b.requestedBy.name).toBe('Tomas Analyst')
    const list = await w.reviewer.get(`/api/stars/${w.starId}/sampling`).expect(200)
    expect(list.body[0].id).toBe(b.id) // newest first
    expect(list.body[0]).not.toHaveProperty('result')
    expect(list.body[0].converged).toBeNull()
    const audit = await w.owner.get(`/api/teams/${w.teamId}/audit`).expect(200)
    const entry = audit.body.find((a: { action: string; entityId: number }) => a.action === 'sampling.start' && a.entityId === b.id)
    expect(entry.detail).toMatchObject({ starId: w.starId, modelId: w.modelId, settings: { walkers: 32, steps: 100_000 } })
    await w.analyst.post(`/api/sampling/${b.id}/cancel`).expect(200)
    const audit2 = await w.owner.get(`/api/teams/${w.teamId}/audit`).expect(200)
    expect(audit2.body.some((a: { action: string; entityId: number }) => a.action === 'sampling.cancel' && a.entityId === b.id)).toBe(true)
  })

  it('estimates a longer time for more steps', async () => {
    const a = (await w.analyst.post(`/api/models/${w.modelId}/sampling`, { walkers: 16, steps: 1000 }).expect(201)).body
    const b = (await w.analyst.post(`/api/models/${w.modelId}/sampling`, { walkers: 16, steps: 100_000 }).expect(201)).body
    expect(b.estimateSeconds).toBeGreaterThan(a.estimateSeconds)
  })

  it('estimates before starting: free parameters only, expected steps and seconds, the budget', async () => {
    const e = (await w.reviewer.get(`/api/models/${w.modelId}/sampling/estimate`).expect(200)).body
    // one planet (5) + offset + jitter of the one instrument
    expect(e).toMatchObject({ nDim: 7, walkers: 32, steps: 100_000 })
    expect(e.names).toContain('ln K b')
    expect(e.expectedSteps).toBeGreaterThan(1000)
    expect(e.expectedSteps).toBeLessThan(e.steps)
    expect(e.seconds).toBeGreaterThan(0)
    expect(e.maxSeconds).toBeGreaterThan(e.seconds)
    const f = (await w.reviewer.get(`/api/models/${w.modelId}/sampling/estimate?walkers=16&steps=2000&untilConverged=false`).expect(200)).body
    expect(f).toMatchObject({ walkers: 16, steps: 2000, expectedSteps: 2000 })
    const bad = await w.reviewer.get(`/api/models/${w.modelId}/sampling/estimate?walkers=3`).expect(400)
    expect(bad.body.error.field).toBe('walkers')
  })

  it('counts only free parameters: a model with e held at 0 samples 2 fewer', async () => {
    const m = (await w.analyst.post(`/api/stars/${w.starId}/models`, { name: 'Circular', spec: { planets: [{ period: 12.3, K: 25, e: 0, fix: ['e'] }] } })).body
    expect(m.id, JSON.stringify(m)).toBeGreaterThan(0)
    await w.analyst.post(`/api/models/${m.id}/fit`, {}).expect(200)
    const e = (await w.reviewer.get(`/api/models/${m.id}/sampling/estimate`).expect(200)).body
    expect(e.nDim).toBe(5)
    expect(e.names.some((n: string) => /√e|ω/.test(n))).toBe(false)
    // 10 walkers are enough for 5 free parameters (the server used to ask for 14)
    await w.analyst.post(`/api/models/${m.id}/sampling`, { walkers: 10, steps: 100 }).expect(201)
  })

  it('refuses bad settings naming the field', async () => {
    const bad = async (body: object, field: string) => {
      const res = await w.analyst.post(`/api/models/${w.modelId}/sampling`, body).expect(400)
      expect(res.body.error.field).toBe(field)
    }
    await bad({ walkers: 15 }, 'walkers')
    await bad({ walkers: 4 }, 'walkers') // fewer than twice the 7 sampled parameters
    await bad({ steps: 10 }, 'steps')
    await bad({ steps: 100, burn: 99 }, 'burn')
    await bad({ steps: 100, thin: 3 }, 'thin')
    await bad({ seed: -1 }, 'seed')
  })

  it('refuses an unfitted model (409) and answers 404 for archived models and unknown runs', async () => {
    const draft = (await w.analyst.post(`/api/stars/${w.starId}/models`, { name: 'Draft', spec: { planets: [{ period: 12.3, K: 25 }] } }).expect(201)).body
    const res = await w.analyst.post(`/api/models/${draft.id}/sampling`, SMALL).expect(409)
    expect(res.body.error.message).toMatch(/fit/)
    await w.analyst.delete(`/api/models/${draft.id}`).expect(204)
    await w.analyst.post(`/api/models/${draft.id}/sampling`, SMALL).expect(404)
    await w.reviewer.get('/api/sampling/999999').expect(404)
    await w.reviewer.get('/api/sampling/abc').expect(404)
  })

  it('streams a finished run as one progress and one done event', async () => {
    const ev = await w.reviewer.get(`/api/sampling/${doneRunId}/events`).buffer(true).parse((r, cb) => {
      let text = ''
      r.on('data', (c: Buffer) => { text += c.toString() })
      r.on('end', () => cb(null, text))
    }).expect(200)
    const text = ev.body as string
    expect(text.match(/event: progress/g)?.length).toBe(1)
    const done = /event: done\ndata: (.*)\n/.exec(text)
    expect(JSON.parse(done![1]!)).toMatchObject({ id: doneRunId, state: 'cancelled' })
  })
})

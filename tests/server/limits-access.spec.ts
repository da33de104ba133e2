// Detection-limit and planner routes: who may call each route (reviewers read and plan, analysts
// start, cancel and resume, another team gets 404), and refused requests. No job workers here:
// runs stay queued (tests/server/limits.spec.ts runs them).
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { routes } from '../../server/routes.ts'
import * as limitsHandlers from '../../server/limits/routes.ts'
import * as planHandlers from '../../server/plan/routes.ts'
import { anonymous, type Client } from './client.ts'
import { analyst, member, roleTable, type Expect, type Persona } from './roles.ts'
import { startSamplingWorld, type SamplingWorld } from './sampling-setup.ts'
import { insertFinishedSamplingRun, SITE, SMALL_GRID } from './limits-setup.ts'

let w: SamplingWorld
let runId: number
let samplingRunId: number
beforeAll(async () => {
  w = await startSamplingWorld()
  runId = (await w.analyst.post(`/api/models/${w.modelId}/limits`, SMALL_GRID).expect(201)).body.id
  await w.analyst.patch(`/api/stars/${w.starId}`, { raDeg: 83.8, decDeg: -5.4, defaultSite: SITE }).expect(200)
  samplingRunId = await insertFinishedSamplingRun(w)
}, 180_000) // the world's set-up (demo seed, upload, fit) is slow on a busy machine
afterAll(async () => {
  w?.services.mailer.close()
  await w?.t.close()
})

async function freshRun(cancelled = false): Promise<number> {
  const id = (await w.analyst.post(`/api/models/${w.modelId}/limits`, SMALL_GRID).expect(201)).body.id as number
  if (cancelled) await w.analyst.post(`/api/limits/${id}/cancel`).expect(200)
  return id
}

interface Case { method: string; route: string; expect: Expect; path?: string; body?: () => object; prepare?: () => Promise<string> }
const cases: Case[] = [
  { method: 'post', route: '/api/models/:modelId/limits', path: '/api/models/MODEL/limits', body: () => SMALL_GRID, expect: analyst(201) },
  { method: 'get', route: '/api/stars/:starId/limits', path: '/api/stars/STAR/limits', expect: member(200) },
  { method: 'get', route: '/api/limits/:runId', path: '/api/limits/RUN', expect: member(200) },
  { method: 'post', route: '/api/limits/:runId/cancel', expect: analyst(200), prepare: async () => `/api/limits/${await freshRun()}/cancel` },
  { method: 'post', route: '/api/limits/:runId/resume', expect: analyst(200), prepare: async () => `/api/limits/${await freshRun(true)}/resume` },
  { method: 'post', route: '/api/stars/:starId/plan', path: '/api/stars/STAR/plan', body: () => ({ samplingRunId, startJd: 2461384.5, days: 3, stepMinutes: 60, count: 2 }), expect: member(200) },
]

function client(p: Persona): Client {
  return p === 'anonymous' ? anonymous(w.t.app) : w[p]
}

describe('detection-limit and planner routes', () => {
  roleTable({
    handlers: { ...limitsHandlers, ...planHandlers }, routes, cases, client, hidden: /residuals|Sampling Probe|seed/, timeout: 60_000,
    request: async (c) => ({
      path: c.prepare ? await c.prepare() : c.path!.replace('MODEL', String(w.modelId)).replace('STAR', String(w.starId)).replace('RUN', String(runId)),
      body: c.body?.(),
    }),
  })

  it('starts a run with its settings, seed, chunks and an audit entry', async () => {
    const b = (await w.analyst.post(`/api/models/${w.modelId}/limits`, { ...SMALL_GRID, seed: 42 }).expect(201)).body
    expect(b).toMatchObject({ state: 'queued', starId: w.starId, modelId: w.modelId, seed: 42, trials: 4 * 4 * 2, chunkCount: 4, result: null })
    expect(b.settings).toMatchObject({ periods: 4, masses: 4, phases: 2, eccentricities: [0], criterion: 'peak', fapThreshold: 1e-3 })
    expect(b.progress).toEqual({ trialsDone: 0, chunksDone: 0, chunksRunning: 0 })
    const audit = await w.owner.get(`/api/teams/${w.teamId}/audit`).expect(200)
    expect(audit.body.some((a: { action: string; entityId: number }) => a.action === 'limits.start' && a.entityId === b.id)).toBe(true)
    const list = await w.reviewer.get(`/api/stars/${w.starId}/limits`).expect(200)
    expect(list.body[0].id).toBe(b.id)
  })

  it('refuses bad settings naming the field, and a second cancel', async () => {
    const bad = async (body: object, field: string) => {
      const res = await w.analyst.post(`/api/models/${w.modelId}/limits`, body).expect(400)
      expect(res.body.error.field).toBe(field)
    }
    await bad({ periods: 1 }, 'periods')
    await bad({ minPeriod: 10, maxPeriod: 5 }, 'maxPeriod')
    await bad({ fapThreshold: 0 }, 'fapThreshold')
    await bad({ periods: 200, masses: 200, phases: 20 }, 'phases')
    const id = await freshRun(true)
    await w.analyst.post(`/api/limits/${id}/cancel`).expect(409)
    await w.reviewer.get('/api/limits/999999').expect(404)
    await w.reviewer.get('/api/limits/abc').expect(404)
  })

  it('plans: recommended instants are observable and spaced; the predicted band comes along', async () => {
    const res = await w.reviewer.post(`/api/stars/${w.starId}/plan`, { samplingRunId, startJd: 2461384.5, days: 10, stepMinutes: 30, count: 4, minSpacingDays: 1 }).expect(200)
    const b = res.body
    expect(b.recommendations).toHaveLength(4)
    for (const r of b.recommendations) {
      expect(r.sunAltDeg).toBeLessThanOrEqual(-18)
      expect(r.starAltDeg).toBeGreaterThanOrEqual(30)
    }
    expect(b.site).toMatchObject({ latDeg: SITE.latDeg })
    expect(b.curve.jd).toHaveLength(400)
    expect(b.noise).toBeGreaterThan(0)
    expect(b.timeNote).toMatch(/UTC/)
  })

  it('refuses to plan without coordinates, without a site, or from an unfinished run', async () => {
    const star2 = (await w.analyst.post(`/api/teams/${w.teamId}/stars`, { name: 'No coordinates', massMsun: 1, massErrMsun: 0.1 }).expect(201)).body.id
    const r1 = await w.analyst.post(`/api/stars/${star2}/plan`, { samplingRunId }).expect(409)
    expect(r1.body.error.message).toMatch(/coordinates/)
    await w.analyst.patch(`/api/stars/${star2}`, { raDeg: 10, decDeg: 10 }).expect(200)
    const r2 = await w.analyst.post(`/api/stars/${star2}/plan`, { samplingRunId }).expect(400)
    expect(r2.body.error.field).toBe('site')
    await w.analyst.post(`/api/stars/${star2}/plan`, { samplingRunId, site: SITE }).expect(404) // the run is another star's
    const r3 = await w.analyst.post(`/api/stars/${w.starId}/plan`, { samplingRunId: 1 + samplingRunId }).expect(404)
    expect(r3.body.error.code).toBe('not_found')
  })
})

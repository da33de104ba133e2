// Every analysis route for anonymous, another team's member, reviewer, analyst and owner
// (reviewers read, analysts change, another team gets 404) — same table as access.spec.ts.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { routes } from '../../server/routes.ts'
import * as analysisHandlers from '../../server/analyses/routes.ts'
import { signIn, type Client } from './client.ts'
import { analyst, cachedPersonas, EMAIL, member, roleTable, type Expect } from './roles.ts'


// 24 nights of a 9.7-day sinusoid (this test's own numbers), one instrument
const TABLE = '# bjd rv err\n' + Array.from({ length: 24 }, (_, i) => {
  const t = 2459000.5 + i * 2.3 + (i % 3) * 0.1
  return `${t.toFixed(4)} ${(6 * Math.sin((2 * Math.PI * t) / 9.7) + ((i * 7) % 5) * 0.3).toFixed(3)} 1.0`
}).join('\n') + '\n'

interface Case { method: string; route: string; expect: Expect; prepare?: () => Promise<{ path?: string; body?: object }>; path?: string; body?: object }

let t: TestApp
let starId: number, modelId: number, versionId: number, periodogramId: number
let analystClient: Client
const SPEC = { planets: [{ period: 9.7, K: 6 }], trend: 'none' }

async function newModel(): Promise<number> {
  const res = await analystClient.post(`/api/stars/${starId}/models`, { name: 'probe', spec: SPEC })
  expect(res.status, JSON.stringify(res.body)).toBe(201)
  return res.body.id
}

beforeAll(async () => {
  t = await startTestApp({ seed: true })
  const teamId = t.seed!.teamId!
  analystClient = await signIn(t.app, EMAIL.analyst)
  starId = (await analystClient.post(`/api/teams/${teamId}/stars`, { name: 'Analysis Probe', massMsun: 1, massErrMsun: 0.1 }).expect(201)).body.id
  const pre = await analystClient.upload(`/api/stars/${starId}/uploads/preview`, [{ name: 'probe.txt', content: TABLE }]).expect(200)
  await analystClient.upload(`/api/stars/${starId}/uploads/commit`, [{ name: 'probe.txt', content: TABLE }], { mappings: { 'probe.txt': pre.body.files[0].detection.mapping } }).expect(201)
  modelId = await newModel()
  const fitted = await analystClient.post(`/api/models/${modelId}/fit`, {})
  expect(fitted.status, JSON.stringify(fitted.body)).toBe(200)
  versionId = fitted.body.current.id
  periodogramId = (await analystClient.post(`/api/stars/${starId}/periodograms`, { kind: 'rv' }).expect(201)).body.id
})
afterAll(async () => { await t?.close() })

const cases: Case[] = [
  { method: 'post', route: '/api/stars/:starId/periodograms', path: '/api/stars/STAR/periodograms', expect: analyst(201), body: { kind: 'rv', oversample: 2 } },
  { method: 'get', route: '/api/stars/:starId/periodograms', path: '/api/stars/STAR/periodograms', expect: member(200) },
  { method: 'get', route: '/api/periodograms/:periodogramId', path: '/api/periodograms/PERIODOGRAM', expect: member(200) },
  { method: 'get', route: '/api/stars/:starId/models/compare', path: '/api/stars/STAR/models/compare', expect: member(200) },
  { method: 'get', route: '/api/stars/:starId/models', path: '/api/stars/STAR/models', expect: member(200) },
  { method: 'post', route: '/api/stars/:starId/models', path: '/api/stars/STAR/models', expect: analyst(201), body: { name: 'access', spec: SPEC } },
  { method: 'get', route: '/api/models/:modelId', path: '/api/models/MODEL', expect: member(200) },
  { method: 'get', route: '/api/models/:modelId/versions/:version', path: '/api/models/MODEL/versions/1', expect: member(200) },
  { method: 'patch', route: '/api/models/:modelId', expect: analyst(200),
    prepare: async () => ({ path: `/api/models/${await newModel()}`, body: { name: 'renamed' } }) },
  { method: 'post', route: '/api/models/:modelId/fit', expect: analyst(200), prepare: async () => ({ path: `/api/models/${await newModel()}/fit` }) },
  { method: 'post', route: '/api/models/:modelId/duplicate', path: '/api/models/MODEL/duplicate', expect: analyst(201) },
  { method: 'delete', route: '/api/models/:modelId', expect: analyst(204), prepare: async () => ({ path: `/api/models/${await newModel()}` }) },
  // no activity candidates on this star: an analyst reaches the 400; reviewers 403, another team 404
  { method: 'post', route: '/api/models/:modelId/overrule', path: '/api/models/MODEL/overrule', expect: analyst(400), body: { signal: 0, reason: 'transits seen' } },
  { method: 'post', route: '/api/models/:modelId/gp-variant', path: '/api/models/MODEL/gp-variant', expect: analyst(201), body: { period: 20 } },
  { method: 'post', route: '/api/stars/:starId/search', path: '/api/stars/STAR/search', expect: analyst(201), body: { maxPlanets: 1, trend: 'none' } },
]

const fill = (p: string) => p.replace('STAR', String(starId)).replace('MODEL', String(modelId)).replace('PERIODOGRAM', String(periodogramId))
const client = cachedPersonas(() => t.app)

describe('access to every analysis route', () => {
  roleTable({
    handlers: analysisHandlers, routes, cases, client, hidden: /9\.7|probe/,
    request: async (c) => {
      const prepared = c.prepare ? await c.prepare() : {}
      return { path: fill(prepared.path ?? c.path!), body: prepared.body ?? c.body }
    },
  })

  it('answers 404 for unknown, malformed and archived ids', async () => {
    const a = await client('analyst')
    await a.get('/api/models/999999').expect(404)
    await a.get('/api/models/abc').expect(404)
    await a.get(`/api/models/${modelId}/versions/99`).expect(404)
    await a.get(`/api/models/${modelId}/versions/x`).expect(404)
    await a.get('/api/periodograms/999999').expect(404)
    const doomed = await newModel()
    await a.delete(`/api/models/${doomed}`).expect(204)
    await a.get(`/api/models/${doomed}`).expect(404)
    await a.patch(`/api/models/${doomed}`, { name: 'back' }).expect(404)
    expect((await a.get(`/api/stars/${starId}/models`).expect(200)).body.map((m: { id: number }) => m.id)).not.toContain(doomed)
    // archiving keeps every version in the database
    const { analysisModels } = await import('../../server/db/models-analysis.ts')
    expect(await analysisModels(t.db.sequelize, t.models).FitModelVersion.count({ where: { modelId: doomed } })).toBe(1)
    expect(versionId).toBeGreaterThan(0)
  })
})

// Every report route for anonymous, another team's member, reviewer, analyst and owner
// (any member reads and reviews, analysts freeze and share, another team gets 404).
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { routes } from '../../server/routes.ts'
import * as reportHandlers from '../../server/reports/routes.ts'
import { signIn, type Client } from './client.ts'
import { analyst, cachedPersonas, EMAIL, member, roleTable, type Expect } from './roles.ts'


// 24 nights of a 9.7-day sinusoid (this test's own numbers), one instrument
const TABLE = '# bjd rv err\n' + Array.from({ length: 24 }, (_, i) => {
  const x = 2459000.5 + i * 2.3 + (i % 3) * 0.1
  return `${x.toFixed(4)} ${(6 * Math.sin((2 * Math.PI * x) / 9.7) + ((i * 7) % 5) * 0.3).toFixed(3)} 1.0`
}).join('\n') + '\n'
const SPEC = { planets: [{ period: 9.7, K: 6 }], trend: 'none' }

interface Case { method: string; route: string; expect: Expect; prepare?: () => Promise<{ path?: string; body?: object }>; path?: string; body?: object }

let t: TestApp
let starId: number, reportId: number
let analystClient: Client

async function fittedModel(): Promise<number> {
  const res = await analystClient.post(`/api/stars/${starId}/models`, { name: 'probe', spec: SPEC })
  expect(res.status, JSON.stringify(res.body)).toBe(201)
  await analystClient.post(`/api/models/${res.body.id}/fit`, {}).expect(200)
  return res.body.id
}

beforeAll(async () => {
  t = await startTestApp({ seed: true })
  analystClient = await signIn(t.app, EMAIL.analyst)
  starId = (await analystClient.post(`/api/teams/${t.seed!.teamId}/stars`, { name: 'Report Probe', massMsun: 1, massErrMsun: 0.1 }).expect(201)).body.id
  const pre = await analystClient.upload(`/api/stars/${starId}/uploads/preview`, [{ name: 'probe.txt', content: TABLE }]).expect(200)
  await analystClient.upload(`/api/stars/${starId}/uploads/commit`, [{ name: 'probe.txt', content: TABLE }], { mappings: { 'probe.txt': pre.body.files[0].detection.mapping } }).expect(201)
  const modelId = await fittedModel()
  reportId = (await analystClient.post(`/api/models/${modelId}/report`, {}).expect(201)).body.id
}, 60_000)
afterAll(async () => { await t?.close() })

let n = 0
const cases: Case[] = [
  // a fresh fitted model each call, so every permitted freeze makes version 1 (201)
  { method: 'post', route: '/api/models/:modelId/report', expect: analyst(201), prepare: async () => ({ path: `/api/models/${await fittedModel()}/report` }) },
  { method: 'get', route: '/api/stars/:starId/reports', path: '/api/stars/STAR/reports', expect: member(200) },
  { method: 'get', route: '/api/reports/:reportId', path: '/api/reports/REPORT', expect: member(200) },
  { method: 'get', route: '/api/reports/:reportId/versions/:version', path: '/api/reports/REPORT/versions/1', expect: member(200) },
  { method: 'get', route: '/api/reports/:reportId/versions/:version/pdf', path: '/api/reports/REPORT/versions/1/pdf', expect: member(200) },
  { method: 'get', route: '/api/reports/:reportId/versions/:version/latex', path: '/api/reports/REPORT/versions/1/latex', expect: member(200) },
  { method: 'get', route: '/api/reports/:reportId/versions/:version/csv', path: '/api/reports/REPORT/versions/1/csv', expect: member(200) },
  { method: 'get', route: '/api/reports/:reportId/versions/:version/ecsv', path: '/api/reports/REPORT/versions/1/ecsv', expect: member(200) },
  { method: 'get', route: '/api/reports/:reportId/versions/:version/json', path: '/api/reports/REPORT/versions/1/json', expect: member(200) },
  { method: 'post', route: '/api/reports/:reportId/shares', path: '/api/reports/REPORT/shares', expect: analyst(201),
    prepare: async () => ({ body: { email: `coauthor-${++n}@example.test` } }) },
  { method: 'post', route: '/api/reports/:reportId/reviews', path: '/api/reports/REPORT/reviews', expect: member(201), body: { version: 1, kind: 'comment', body: 'looks fine' } },
]

const fill = (p: string) => p.replace('STAR', String(starId)).replace('REPORT', String(reportId))
const client = cachedPersonas(() => t.app)

describe('access to every report route', () => {
  roleTable({
    handlers: reportHandlers, routes, cases, client, hidden: /Report Probe|probe/, timeout: 60_000,
    request: async (c) => {
      const prepared = c.prepare ? await c.prepare() : {}
      return { path: fill(prepared.path ?? c.path!), body: prepared.body ?? c.body }
    },
  })

  it('answers 404 for unknown and malformed ids', async () => {
    const a = await client('analyst')
    await a.get('/api/reports/999999').expect(404)
    await a.get('/api/reports/abc').expect(404)
    await a.get(`/api/reports/${reportId}/versions/0`).expect(404)
    await a.get(`/api/reports/${reportId}/versions/x/pdf`).expect(404)
  })
})

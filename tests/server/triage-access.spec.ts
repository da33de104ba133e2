// Survey-triage routes: who may call each (reviewers read the table, analysts upload and queue,
// only owners see the queue's depth and workers; another team gets 404). No job workers here:
// queued stars stay queued (tests/server/triage.spec.ts runs them).
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { routes } from '../../server/routes.ts'
import * as triageHandlers from '../../server/triage/routes.ts'
import { anonymous, type Client } from './client.ts'
import { analyst, member, owner, roleTable, type Expect, type Persona } from './roles.ts'
import { starFile, startTriageWorld, syntheticSurvey, type TriageWorld } from './triage-setup.ts'

let w: TriageWorld
beforeAll(async () => {
  w = await startTriageWorld()
  const [st] = syntheticSurvey(1, 20, 'Access probe')
  await w.analyst.upload(`/api/teams/${w.teamId}/survey/upload`, [{ name: 'probe.txt', content: starFile(st!) }]).expect(201)
}, 180_000)
afterAll(async () => {
  w?.services.mailer.close()
  await w?.t.close()
})

interface Case { method: string; route: string; expect: Expect; body?: object }
const cases: Case[] = [
  // a JSON body carries no files: past the guards, the upload is refused for its content (the multipart call is tested below)
  { method: 'post', route: '/api/teams/:teamId/survey/upload', expect: analyst(400) },
  { method: 'post', route: '/api/teams/:teamId/survey/runs', expect: analyst(201), body: {} },
  { method: 'get', route: '/api/teams/:teamId/survey', expect: member(200) },
  { method: 'get', route: '/api/teams/:teamId/survey/queue', expect: owner(200) },
]

function client(p: Persona): Client {
  return p === 'anonymous' ? anonymous(w.t.app) : w[p]
}

describe('survey-triage routes', () => {
  roleTable({
    handlers: triageHandlers, routes, cases, client, hidden: /Access probe/, timeout: 60_000,
    request: (c) => ({ path: c.route.replace(':teamId', String(w.teamId)), body: c.body }),
  })

  it('a multipart upload: analysts store, reviewers are refused (403), another team sees nothing (404)', async () => {
    const [st] = syntheticSurvey(1, 20, 'Access second')
    const file = [{ name: 'second.txt', content: starFile(st!) }]
    const r = await w.reviewer.upload(`/api/teams/${w.teamId}/survey/upload`, file).expect(403)
    expect(r.body.error.message).toMatch(/role/)
    const o = await w.outsider.upload(`/api/teams/${w.teamId}/survey/upload`, file).expect(404)
    expect(o.body.error.code).toBe('not_found')
    const a = await w.analyst.upload(`/api/teams/${w.teamId}/survey/upload`, file).expect(201)
    expect(a.body.files[0]).toMatchObject({ status: 'stored', star: 'Access second 001' })
    const table = (await w.reviewer.get(`/api/teams/${w.teamId}/survey`).expect(200)).body as Array<{ starName: string; state: string }>
    expect(table.map((t) => t.starName)).toEqual(expect.arrayContaining(['Access probe 001', 'Access second 001']))
    expect(table.every((t) => t.state === 'queued')).toBe(true) // the role table's POST …/runs also queued the demo stars
    const other = (await w.outsider.get('/api/teams').expect(200)).body as Array<{ id: number }>
    const mine = (await w.outsider.get(`/api/teams/${other[0]!.id}/survey`).expect(200)).body as unknown[]
    expect(mine).toEqual([]) // the other team's table does not show this team's stars
  })
})

// Regression tests of issue 11, holes 3, 4 and 6: concurrent owner changes keep an owner, an
// analyst's share with an outsider waits for an owner (and share messages are limited), parallel
// registrations and invitations of one address, and text the database cannot store.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { analysisModels } from '../../server/db/models-analysis.ts'
import { reportModels } from '../../server/db/models-reports.ts'
import { anonymous, signIn, type Client } from './client.ts'
import { EMAIL } from './roles.ts'

let t: TestApp
let owner: Client
let teamId: number
beforeAll(async () => {
  t = await startTestApp({ seed: true, config: { shareRateLimit: 3 } })
  teamId = t.seed!.teamId!
  owner = await signIn(t.app, EMAIL.owner)
})
afterAll(async () => { await t?.close() })

let n = 0
async function user(role: 'owner' | 'analyst' | 'reviewer', team: number): Promise<{ id: number; c: Client }> {
  const email = `u${++n}-${Date.now()}@example.test`
  const c = anonymous(t.app)
  const res = await c.post('/api/auth/register', { email, password: 'a long test password', name: `User ${n}` }).expect(201)
  await t.models.Membership.create({ teamId: team, userId: res.body.user.id, role })
  return { id: res.body.user.id, c }
}

describe('hole 3: two owners acting on each other at the same moment', () => {
  it('demoting each other leaves one owner (6 trials)', async () => {
    for (let trial = 0; trial < 6; trial++) {
      const team = await t.models.Team.create({ name: `Race ${trial}` })
      const a = await user('owner', team.id)
      const b = await user('owner', team.id)
      const [ra, rb] = await Promise.all([
        a.c.patch(`/api/teams/${team.id}/members/${b.id}`, { role: 'analyst' }),
        b.c.patch(`/api/teams/${team.id}/members/${a.id}`, { role: 'analyst' }),
      ])
      expect([ra.status, rb.status].sort(), `trial ${trial}`).toEqual([200, 403])
      expect(await t.models.Membership.count({ where: { teamId: team.id, role: 'owner' } }), `trial ${trial}`).toBe(1)
    }
  })

  it('removing each other leaves one owner (6 trials)', async () => {
    for (let trial = 0; trial < 6; trial++) {
      const team = await t.models.Team.create({ name: `Race removal ${trial}` })
      const a = await user('owner', team.id)
      const b = await user('owner', team.id)
      const [ra, rb] = await Promise.all([
        a.c.delete(`/api/teams/${team.id}/members/${b.id}`),
        b.c.delete(`/api/teams/${team.id}/members/${a.id}`),
      ])
      // the loser is refused by the lock (403) or, when it starts after the removal, by the guard (404)
      expect([ra.status, rb.status].filter((x) => x === 204), `trial ${trial}`).toHaveLength(1)
      expect([ra.status, rb.status].every((x) => [204, 403, 404].includes(x)), `trial ${trial}`).toBe(true)
      expect(await t.models.Membership.count({ where: { teamId: team.id, role: 'owner' } }), `trial ${trial}`).toBe(1)
    }
  })
})

describe('hole 4: only owners let people in', () => {
  async function report(): Promise<number> {
    const starId = Object.values(t.seed!.starIds!)[0]!
    const fm = await analysisModels(t.db.sequelize, t.models).FitModel.create({ starId, name: `Shared ${++n}`, currentVersion: 1, createdBy: null, archivedAt: null })
    const r = await reportModels(t.db.sequelize, t.models).Report.create({ starId, modelId: fm.id, title: 'Shared report', currentVersion: 1, createdBy: null })
    return r.id
  }

  it('an analyst sharing with an outsider creates a request: the outsider gets no invitation and reads nothing', async () => {
    const analyst = await signIn(t.app, EMAIL.analyst)
    const outsider = 'outsider@elsewhere.test'
    const res = await analyst.post(`/api/reports/${await report()}/shares`, { email: outsider })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    await t.mail.waitFor((m) => m.to.includes(EMAIL.owner) && /asks to invite outsider@elsewhere\.test/.test(m.subject))
    await new Promise((r) => setTimeout(r, 200))
    expect((await t.mail.messages()).some((m) => m.to.includes(outsider) && /invites you/.test(m.subject))).toBe(false)
    // the outsider registers with that address (no link): no membership, the team's data stay hidden
    const o = anonymous(t.app)
    await o.post('/api/auth/register', { email: outsider, password: 'an outsider password', name: 'Outsider' }).expect(201)
    expect((await o.get('/api/auth/me').expect(200)).body.memberships).toEqual([])
    await o.get(`/api/teams/${teamId}/stars`).expect(404)
    // the pending invitation has no working link, even to the invitation routes
    const inv = (await owner.get(`/api/teams/${teamId}/invitations`).expect(200)).body.find((i: { email: string }) => i.email === outsider)
    expect(inv.pendingApproval).toBe(true)
    // analysts cannot invite directly, nor approve
    await analyst.post(`/api/teams/${teamId}/invitations`, { email: 'direct@elsewhere.test', role: 'reviewer' }).expect(403)
    await analyst.post(`/api/teams/${teamId}/invitations/${inv.id}/approve`).expect(403)
    // the owner approves: now the outsider is invited and can join
    await owner.post(`/api/teams/${teamId}/invitations/${inv.id}/approve`).expect(200)
    const mail = await t.mail.waitFor((m) => m.to.includes(outsider) && /invites you/.test(m.subject))
    const token = /invite\?token=([A-Za-z0-9_-]+)/.exec(mail.text)![1]!
    await o.post(`/api/invitations/${token}/accept`).expect(200)
    await o.get(`/api/teams/${teamId}/stars`).expect(200)
  })

  it('share messages are rate-limited per user', async () => {
    const analyst = await signIn(t.app, EMAIL.analyst)
    const reportId = await report()
    const reviewer = (await t.models.User.findOne({ where: { email: EMAIL.reviewer } }))!
    const statuses: number[] = []
    for (let i = 0; i < 5; i++) statuses.push((await analyst.post(`/api/reports/${reportId}/shares`, { userId: reviewer.id })).status)
    // the analyst's earlier share counts too: limit 3 per hour
    expect(statuses.filter((s) => s === 429).length).toBeGreaterThanOrEqual(2)
    expect(statuses[statuses.length - 1]).toBe(429)
  })
})

describe('hole 6: parallel requests and unstorable text', () => {
  it('six parallel registrations of one e-mail: one 201, five 409', async () => {
    const c = () => anonymous(t.app).post('/api/auth/register', { email: 'race@example.test', password: 'a long race password', name: 'Race' })
    const statuses = (await Promise.all(Array.from({ length: 6 }, c))).map((r) => r.status).sort()
    expect(statuses).toEqual([201, 409, 409, 409, 409, 409])
    expect(await t.models.User.count({ where: { email: 'race@example.test' } })).toBe(1)
  })

  it('four parallel invitations of one address: one open invitation', async () => {
    const c = () => owner.post(`/api/teams/${teamId}/invitations`, { email: 'four@example.test', role: 'reviewer' })
    const statuses = (await Promise.all(Array.from({ length: 4 }, c))).map((r) => r.status).sort()
    expect(statuses).toEqual([201, 409, 409, 409])
    expect(await t.models.Invitation.count({ where: { teamId, email: 'four@example.test', acceptedAt: null } })).toBe(1)
  })

  it('a lone surrogate in a team name and a NUL in a star name are refused with the field named', async () => {
    const c = await signIn(t.app, EMAIL.analyst)
    const team = await c.post('/api/teams', { name: 'Broken \ud800 team' })
    expect(team.status).toBe(400)
    expect(team.body.error).toMatchObject({ code: 'validation', field: 'name' })
    expect(team.body.error.message).toMatch(/lone surrogate/)
    const star = await c.post(`/api/teams/${teamId}/stars`, { name: 'HD\u0000 1', massMsun: 1, massErrMsun: 0.1 })
    expect(star.status).toBe(400)
    expect(star.body.error).toMatchObject({ code: 'validation', field: 'name' })
    expect(star.body.error.message).toMatch(/U\+0000/)
    expect(await t.models.Star.count({ where: { teamId, name: 'HD\u0000 1' } }).catch(() => 0)).toBe(0)
    // a proper astral character (two surrogates) is text
    await c.post('/api/teams', { name: 'Team 🔭' }).expect(201)
  })
})

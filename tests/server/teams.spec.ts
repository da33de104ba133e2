import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { anonymous, signIn, type Client } from './client.ts'

let t: TestApp
let owner: Client
let teamId: number
beforeAll(async () => {
  t = await startTestApp({ seed: true })
  teamId = t.seed!.teamId!
  owner = await signIn(t.app, 'nadia.owner@lanternfield.test')
})
afterAll(async () => { await t?.close() })

function tokenFrom(text: string): string {
  const m = /http:\/\/starsway\.test\/invite\?token=([A-Za-z0-9_-]+)/.exec(text)
  if (!m) throw new Error(`no invitation link in: ${text}`)
  return m[1]!
}

describe('teams and members', () => {
  it('lists the team with its members and roles', async () => {
    const res = await owner.get(`/api/teams/${teamId}`).expect(200)
    expect(res.body.name).toBe('Lanternfield Velocity Survey')
    expect(res.body.role).toBe('owner')
    expect(res.body.members.map((m: { email: string; role: string }) => `${m.email}:${m.role}`).sort()).toEqual([
      'ines.reviewer@lanternfield.test:reviewer', 'nadia.owner@lanternfield.test:owner', 'tomas.analyst@lanternfield.test:analyst',
    ])
  })

  it('a new team makes its creator the owner', async () => {
    const c = await signIn(t.app, 'ines.reviewer@lanternfield.test')
    const res = await c.post('/api/teams', { name: 'Side project' }).expect(201)
    expect(res.body).toMatchObject({ name: 'Side project', role: 'owner' })
    const teams = await c.get('/api/teams').expect(200)
    expect(teams.body.map((x: { name: string; role: string }) => `${x.name}:${x.role}`)).toEqual(['Lanternfield Velocity Survey:reviewer', 'Side project:owner'])
  })

  it('cannot demote or remove the last owner', async () => {
    const me = await owner.get('/api/auth/me').expect(200)
    const demote = await owner.patch(`/api/teams/${teamId}/members/${me.body.user.id}`, { role: 'analyst' })
    expect(demote.status).toBe(409)
    expect(demote.body.error.message).toMatch(/at least one owner/)
    await owner.delete(`/api/teams/${teamId}/members/${me.body.user.id}`).expect(409)
  })

  it('changes a role and records it in the audit log', async () => {
    const team = await owner.get(`/api/teams/${teamId}`).expect(200)
    const ines = team.body.members.find((m: { email: string }) => m.email === 'ines.reviewer@lanternfield.test')
    const res = await owner.patch(`/api/teams/${teamId}/members/${ines.userId}`, { role: 'analyst' }).expect(200)
    expect(res.body.role).toBe('analyst')
    await owner.patch(`/api/teams/${teamId}/members/${ines.userId}`, { role: 'reviewer' }).expect(200)
    const audit = await owner.get(`/api/teams/${teamId}/audit`).expect(200)
    const roles = audit.body.filter((e: { action: string }) => e.action === 'member.role')
    expect(roles.map((e: { detail: unknown }) => e.detail)).toEqual([{ from: 'analyst', to: 'reviewer' }, { from: 'reviewer', to: 'analyst' }])
    expect(roles[0].user.name).toBe('Nadia Owner')
    const bad = await owner.patch(`/api/teams/${teamId}/members/${ines.userId}`, { role: 'admin' })
    expect(bad.status).toBe(400)
    expect(bad.body.error.field).toBe('role')
  })
})

describe('invitations', () => {
  it('invite by e-mail, then register with the invite link and join with the given role', async () => {
    const inv = await owner.post(`/api/teams/${teamId}/invitations`, { email: 'Rosa@Example.test', role: 'analyst' }).expect(201)
    expect(inv.body).toMatchObject({ email: 'rosa@example.test', role: 'analyst', acceptedAt: null })
    const msg = await t.mail.waitFor((m) => m.to.includes('rosa@example.test'))
    expect(msg.subject).toMatch(/Lanternfield Velocity Survey/)
    const token = tokenFrom(msg.text)

    const info = await anonymous(t.app).get(`/api/invitations/${token}`).expect(200)
    expect(info.body).toMatchObject({ teamName: 'Lanternfield Velocity Survey', role: 'analyst', email: 'rosa@example.test' })

    const wrong = await anonymous(t.app).post('/api/auth/register', { email: 'other@example.test', password: 'long enough pw', name: 'Other', inviteToken: token })
    expect(wrong.status).toBe(400)
    expect(wrong.body.error.message).toMatch(/another e-mail address/)
    expect(await t.models.User.count({ where: { email: 'other@example.test' } })).toBe(0)

    const rosa = anonymous(t.app)
    await rosa.post('/api/auth/register', { email: 'rosa@example.test', password: 'long enough pw', name: 'Rosa', inviteToken: token }).expect(201)
    const me = await rosa.get('/api/auth/me').expect(200)
    expect(me.body.memberships).toEqual([{ teamId, teamName: 'Lanternfield Velocity Survey', role: 'analyst' }])
    await anonymous(t.app).get(`/api/invitations/${token}`).expect(404) // used
    const list = await owner.get(`/api/teams/${teamId}/invitations`).expect(200)
    expect(list.body.find((i: { email: string }) => i.email === 'rosa@example.test').acceptedAt).not.toBeNull()
    const audit = await owner.get(`/api/teams/${teamId}/audit`).expect(200)
    expect(audit.body.map((e: { action: string }) => e.action)).toEqual(expect.arrayContaining(['invitation.create', 'invitation.accept']))
  })

  it('an existing user accepts while signed in with the invited address', async () => {
    await owner.post(`/api/teams/${teamId}/invitations`, { email: 'piet@quillmere.test', role: 'reviewer' }).expect(201)
    const token = tokenFrom((await t.mail.waitFor((m) => m.to.includes('piet@quillmere.test'))).text)
    const tomas = await signIn(t.app, 'tomas.analyst@lanternfield.test')
    const refused = await tomas.post(`/api/invitations/${token}/accept`)
    expect(refused.status).toBe(400)
    expect(refused.body.error.message).toMatch(/sent to piet@quillmere\.test/)
    const piet = await signIn(t.app, 'piet@quillmere.test')
    const ok = await piet.post(`/api/invitations/${token}/accept`).expect(200)
    expect(ok.body).toEqual({ teamId, role: 'reviewer' })
    await piet.get(`/api/teams/${teamId}/stars`).expect(200)
    await piet.post(`/api/invitations/${token}/accept`).expect(404)
  })

  it('refuses inviting a member, and a revoked invitation no longer works', async () => {
    const dup = await owner.post(`/api/teams/${teamId}/invitations`, { email: 'tomas.analyst@lanternfield.test', role: 'owner' })
    expect(dup.status).toBe(409)
    const inv = await owner.post(`/api/teams/${teamId}/invitations`, { email: 'late@example.test', role: 'reviewer' }).expect(201)
    const token = tokenFrom((await t.mail.waitFor((m) => m.to.includes('late@example.test'))).text)
    await owner.delete(`/api/teams/${teamId}/invitations/${inv.body.id}`).expect(204)
    await anonymous(t.app).get(`/api/invitations/${token}`).expect(404)
  })

  it('an expired invitation is unknown', async () => {
    await owner.post(`/api/teams/${teamId}/invitations`, { email: 'slow@example.test', role: 'reviewer' }).expect(201)
    const token = tokenFrom((await t.mail.waitFor((m) => m.to.includes('slow@example.test'))).text)
    await t.models.Invitation.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { email: 'slow@example.test' } })
    await anonymous(t.app).get(`/api/invitations/${token}`).expect(404)
  })
})

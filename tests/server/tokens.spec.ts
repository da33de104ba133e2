// Personal API tokens: a notebook calls the API with a bearer token, inside one team, read-only by
// default; revoked or expired tokens stop at once; tokens never reach the account or other teams.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { signIn, type Client } from './client.ts'
import { EMAIL } from './roles.ts'

let t: TestApp
let analyst: Client
let teamId: number, starId: number, otherTeamStar: number

beforeAll(async () => {
  t = await startTestApp({ seed: true })
  teamId = t.seed!.teamId!
  analyst = await signIn(t.app, EMAIL.analyst)
  starId = (await analyst.post(`/api/teams/${teamId}/stars`, { name: 'Token Probe', massMsun: 1, massErrMsun: 0.1 }).expect(201)).body.id
  const own = (await analyst.post('/api/teams', { name: 'Side project' }).expect(201)).body.id
  otherTeamStar = (await analyst.post(`/api/teams/${own}/stars`, { name: 'Elsewhere', massMsun: 1, massErrMsun: 0.1 }).expect(201)).body.id
})
afterAll(async () => { await t?.close() })

const bearer = (token: string) => ({ Authorization: `Bearer ${token}` })

describe('personal API tokens', () => {
  it('reads the team\'s data with a bearer token and no cookie, and is shown once', async () => {
    const created = await analyst.post(`/api/teams/${teamId}/tokens`, { name: 'notebook' }).expect(201)
    expect(created.body.token).toMatch(/^sw_[A-Za-z0-9_-]{40,}$/)
    expect(created.body.readOnly).toBe(true)
    const list = await analyst.get(`/api/teams/${teamId}/tokens`).expect(200)
    expect(JSON.stringify(list.body)).not.toContain(created.body.token.slice(3))
    const star = await request(t.app).get(`/api/stars/${starId}`).set(bearer(created.body.token)).expect(200)
    expect(star.body.name).toBe('Token Probe')
    const used = (await analyst.get(`/api/teams/${teamId}/tokens`).expect(200)).body.find((x: { id: number }) => x.id === created.body.id)
    expect(used.lastUsedAt).not.toBeNull()
  })

  it('stays inside its team, its reading scope and away from the account', async () => {
    const { token } = (await analyst.post(`/api/teams/${teamId}/tokens`, { name: 'ro' }).expect(201)).body
    // the analyst is a member of the other team too, but this token belongs to the first one
    expect((await request(t.app).get(`/api/stars/${otherTeamStar}`).set(bearer(token))).status).toBe(404)
    const write = await request(t.app).patch(`/api/stars/${starId}`).set(bearer(token)).send({ notes: 'x' })
    expect(write.status).toBe(403)
    expect(write.body.error.message).toMatch(/read-only/)
    for (const [method, path] of [['get', '/api/auth/me'], ['post', `/api/teams/${teamId}/tokens`], ['get', '/api/teams']] as const) {
      const res = await request(t.app)[method](path).set(bearer(token)).send({ name: 'sneaky' })
      expect(res.status, `${method} ${path}`).toBe(403)
    }
  })

  it('a writing token writes without a CSRF header; a reviewer only ever gets read-only ones', async () => {
    const { token } = (await analyst.post(`/api/teams/${teamId}/tokens`, { name: 'rw', readOnly: false }).expect(201)).body
    const res = await request(t.app).patch(`/api/stars/${starId}`).set(bearer(token)).send({ notes: 'from a notebook' })
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    const reviewer = await signIn(t.app, EMAIL.reviewer)
    expect((await reviewer.post(`/api/teams/${teamId}/tokens`, { name: 'mine', readOnly: false }).expect(201)).body.readOnly).toBe(true)
  })

  it('stops working once revoked, and an unknown token is a 401, never an anonymous request', async () => {
    const created = (await analyst.post(`/api/teams/${teamId}/tokens`, { name: 'short-lived' }).expect(201)).body
    await analyst.delete(`/api/teams/${teamId}/tokens/${created.id}`).expect(200)
    const res = await request(t.app).get(`/api/stars/${starId}`).set(bearer(created.token))
    expect(res.status).toBe(401)
    expect(res.body.error.message).toMatch(/revoked/)
    expect((await request(t.app).get(`/api/stars/${starId}`).set(bearer('sw_nonsense'))).status).toBe(401)
    expect((await request(t.app).get(`/api/stars/${starId}`).set('Authorization', 'Basic abc')).status).toBe(401)
  })
})

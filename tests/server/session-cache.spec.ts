// The in-process session memory (server/auth/session-cache.ts): entries live SESSION_CACHE_MS, belong
// to one user, and are forgotten at once on sign-out, on deleting a user's sessions and on any save of
// the user row — so a signed-out or re-passworded session is refused on the very next request.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { SessionCache } from '../../server/auth/session-cache.ts'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import request from 'supertest'
import { DEMO_PASSWORD } from './client.ts'

describe('SessionCache', () => {
  it('keeps an entry for its lifetime, for its own user only, and forgets by session or user', () => {
    let now = 1000
    const c = new SessionCache(5000, () => now)
    c.set('h1', 7, { id: 7, name: 'A' })
    c.set('h2', 7, { id: 7, name: 'A' })
    c.set('h3', 8, { id: 8, name: 'B' })
    expect(c.get('h1', 7)).toEqual({ id: 7, name: 'A' })
    expect(c.get('h1', 8)).toBeUndefined() // another user's claim: not served, and dropped
    expect(c.get('h1', 7)).toBeUndefined()
    c.forgetUser(7)
    expect(c.get('h2', 7)).toBeUndefined()
    expect(c.get('h3', 8)).toBeDefined()
    c.forgetSession('h3')
    expect(c.get('h3', 8)).toBeUndefined()
    c.set('h4', 9, { id: 9 })
    now += 4999
    expect(c.get('h4', 9)).toBeDefined()
    now += 1
    expect(c.get('h4', 9)).toBeUndefined()
    expect(c.size).toBe(0)
  })
})

describe('sessions remembered in the API', () => {
  let t: TestApp
  let queries = 0
  beforeAll(async () => {
    t = await startTestApp({ seed: true })
    t.db.sequelize.addHook('beforeQuery', () => { queries++ })
  }, 120_000)
  afterAll(async () => { await t?.close() })

  /** Signs in; returns the session cookie (what a thief would copy) and the CSRF token. */
  const login = async (): Promise<{ cookie: string; csrf: string }> => {
    const res = await request(t.app).post('/api/auth/login').send({ email: 'tomas.analyst@lanternfield.test', password: DEMO_PASSWORD }).expect(200)
    const set = ([] as string[]).concat(res.headers['set-cookie'] ?? [])
    const pick = (name: string) => set.find((x) => x.startsWith(`${name}=`))!.split(';')[0]!
    return { cookie: `${pick('starsway_session')}; ${pick('starsway_csrf')}`, csrf: decodeURIComponent(pick('starsway_csrf').split('=')[1]!) }
  }
  const me = async (cookie: string): Promise<{ status: number; n: number }> => {
    const before = queries
    const res = await request(t.app).get('/api/auth/me').set('Cookie', cookie)
    return { status: res.status, n: queries - before }
  }

  it('a repeated read skips the session query; a signed-out copy is refused on the next request', async () => {
    const a = await login()
    expect((await me(a.cookie)).status).toBe(200)
    const again = await me(a.cookie)
    expect(again).toEqual({ status: 200, n: 1 }) // the account only: the session is remembered
    await request(t.app).post('/api/auth/logout').set('Cookie', a.cookie).set('X-CSRF-Token', a.csrf).expect(204)
    expect((await me(a.cookie)).status).toBe(401)
  })

  it('a password change ends the other sessions at once, though they were just remembered', async () => {
    const one = await login()
    const two = await login()
    expect((await me(two.cookie)).status).toBe(200)
    expect((await me(two.cookie)).n).toBe(1)
    await request(t.app).post('/api/auth/password').set('Cookie', one.cookie).set('X-CSRF-Token', one.csrf)
      .send({ currentPassword: DEMO_PASSWORD, newPassword: 'a-new-long-passphrase-42' }).expect(204)
    expect((await me(two.cookie)).status).toBe(401)
    expect((await me(one.cookie)).status).toBe(401) // its old cookie too: the change issued a new one
  })
})

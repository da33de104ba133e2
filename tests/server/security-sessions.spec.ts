// Regression tests of issue 11, hole 5 (sessions, reset links, CSRF) and the account parts of
// hole 7 (weak production secret, common passwords, no-store, dev mail behind sign-in).
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { loadConfig } from '../../server/config.ts'
import { weakPasswordReason } from '../../shared/api/password.ts'
import { anonymous, Client, signIn } from './client.ts'

let t: TestApp
beforeAll(async () => { t = await startTestApp({ seed: true }) })
afterAll(async () => { await t?.close() })

/** The session cookie a client holds (what a thief would copy). */
function sessionCookie(c: Client, res: request.Response): string {
  const set = ([] as string[]).concat(res.headers['set-cookie'] ?? [])
  const cookie = set.find((x) => x.startsWith('starsway_session='))
  if (!cookie) throw new Error('no session cookie')
  void c
  return cookie.split(';')[0]!
}

async function register(email: string, password = 'first long password'): Promise<{ c: Client; cookie: string }> {
  const c = anonymous(t.app)
  const res = await c.post('/api/auth/register', { email, password, name: 'Sam' }).expect(201)
  return { c, cookie: sessionCookie(c, res) }
}

describe('hole 5: sessions end when they should', () => {
  it('a copied session cookie no longer works after sign-out', async () => {
    const { c, cookie } = await register('sam@example.test')
    await request(t.app).get('/api/auth/me').set('Cookie', cookie).expect(200)
    await c.post('/api/auth/logout').expect(204)
    await request(t.app).get('/api/auth/me').set('Cookie', cookie).expect(401)
  })

  it('signing out one browser keeps the other signed in', async () => {
    await register('two@example.test')
    const a = await signIn(t.app, 'two@example.test', 'first long password')
    const b = await signIn(t.app, 'two@example.test', 'first long password')
    await a.post('/api/auth/logout').expect(204)
    await a.get('/api/auth/me').expect(401)
    await b.get('/api/auth/me').expect(200)
  })

  it('an older reset link is spent once a newer one is asked for or used', async () => {
    await register('reset@example.test')
    const c = anonymous(t.app)
    const tokens: string[] = []
    for (let i = 0; i < 2; i++) {
      const before = (await t.mail.messages()).length
      await c.post('/api/auth/reset-request', { email: 'reset@example.test' }).expect(202)
      for (let k = 0; k < 100 && (await t.mail.messages()).length === before; k++) await new Promise((r) => setTimeout(r, 50))
      const msg = (await t.mail.messages()).find((m) => m.to.includes('reset@example.test') && !tokens.some((x) => m.text.includes(x)))!
      tokens.push(/reset\?token=([A-Za-z0-9_-]+)/.exec(msg.text)![1]!)
    }
    const [older, newer] = tokens as [string, string]
    await c.post('/api/auth/reset', { token: newer, newPassword: 'second long password' }).expect(204)
    const res = await c.post('/api/auth/reset', { token: older, newPassword: 'attacker long password' })
    expect(res.status).toBe(400)
    expect(res.body.error.message).toMatch(/unknown, used or expired/)
    await signIn(t.app, 'reset@example.test', 'second long password')
  })

  it('a reset ends every session', async () => {
    const { cookie } = await register('resetall@example.test')
    await anonymous(t.app).post('/api/auth/reset-request', { email: 'resetall@example.test' }).expect(202)
    const msg = await t.mail.waitFor((m) => m.to.includes('resetall@example.test'))
    const token = /reset\?token=([A-Za-z0-9_-]+)/.exec(msg.text)![1]!
    await anonymous(t.app).post('/api/auth/reset', { token, newPassword: 'third long password' }).expect(204)
    await request(t.app).get('/api/auth/me').set('Cookie', cookie).expect(401)
  })
})

describe('hole 5: the CSRF token is bound to the session', () => {
  it('refuses a token planted in the cookie, or taken from another session', async () => {
    const login = await request(t.app).post('/api/auth/login').send({ email: 'nadia.owner@lanternfield.test', password: 'starsway-demo' }).expect(200)
    const session = ([] as string[]).concat(login.headers['set-cookie'] ?? []).find((x) => x.startsWith('starsway_session='))!.split(';')[0]!
    const attacker = await signIn(t.app, 'piet@quillmere.test')
    const body = { name: 'Planted', massMsun: 1, massErrMsun: 0.1 }
    const path = `/api/teams/${t.seed!.teamId}/stars`
    // double-submit with a value of the attacker's choosing (cookie and header agree)
    const planted = await request(t.app).post(path).set('Cookie', `${session}; starsway_csrf=chosen-by-attacker`).set('X-CSRF-Token', 'chosen-by-attacker').send(body)
    expect(planted.status).toBe(403)
    expect(planted.body.error.message).toMatch(/CSRF token/)
    // the attacker's own valid token does not work for the victim's session
    const other = await request(t.app).post(path).set('Cookie', `${session}; starsway_csrf=${attacker.csrf}`).set('X-CSRF-Token', attacker.csrf!).send(body)
    expect(other.status).toBe(403)
    expect(await t.models.Star.count({ where: { name: 'Planted' } })).toBe(0)
    const csrf = ([] as string[]).concat(login.headers['set-cookie'] ?? []).find((x) => x.startsWith('starsway_csrf='))!.split(';')[0]!.split('=')[1]!
    await request(t.app).post(path).set('Cookie', session).set('X-CSRF-Token', decodeURIComponent(csrf)).send(body).expect(201)
  })
})

describe('hole 7: secrets, passwords, caching, development routes', () => {
  it('production refuses a weak or the development JWT secret', () => {
    expect(() => loadConfig({ NODE_ENV: 'production', JWT_SECRET: 'aaaaaaaaaaaaaaaa' })).toThrow(/JWT_SECRET has 16 characters/)
    expect(() => loadConfig({ NODE_ENV: 'production', JWT_SECRET: 'a'.repeat(48) })).toThrow(/JWT_SECRET repeats too few characters/)
    expect(() => loadConfig({ NODE_ENV: 'production', JWT_SECRET: 'starsway-development-secret-not-for-production' })).toThrow(/development secret/)
    expect(loadConfig({ NODE_ENV: 'production', JWT_SECRET: 'kq3Vb9-Xw2mZ7pLr0tYh5sNf8dGc4jAe' }).env).toBe('production')
  })

  it('refuses the most common passwords with a reason', async () => {
    for (const p of ['password12', 'Password123!', 'qwerty2024!', '1234567890', 'aaaaaaaaaaaa', 'abcdefghijk', 'letmein!!!!']) {
      expect(weakPasswordReason(p), p).not.toBeNull()
    }
    for (const p of ['correct horse battery', 'long enough pw', 'Vela-Sorrel 2 planets']) expect(weakPasswordReason(p), p).toBeNull()
    const res = await anonymous(t.app).post('/api/auth/register', { email: 'weak@example.test', password: 'password12', name: 'Weak' })
    expect(res.status).toBe(400)
    expect(res.body.error).toMatchObject({ code: 'validation', field: 'password' })
    expect(res.body.error.message).toMatch(/most common passwords/)
  })

  it('API answers are not stored by browsers or proxies', async () => {
    const c = await signIn(t.app, 'ines.reviewer@lanternfield.test')
    for (const path of ['/api/auth/me', `/api/teams/${t.seed!.teamId}`, '/api/health', '/api/no-such-route']) {
      const res = await c.get(path)
      expect(res.headers['cache-control'], path).toBe('no-store')
    }
  })

  it('development mail (reset links) needs a signed-in user', async () => {
    await anonymous(t.app).get('/api/dev/mail').expect(401)
    await anonymous(t.app).get('/dev/mail').expect(401)
    const c = await signIn(t.app, 'ines.reviewer@lanternfield.test')
    await c.get('/api/dev/mail').expect(200)
  })
})

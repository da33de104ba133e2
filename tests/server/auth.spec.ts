import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { anonymous, Client, DEMO_PASSWORD, signIn } from './client.ts'

let t: TestApp
beforeAll(async () => { t = await startTestApp({ seed: true, config: { loginRateLimit: 5 } }) })
afterAll(async () => { await t?.close() })

describe('sign-in', () => {
  it('registers, signs in, reads me, signs out', async () => {
    const c = anonymous(t.app)
    const reg = await c.post('/api/auth/register', { email: 'Ada@Example.test', password: 'long enough pw', name: 'Ada' })
    expect(reg.status).toBe(201)
    expect(reg.body.user).toMatchObject({ email: 'ada@example.test', name: 'Ada' })
    const cookies = ([] as string[]).concat(reg.headers['set-cookie'] ?? [])
    expect(cookies.find((x) => x.startsWith('starsway_session='))).toMatch(/HttpOnly/)
    expect(cookies.find((x) => x.startsWith('starsway_session='))).toMatch(/SameSite=Lax/)
    expect(cookies.find((x) => x.startsWith('starsway_csrf='))).not.toMatch(/HttpOnly/)

    const me = await c.get('/api/auth/me').expect(200)
    expect(me.body).toEqual({ user: { id: reg.body.user.id, email: 'ada@example.test', name: 'Ada' }, memberships: [] })
    await c.post('/api/auth/logout').expect(204)
    await c.get('/api/auth/me').expect(401)

    const again = await signIn(t.app, 'ada@example.test', 'long enough pw')
    await again.get('/api/auth/me').expect(200)
  })

  it('refuses a duplicate e-mail, a short password and a wrong password', async () => {
    const c = anonymous(t.app)
    const dup = await c.post('/api/auth/register', { email: 'nadia.owner@lanternfield.test', password: 'long enough pw', name: 'X' })
    expect(dup.status).toBe(409)
    expect(dup.body.error).toMatchObject({ code: 'conflict', field: 'email' })
    const short = await c.post('/api/auth/register', { email: 'b@example.test', password: 'short', name: 'B' })
    expect(short.status).toBe(400)
    expect(short.body.error).toMatchObject({ code: 'validation', field: 'password' })
    expect(short.body.error.message).toMatch(/at least 10 characters/)
    const wrong = await c.post('/api/auth/login', { email: 'tomas.analyst@lanternfield.test', password: 'not the password' })
    expect(wrong.status).toBe(401)
    expect(wrong.body.error).toEqual({ code: 'unauthorized', message: 'Wrong e-mail or password.' })
  })

  it('lists the demo memberships in me', async () => {
    const c = await signIn(t.app, 'ines.reviewer@lanternfield.test')
    const me = await c.get('/api/auth/me').expect(200)
    expect(me.body.memberships).toEqual([{ teamId: t.seed!.teamId, teamName: 'Lanternfield Velocity Survey', role: 'reviewer' }])
  })

  it('changes the password and ends older sessions', async () => {
    const c = anonymous(t.app)
    await c.post('/api/auth/register', { email: 'carl@example.test', password: 'first password', name: 'Carl' }).expect(201)
    const other = await signIn(t.app, 'carl@example.test', 'first password')
    const bad = await c.post('/api/auth/password', { currentPassword: 'nope nope nope', newPassword: 'second password' })
    expect(bad.status).toBe(400)
    expect(bad.body.error.field).toBe('currentPassword')
    await c.post('/api/auth/password', { currentPassword: 'first password', newPassword: 'second password' }).expect(204)
    await c.get('/api/auth/me').expect(200) // this browser stays signed in
    await other.get('/api/auth/me').expect(401) // the other session ended
    await signIn(t.app, 'carl@example.test', 'second password')
    await anonymous(t.app).post('/api/auth/login', { email: 'carl@example.test', password: 'first password' }).expect(401)
  })
})

describe('password reset by e-mail', () => {
  it('mails a one-time link read back from the local SMTP server', async () => {
    const c = anonymous(t.app)
    await c.post('/api/auth/reset-request', { email: 'tomas.analyst@lanternfield.test' }).expect(202)
    const msg = await t.mail.waitFor((m) => m.to.includes('tomas.analyst@lanternfield.test') && /Reset/.test(m.subject))
    const link = /http:\/\/starsway\.test\/reset\?token=([A-Za-z0-9_-]+)/.exec(msg.text)
    expect(link, msg.text).not.toBeNull()
    const token = link![1]!
    await c.post('/api/auth/reset', { token, newPassword: 'a brand new password' }).expect(204)
    await signIn(t.app, 'tomas.analyst@lanternfield.test', 'a brand new password')
    const reuse = await c.post('/api/auth/reset', { token, newPassword: 'yet another password' })
    expect(reuse.status).toBe(400)
    expect(reuse.body.error.message).toMatch(/unknown, used or expired/)
  })

  it('answers 202 for an unknown address and sends nothing', async () => {
    const before = (await t.mail.messages()).length
    await anonymous(t.app).post('/api/auth/reset-request', { email: 'nobody@nowhere.test' }).expect(202)
    await new Promise((r) => setTimeout(r, 200))
    expect((await t.mail.messages()).length).toBe(before)
  })
})

describe('defences', () => {
  it('rate-limits sign-in attempts per address', async () => {
    const c = anonymous(t.app)
    for (let i = 0; i < 5; i++) {
      await c.post('/api/auth/login', { email: 'ines.reviewer@lanternfield.test', password: 'wrong guess ' + i }).expect(401)
    }
    const limited = await c.post('/api/auth/login', { email: 'ines.reviewer@lanternfield.test', password: DEMO_PASSWORD })
    expect(limited.status).toBe(429)
    expect(limited.body.error.code).toBe('rate_limited')
    expect(limited.headers['ratelimit-policy']).toBeDefined()
    // another address is not affected
    await signIn(t.app, 'nadia.owner@lanternfield.test')
  })

  it('refuses a state-changing request without the CSRF header', async () => {
    const c = await signIn(t.app, 'nadia.owner@lanternfield.test')
    const token = c.csrf
    c.csrf = undefined
    const res = await c.post(`/api/teams/${t.seed!.teamId}/stars`, { name: 'No CSRF', massMsun: 1, massErrMsun: 0.1 })
    expect(res.status).toBe(403)
    expect(res.body.error.message).toMatch(/CSRF token/)
    c.csrf = 'wrong-' + token
    await c.post('/api/auth/logout').expect(403)
    c.csrf = token
    await c.post(`/api/teams/${t.seed!.teamId}/stars`, { name: 'With CSRF', massMsun: 1, massErrMsun: 0.1 }).expect(201)
    expect(await t.models.Star.count({ where: { name: 'No CSRF' } })).toBe(0)
  })

  it('sends a CSP suited to the built client and hides unexpected errors', async () => {
    const res = await anonymous(t.app).get('/api/health').expect(200)
    expect(res.body.ok).toBe(true)
    expect(res.headers['content-security-policy']).toMatch(/default-src 'self'/)
    expect(res.headers['content-security-policy']).toMatch(/style-src 'self' 'unsafe-inline'/)
    const notFound = await anonymous(t.app).get('/api/no-such-route').expect(404)
    expect(notFound.body.error.code).toBe('not_found')
  })

  it('names the offending field of a bad body', async () => {
    const c = new Client(t.app)
    const res = await c.post('/api/auth/login', { email: 'not-an-email', password: 'x' })
    expect(res.status).toBe(400)
    expect(res.body.error).toMatchObject({ code: 'validation', field: 'email' })
  })
})

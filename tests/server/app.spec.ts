// The test app helper as a browser test uses it: a listening server that serves the built client
// with an SPA fallback, the API beside it, and the local mail (folder + development route).
import { mkdtemp, rm, writeFile, mkdir } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestApp, type TestApp } from '../helpers/app.ts'

let t: TestApp
let dist: string
beforeAll(async () => {
  dist = await mkdtemp(join(tmpdir(), 'starsway-dist-'))
  await mkdir(join(dist, 'assets'))
  await writeFile(join(dist, 'index.html'), '<!doctype html><title>Starsway test shell</title><div id="app"></div>')
  await writeFile(join(dist, 'assets', 'app.js'), 'console.log("client")')
  t = await startTestApp({ listen: true, seed: true, distDir: dist })
})
afterAll(async () => {
  await t?.close()
  await rm(dist, { recursive: true, force: true })
})

describe('listening test app', () => {
  it('serves the client, falls back to index.html for client routes, and keeps /api JSON', async () => {
    expect(t.baseUrl).toMatch(/^http:\/\/127\.0\.0\.1:\d+$/)
    const home = await fetch(`${t.baseUrl}/`)
    expect(await home.text()).toMatch(/Starsway test shell/)
    const deep = await fetch(`${t.baseUrl}/stars/12`)
    expect(deep.status).toBe(200)
    expect(await deep.text()).toMatch(/Starsway test shell/)
    const asset = await fetch(`${t.baseUrl}/assets/app.js`)
    expect(await asset.text()).toBe('console.log("client")')
    const api = await fetch(`${t.baseUrl}/api/nothing-here`)
    expect(api.status).toBe(404)
    expect(await api.json()).toMatchObject({ error: { code: 'not_found' } })
  })

  it('mails links built from its own URL, readable in the folder and on the development routes', async () => {
    const res = await fetch(`${t.baseUrl}/api/auth/reset-request`, {
      method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: 'ines.reviewer@lanternfield.test' }),
    })
    expect(res.status).toBe(202)
    const msg = await t.mail.waitFor((m) => m.to.includes('ines.reviewer@lanternfield.test'))
    expect(msg.text).toContain(`${t.baseUrl}/reset?token=`)
    expect((await fetch(`${t.baseUrl}/api/dev/mail`)).status).toBe(401) // behind sign-in: the page shows reset links
    const signedIn = await fetch(`${t.baseUrl}/api/auth/login`, {
      method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: 'nadia.owner@lanternfield.test', password: 'starsway-demo' }),
    })
    const cookie = signedIn.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ')
    const list = await (await fetch(`${t.baseUrl}/api/dev/mail`, { headers: { cookie } })).json() as Array<{ subject: string; to: string[] }>
    expect(list[0]).toMatchObject({ subject: 'Reset your Starsway password', to: ['ines.reviewer@lanternfield.test'] })
    const page = await (await fetch(`${t.baseUrl}/dev/mail`, { headers: { cookie } })).text()
    expect(page).toMatch(/Reset your Starsway password/)
  })
})

describe('production settings', () => {
  it('hides the development mail routes', async () => {
    const prod = await startTestApp({ config: { devRoutes: false } })
    try {
      const { default: request } = await import('supertest')
      await request(prod.app).get('/api/dev/mail').expect(404)
      await request(prod.app).get('/dev/mail').expect(404)
    } finally {
      await prod.close()
    }
  })
})

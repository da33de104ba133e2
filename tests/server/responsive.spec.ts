// What keeps the API's event loop free under load (issue 11): password hashing in its own thread,
// the JWT key made once, /api/health answered without the session lookup (no database query).
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { performance } from 'node:perf_hooks'
import bcrypt from 'bcryptjs'
import { comparePassword, hashPassword } from '../../server/auth/hasher.ts'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { signIn } from './client.ts'

describe('password hashing thread', () => {
  it('hashes and compares like bcryptjs, with the event loop idle meanwhile', async () => {
    const elu0 = performance.eventLoopUtilization()
    const hash = await hashPassword('correct horse battery', 12) // ~0.3–1 s of bcrypt
    const elu = performance.eventLoopUtilization(elu0)
    // the main thread only waited (a main-thread hash keeps utilisation near 1 whatever the machine load)
    expect(elu.utilization).toBeLessThan(0.5)
    expect(hash).toMatch(/^\$2[aby]\$12\$/)
    expect(bcrypt.compareSync('correct horse battery', hash)).toBe(true)
    expect(await comparePassword('correct horse battery', hash)).toBe(true)
    expect(await comparePassword('wrong', hash)).toBe(false)
    expect(await comparePassword('x', bcrypt.hashSync('x', 4))).toBe(true)
  }, 60_000)

  it('answers many at once in order of arrival', async () => {
    const hashes = await Promise.all(['a1', 'b2', 'c3', 'd4'].map((p) => hashPassword(p, 4)))
    const ok = await Promise.all(hashes.map((h, i) => comparePassword(['a1', 'b2', 'c3', 'd4'][i]!, h)))
    expect(ok).toEqual([true, true, true, true])
  })
})

describe('health', () => {
  let t: TestApp
  beforeAll(async () => { t = await startTestApp({ seed: true }) }, 180_000)
  afterAll(async () => { await t?.close() })

  it('is answered without a database query even with a session cookie, with the usual headers', async () => {
    const c = await signIn(t.app, 'ines.reviewer@lanternfield.test')
    let queries = 0
    t.db.sequelize.addHook('beforeQuery', 'count', () => { queries++ })
    try {
      const res = await c.get('/api/health').expect(200)
      expect(res.body.ok).toBe(true)
      expect(res.headers['cache-control']).toBe('no-store')
      expect(res.headers['content-security-policy']).toMatch(/default-src 'self'/)
      expect(queries).toBe(0)
      await c.get('/api/auth/me').expect(200)
      expect(queries).toBeGreaterThan(0) // the hook does count the session lookup
    } finally { t.db.sequelize.removeHook('beforeQuery', 'count') }
  })
})

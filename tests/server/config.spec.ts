import { describe, expect, it } from 'vitest'
import { loadConfig } from '../../server/config.ts'

describe('config', () => {
  it('has development defaults outside production', () => {
    const c = loadConfig({})
    expect(c).toMatchObject({ env: 'development', port: 3000, host: '127.0.0.1', appUrl: 'http://127.0.0.1:3000', bcryptCost: 10, devRoutes: true })
    expect(c.upload).toEqual({ maxBytes: 20 * 1024 * 1024, maxRows: 200_000, maxFiles: 10 })
    expect(c.jwtSecret.length).toBeGreaterThanOrEqual(16)
  })

  it('requires JWT_SECRET in production and turns the development routes off', () => {
    expect(() => loadConfig({ NODE_ENV: 'production' })).toThrow(/JWT_SECRET must be set in production/)
    const c = loadConfig({ NODE_ENV: 'production', JWT_SECRET: 'a-production-secret-of-some-length', APP_URL: 'https://rv.example.org/' })
    expect(c).toMatchObject({ devRoutes: false, appUrl: 'https://rv.example.org' })
  })

  it('names the variable that is wrong', () => {
    expect(() => loadConfig({ PORT: 'eighty' })).toThrow(/PORT/)
    expect(() => loadConfig({ JWT_SECRET: 'short' })).toThrow(/JWT_SECRET must be at least 16 characters/)
  })
})

// A planets + GP model with a fixed planet parameter and a prior on a planet, through the fit route:
// fitted (no longer refused), the fixed period held with error 0 (the mark of "fixed"), the prior stated
// among the noise model's priors (the methods text's source). Corvin's Lamp: fixtures/demo/README.md
// (one planet, P = 61 d, K = 35 m/s, e = 0.6; 129 velocities from two instruments).
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { signIn, type Client } from './client.ts'
import type { ModelDetail } from '../../shared/api/analyses.ts'

let t: TestApp
let a: Client
let corvin: number

beforeAll(async () => {
  t = await startTestApp({ seed: true })
  a = await signIn(t.app, 'tomas.analyst@lanternfield.test')
  corvin = t.seed!.starIds!["Corvin's Lamp"]!
}, 300_000)
afterAll(async () => { await t?.close() })

describe('planets + GP with fixed planet parameters and planet priors', () => {
  it('fits, holds the fixed period, and states the planet prior', async () => {
    const spec = {
      planets: [{ period: 61, fix: ['period'], priors: [{ param: 'K', gaussian: { mu: 35, sigma: 3 } }] }],
      noise: { kind: 'gp', kernel: 'rotation', period: { value: 30, sigma: 3, source: 'a test value' } },
    }
    const created = await a.post(`/api/stars/${corvin}/models`, { name: 'fixed + prior + GP', spec })
    expect(created.status, JSON.stringify(created.body)).toBe(201)
    const res = await a.post(`/api/models/${created.body.id}/fit`, {})
    expect(res.status, JSON.stringify(res.body).slice(0, 400)).toBe(200)
    const m: ModelDetail = res.body
    expect(m.current.status).toBe('fitted')
    const r = m.current.result!
    expect(r.noise?.kind).toBe('gp')
    const p = r.planets[0]!
    expect(p.period).toBe(61)
    expect(p.uncertainty.period).toBe(0)
    expect(Math.abs(p.K - 35)).toBeLessThan(3 * 3)
    expect(p.uncertainty.K).toBeGreaterThan(0)
    expect(r.noise!.priors.join('; ')).toContain('planet 1 K ~ N(35, 3²) m/s')
    expect(r.noise!.priors.join('; ')).toContain('planet 1 period fixed at 61 d')
  }, 300_000)
})

// The frequent reads stay at a fixed, small number of database round trips per request, whatever
// the number of stars, models or runs (issue 11: under load each round trip costs far more than the
// query itself). Counts queries, never time: independent of what else runs on the machine.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { signIn, type Client } from './client.ts'

let t: TestApp
let analyst: Client
let teamId: number
let starId: number
let queries = 0

beforeAll(async () => {
  t = await startTestApp({ seed: true })
  teamId = t.seed!.teamId!
  starId = Object.values(t.seed!.starIds!)[0]!
  analyst = await signIn(t.app, 'tomas.analyst@lanternfield.test')
  // a periodogram run and two models (one fitted, one not): each list must not grow a query per row
  const pg = await analyst.post(`/api/stars/${starId}/periodograms`, { kind: 'rv' }).expect(201)
  const period = pg.body.result.peaks[0].period as number
  for (const name of ['Fitted', 'Not fitted']) {
    const m = await analyst.post(`/api/stars/${starId}/models`, { name, spec: { planets: [{ period }], trend: 'none' } }).expect(201)
    if (name === 'Fitted') await analyst.post(`/api/models/${m.body.id}/fit`, {}).expect(200)
  }
  t.db.sequelize.addHook('beforeQuery', () => { queries++ })
}, 120_000)
afterAll(async () => { await t?.close() })

async function count(path: string): Promise<{ n: number; body: unknown }> {
  const before = queries
  const res = await analyst.get(path).expect(200)
  return { n: queries - before, body: res.body }
}

describe('database round trips of the frequent reads', () => {
  it('session, access and the list itself: three queries at most (the account: two)', async () => {
    expect((await count('/api/auth/me')).n).toBeLessThanOrEqual(2)
    const stars = await count(`/api/teams/${teamId}/stars`)
    expect((stars.body as unknown[]).length).toBe(Object.keys(t.seed!.starIds!).length)
    expect(stars.n).toBeLessThanOrEqual(3)
    expect((await count(`/api/stars/${starId}`)).n).toBeLessThanOrEqual(3)
    expect((await count(`/api/stars/${starId}/measurements`)).n).toBeLessThanOrEqual(3)
    expect((await count(`/api/stars/${starId}/periodograms`)).n).toBeLessThanOrEqual(3)
    const models = await count(`/api/stars/${starId}/models`)
    expect(models.n).toBeLessThanOrEqual(3)
    // the summary still carries the current version's figures (the BIC from its result)
    const list = models.body as Array<{ name: string; currentVersion: number; status: string; planets: number; bic: number | null; createdBy: { name: string } | null }>
    expect(list.map((m) => m.name)).toEqual(['Not fitted', 'Fitted'])
    expect(list[1]).toMatchObject({ currentVersion: 2, status: 'fitted', planets: 1, createdBy: { name: 'Tomas Analyst' } })
    expect(Number.isFinite(list[1]!.bic)).toBe(true)
    expect(list[0]).toMatchObject({ currentVersion: 1, planets: 1, bic: null })
    expect(list[0]!.status).not.toBe('fitted')
  })

  it('the star list keeps its figures: points, instruments in upload order, last change', async () => {
    const list = (await analyst.get(`/api/teams/${teamId}/stars`).expect(200)).body as Array<{ id: number; name: string; nPoints: number; instruments: string[]; updatedAt: string }>
    expect(list.map((s) => s.name)).toEqual([...list.map((s) => s.name)].sort())
    for (const s of list) {
      const one = (await analyst.get(`/api/stars/${s.id}`).expect(200)).body
      expect(s).toEqual({ id: one.id, name: one.name, massMsun: one.massMsun, massErrMsun: one.massErrMsun, nPoints: one.nPoints, instruments: one.instruments, updatedAt: one.updatedAt })
    }
  })
})

describe('database round trips of the frequent writes', () => {
  it('a periodogram run and a fit keep to a fixed number of queries (no read-back of what was just written)', async () => {
    let before = queries
    await analyst.post(`/api/stars/${starId}/periodograms`, { kind: 'rv' }).expect(201)
    const nPeriodogram = queries - before
    const models = (await analyst.get(`/api/stars/${starId}/models`).expect(200)).body as Array<{ id: number; name: string }>
    const fitted = models.find((m) => m.name === 'Fitted')!
    before = queries
    await analyst.post(`/api/models/${fitted.id}/fit`, {}).expect(200)
    const nFit = queries - before
    // the detail reads only the current version's result; every version still shows its own BIC
    const detail = (await analyst.get(`/api/models/${fitted.id}`).expect(200)).body as { currentVersion: number; current: { version: number; result: { stats: { bic: number } } }; versions: Array<{ version: number; bic: number | null }> }
    expect(detail.versions.length).toBe(detail.currentVersion)
    expect(detail.current.version).toBe(detail.currentVersion)
    for (const v of detail.versions) {
      const one = (await analyst.get(`/api/models/${fitted.id}/versions/${v.version}`).expect(200)).body as { result: { stats: { bic: number } } | null }
      expect(v.bic).toBe(one.result?.stats.bic ?? null)
    }
    expect(detail.versions.at(-1)!.bic).toBe(detail.current.result.stats.bic)
    console.log('queries: periodogram', nPeriodogram, 'fit', nFit)
    expect(nPeriodogram).toBeLessThanOrEqual(9)
    expect(nFit).toBeLessThanOrEqual(13)
  })
})

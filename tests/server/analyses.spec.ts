// Analyses API against a real database: validation, model versioning, the demo stars' signals
// recovered through the API, the comparison table, audit entries, and a free event loop while
// the worker pool computes.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { anonymous, signIn, type Client } from './client.ts'
import type { CompareResponse, FittedPlanet, ModelDetail, PeriodogramRun, SearchResponse } from '../../shared/api/analyses.ts'

// True orbits the demo tables were simulated from: fixtures/demo/README.md (Vela Sorrel).
const VELA_TRUE = [
  { period: 12.4, K: 9, e: 0.1 },
  { period: 187, K: 14, e: 0.25 },
]
// Rotation period of Tarn Meridian's simulated spots: fixtures/demo/README.md.
const TARN_ROTATION = 23

let t: TestApp
let a: Client
let vela: number, tarn: number
let search: SearchResponse
let oneId: number, zeroId: number

beforeAll(async () => {
  t = await startTestApp({ seed: true })
  a = await signIn(t.app, 'tomas.analyst@lanternfield.test')
  vela = t.seed!.starIds!['Vela Sorrel']!
  tarn = t.seed!.starIds!['Tarn Meridian']!
})
afterAll(async () => { await t?.close() })

async function fitted(name: string, spec: object): Promise<ModelDetail> {
  const created = await a.post(`/api/stars/${vela}/models`, { name, spec })
  expect(created.status, JSON.stringify(created.body)).toBe(201)
  const res = await a.post(`/api/models/${created.body.id}/fit`, {})
  expect(res.status, JSON.stringify(res.body)).toBe(200)
  return res.body
}

describe('validation names the field', () => {
  const bad: Array<[string, string, object, string]> = [
    ['post', 'periodograms', {}, 'kind'],
    ['post', 'periodograms', { kind: 'sideways' }, 'kind'],
    ['post', 'periodograms', { kind: 'indicator' }, 'indicator'],
    ['post', 'periodograms', { kind: 'residuals' }, 'modelVersionId'],
    ['post', 'periodograms', { kind: 'rv', minPeriod: -1 }, 'minPeriod'],
    ['post', 'periodograms', { kind: 'rv', minPeriod: 50, maxPeriod: 10 }, 'maxPeriod'],
    ['post', 'periodograms', { kind: 'rv', oversample: 1000 }, 'oversample'],
    ['post', 'periodograms', { kind: 'rv', instruments: ['Nowhere'] }, 'instruments'],
    ['post', 'periodograms', { kind: 'indicator', indicator: 'no_such_index' }, 'indicator'],
    ['post', 'periodograms', { kind: 'residuals', modelVersionId: 999999 }, 'modelVersionId'],
    ['post', 'models', { spec: { planets: [] } }, 'name'],
    ['post', 'models', { name: 'x', spec: { planets: [{ period: -3, K: 1 }] } }, 'spec.planets.0.period'],
    ['post', 'models', { name: 'x', spec: { planets: [{ period: 3, K: 1, e: 1.2 }] } }, 'spec.planets.0.e'],
    ['post', 'models', { name: 'x', spec: { planets: [{ period: 3, K: 1, fix: ['mass'] }] } }, 'spec.planets.0.fix.0'],
    ['post', 'models', { name: 'x', spec: { planets: [], trend: 'cubic' } }, 'spec.trend'],
    ['post', 'models', { name: 'x', spec: { planets: [], instruments: ['Nowhere'] } }, 'spec.instruments'],
    ['post', 'search', { maxPlanets: 9 }, 'maxPlanets'],
    ['post', 'search', { fapThreshold: 2 }, 'fapThreshold'],
    ['post', 'search', { falseAlarm: 0 }, 'falseAlarm'],
    ['post', 'search', { trend: 'wavy' }, 'trend'],
  ]
  for (const [method, what, body, field] of bad) {
    it(`${what} ${JSON.stringify(body)} → 400 ${field}`, async () => {
      const res = await a.call(method, `/api/stars/${vela}/${what}`, body)
      expect(res.status, JSON.stringify(res.body)).toBe(400)
      expect(res.body.error.code).toBe('validation')
      expect(res.body.error.field).toBe(field)
      expect(res.body.error.message).toContain(field)
    })
  }

  it('PATCH without a change, and a residual periodogram of an unfitted version, are refused', async () => {
    const m = (await a.post(`/api/stars/${vela}/models`, { name: 'draft', spec: { planets: [{ period: 187, K: 14 }] } }).expect(201)).body as ModelDetail
    const patch = await a.patch(`/api/models/${m.id}`, {}).expect(400)
    expect(patch.body.error.field).toBe('spec')
    const pg = await a.post(`/api/stars/${vela}/periodograms`, { kind: 'residuals', modelVersionId: m.current.id }).expect(400)
    expect(pg.body.error.field).toBe('modelVersionId')
    expect(pg.body.error.message).toMatch(/fit/)
    // a version of another star's model is not this star's
    const other = await a.post(`/api/stars/${tarn}/periodograms`, { kind: 'residuals', modelVersionId: m.current.id }).expect(400)
    expect(other.body.error.field).toBe('modelVersionId')
  })
})

describe('versions', () => {
  it('PATCH makes version n+1 and leaves version n as it was; a fit makes the next; a rename keeps the result', async () => {
    const created = (await a.post(`/api/stars/${vela}/models`, { name: 'Outer', spec: { planets: [{ period: 190, K: 10 }] } }).expect(201)).body as ModelDetail
    expect(created.currentVersion).toBe(1)
    expect(created.current.status).toBe('draft')
    expect(created.current.result).toBeNull()
    const v1 = (await a.get(`/api/models/${created.id}/versions/1`).expect(200)).body
    const patched = (await a.patch(`/api/models/${created.id}`, { spec: { planets: [{ period: 187, K: 14 }], trend: 'linear' } }).expect(200)).body as ModelDetail
    expect(patched.currentVersion).toBe(2)
    expect(patched.current.spec.trend).toBe('linear')
    expect((await a.get(`/api/models/${created.id}/versions/1`).expect(200)).body).toEqual(v1)
    const fit = (await a.post(`/api/models/${created.id}/fit`, {}).expect(200)).body as ModelDetail
    expect(fit.currentVersion).toBe(3)
    expect(fit.current.status).toBe('fitted')
    expect(fit.current.result!.trend?.kind).toBe('linear')
    expect((await a.get(`/api/models/${created.id}/versions/2`).expect(200)).body.result).toBeNull()
    const renamed = (await a.patch(`/api/models/${created.id}`, { name: 'Outer planet' }).expect(200)).body as ModelDetail
    expect(renamed.currentVersion).toBe(4)
    expect(renamed.name).toBe('Outer planet')
    expect(renamed.current.result).toEqual(fit.current.result)
    expect(renamed.versions.map((v) => [v.version, v.status, v.note])).toEqual([
      [1, 'draft', 'created'], [2, 'draft', 'updated'], [3, 'fitted', 'fitted'], [4, 'fitted', 'renamed'],
    ])
    // the same spec sent back (JSONB reorders keys) is no change: the result stays
    const same = (await a.patch(`/api/models/${created.id}`, { spec: renamed.current.spec }).expect(200)).body as ModelDetail
    expect(same.currentVersion).toBe(5)
    expect(same.current.status).toBe('fitted')
    expect(same.current.result).toEqual(fit.current.result)
    const dup = await a.post(`/api/models/${created.id}/duplicate`, {}).expect(201)
    expect(dup.body.id).not.toBe(created.id)
    expect(dup.body.name).toBe('Outer planet (copy)')
    expect(dup.body.current.result).toEqual(fit.current.result)
    expect(dup.body.current.note).toBe(`duplicated from model ${created.id} version 5`)
    await a.delete(`/api/models/${dup.body.id}`).expect(204)
  })
})

describe('the two-planet demo star (Vela Sorrel)', () => {
  it('the velocity periodogram is stored with its grid, FAP levels, peaks, aliases and window', async () => {
    const res = await a.post(`/api/stars/${vela}/periodograms`, { kind: 'rv' })
    expect(res.status, JSON.stringify(res.body).slice(0, 500)).toBe(201)
    const run = res.body as PeriodogramRun
    expect(run.data.nPoints).toBe(220) // fixtures/demo/README.md: 220 velocities
    expect([...run.data.instruments].sort()).toEqual(['Harrier', 'Kestrel'])
    expect(run.result.curve.period.length).toBeLessThanOrEqual(4000)
    expect(run.result.curve.period.length).toBe(run.result.curve.power.length)
    expect(run.result.window.period.length).toBe(run.result.window.power.length)
    expect(run.result.fapLevels.map((l) => l.fap)).toEqual([0.1, 0.01, 0.001])
    expect(run.result.peaks.length).toBeGreaterThan(2)
    // both planets' periods among the strongest peaks, each far below the 0.1 % level
    for (const p of VELA_TRUE) {
      const pk = run.result.peaks.find((x) => Math.abs(x.period - p.period) / p.period < 0.02)
      expect(pk, `peak near ${p.period} d`).toBeDefined()
      expect(pk!.fap).toBeLessThan(1e-3)
    }
    expect(run.result.peaks.some((p) => p.aliases.length > 0)).toBe(true)
    expect(run.result.windowPeaks.length).toBeGreaterThan(0)
    expect((await a.get(`/api/periodograms/${run.id}`).expect(200)).body).toEqual(run)
    const list = (await a.get(`/api/stars/${vela}/periodograms`).expect(200)).body
    expect(list[0].id).toBe(run.id)
    expect(list[0].result).toBeUndefined()
    expect(list[0].topPeak.period).toBeCloseTo(run.result.peaks[0]!.period, 10)
  })

  it('the search recovers both planets (P, K, e within 4σ of the true orbits) and stores that fit', async () => {
    const res = await a.post(`/api/stars/${vela}/search`, {})
    expect(res.status, JSON.stringify(res.body).slice(0, 500)).toBe(201)
    search = res.body
    expect(search.chosen.planets).toBe(2)
    expect(search.model.name).toBe('Search: 2 planets')
    // the search tries one planet more than it keeps (the BIC rule and warrant checks stop it)
    expect(search.steps.map((s) => s.planets).slice(0, 3)).toEqual([0, 1, 2])
    // its judgement travels with the answer and is stored with the model
    expect(search.report.settings.maxPeriod).toBeGreaterThan(5 * 0.99 * (search.model.current.result!.data.baseline))
    expect(search.report.signals.map((s) => s.planet).sort()).toEqual([0, 1])
    expect(search.model.current.result!.search).toEqual(search.report)
    const stored = (await a.get(`/api/models/${search.model.id}/versions/1`).expect(200)).body
    expect(stored).toEqual(search.model.current)
    const result = stored.result!
    expect(result.stats.converged).toBe(true)
    const planets = [...result.planets].sort((x: FittedPlanet, y: FittedPlanet) => x.period - y.period)
    planets.forEach((p: FittedPlanet, k: number) => {
      const truth = VELA_TRUE[k]!
      for (const q of ['period', 'K', 'e'] as const) {
        const sigma = p.uncertainty[q]!
        expect(sigma, `${q} error`).toBeGreaterThan(0)
        expect(Math.abs(p[q] - truth[q]) / sigma, `planet at ${truth.period} d: ${q} = ${p[q]} ± ${sigma}, true ${truth[q]}`).toBeLessThan(4)
      }
      expect(p.msiniMjup).toBeGreaterThan(0)
      expect(p.msiniMearth! / p.msiniMjup!).toBeCloseTo(317.8, 0) // M♃/M⊕ (IAU 2015 nominal values)
      expect(p.aAu).toBeGreaterThan(0)
      expect(p.insolationEarth).toBeGreaterThan(0) // the seed gives Vela Sorrel a luminosity
    })
    expect(result.residuals.length).toBe(220)
    expect(result.instruments.map((i: { name: string }) => i.name).sort()).toEqual(['Harrier', 'Kestrel'])
  })

  it('the residual periodogram of a one-planet model shows the other planet as its top peak', async () => {
    // only the period, as from a clicked periodogram peak: K, e, ω and the phase come from the data
    const one = await fitted('One planet', { planets: [{ period: 186 }] })
    expect(Math.abs(one.current.result!.planets[0]!.period - 187)).toBeLessThan(2)
    oneId = one.id
    expect(one.current.status).toBe('fitted')
    const res = await a.post(`/api/stars/${vela}/periodograms`, { kind: 'residuals', modelVersionId: one.current.id }).expect(201)
    const top = res.body.result.peaks[0]
    expect(Math.abs(top.period - 12.4)).toBeLessThan(0.05)
    expect(top.fap).toBeLessThan(1e-3)
    expect(res.body.modelVersionId).toBe(one.current.id)
  })

  it('the compare table prefers two planets over one and none, with a plain reading of ΔBIC', async () => {
    zeroId = (await fitted('No planet', { planets: [] })).id
    const res = (await a.get(`/api/stars/${vela}/models/compare`).expect(200)).body as CompareResponse
    expect(res.preferredModelId).toBe(search.model.id)
    const row = (id: number) => res.rows.find((r) => r.modelId === id)!
    expect(row(search.model.id).preferred).toBe(true)
    expect(row(search.model.id).deltaBic).toBe(0)
    for (const id of [oneId, zeroId]) {
      expect(row(id).preferred).toBe(false)
      expect(row(id).comparable).toBe(true)
      expect(row(id).deltaBic!).toBeGreaterThan(10)
      expect(row(id).evidence).toBe('very strong')
      expect(row(id).reading).toMatch(/very strong/)
    }
    expect(row(zeroId).planets).toBe(0)
    expect(row(oneId).jitters.length).toBe(2)
    expect(res.reading).toMatch(/Search: 2 planets/)
    expect(res.rule).toMatch(/Kass & Raftery/)
    // the table is by BIC, ascending
    const bics = res.rows.map((r) => r.bic)
    expect(bics).toEqual([...bics].sort((x, y) => x - y))
  })

  it('writes every change to the audit log', async () => {
    const teamId = t.seed!.teamId!
    const actions = new Set(((await a.get(`/api/teams/${teamId}/audit`).expect(200)).body as Array<{ action: string }>).map((e) => e.action))
    for (const act of ['periodogram.run', 'model.create', 'model.update', 'model.fit', 'model.duplicate', 'model.archive', 'model.search']) {
      expect(actions.has(act), act).toBe(true)
    }
  })
})

describe('data selection, fixed parameters, priors and warnings', () => {
  it('honours instrument choice and exclusions, and the content hash follows the data', async () => {
    const corvin = t.seed!.starIds!["Corvin's Lamp"]!
    const kestrel = (await a.post(`/api/stars/${vela}/periodograms`, { kind: 'rv', instruments: ['Kestrel'], oversample: 3 }).expect(201)).body as PeriodogramRun
    expect(kestrel.data.nPoints).toBe(114) // fixtures/demo/README.md: Kestrel 114
    expect(kestrel.data.instruments).toEqual(['Kestrel'])
    expect(kestrel.settings.instruments).toEqual(['Kestrel'])
    const before = (await a.post(`/api/stars/${corvin}/periodograms`, { kind: 'rv', oversample: 3 }).expect(201)).body as PeriodogramRun
    expect(before.data.nPoints).toBe(129) // fixtures/demo/README.md: 129 velocities
    const again = (await a.post(`/api/stars/${corvin}/periodograms`, { kind: 'rv', oversample: 3 }).expect(201)).body as PeriodogramRun
    expect(again.data.hash).toBe(before.data.hash)
    const m = (await a.get(`/api/stars/${corvin}/measurements`).expect(200)).body[5]
    await a.patch(`/api/measurements/${m.id}`, { excluded: true, reason: 'test: cosmic ray' }).expect(200)
    const after = (await a.post(`/api/stars/${corvin}/periodograms`, { kind: 'rv', oversample: 3 }).expect(201)).body as PeriodogramRun
    expect(after.data.nPoints).toBe(128)
    expect(after.data.nExcluded).toBe(1)
    expect(after.data.hash).not.toBe(before.data.hash)
  })

  it('keeps fixed parameters at their values, applies priors, and warns about a period beyond the baseline', async () => {
    const m = await fitted('Fixed and priors', {
      planets: [
        { period: 187, e: 0, omegaDeg: 90, fix: ['e', 'omegaDeg'] },
        { period: 12.4, priors: [{ param: 'period', gaussian: { mu: 12.4, sigma: 0.001 } }] },
        { period: 3000, K: 1, fix: ['period'] },
      ],
    })
    const [outer, inner, far] = m.current.result!.planets
    expect(outer!.e).toBe(0)
    expect(outer!.uncertainty.e).toBe(0)
    // a prior much tighter than the data's own constraint (± 0.0015 d from the free fit) pulls the period to it
    expect(Math.abs(inner!.period - 12.4)).toBeLessThan(0.002)
    expect(far!.period).toBe(3000)
    const warn = m.current.result!.warnings.find((w) => w.code === 'period_beyond_baseline')
    expect(warn?.planet).toBe(2)
    expect(warn?.message).toMatch(/longer than/)
  })
})

describe('the active demo star (Tarn Meridian)', () => {
  it('an activity indicator\'s periodogram peaks near the rotation period', async () => {
    const res = await a.post(`/api/stars/${tarn}/periodograms`, { kind: 'indicator', indicator: 'bisector_span', maxPeriod: 200 })
    expect(res.status, JSON.stringify(res.body).slice(0, 500)).toBe(201)
    const top = res.body.result.peaks[0]
    expect(Math.abs(top.period - TARN_ROTATION) / TARN_ROTATION, `top peak ${top.period} d`).toBeLessThan(0.1)
    expect(res.body.indicator).toBe('bisector_span')
  })
})

describe('the event loop stays free', () => {
  it('answers /api/health while a long periodogram runs in the worker pool', async () => {
    const anon = anonymous(t.app)
    await anon.get('/api/health').expect(200)
    let done = false
    const started = Date.now()
    // a dense grid (periods from 0.3 d, 100× oversampled: over half a million frequencies) takes seconds
    const pending = a.post(`/api/stars/${vela}/periodograms`, { kind: 'rv', minPeriod: 0.3, oversample: 100 }).then((r) => { done = true; return r })
    const latencies: number[] = []
    while (!done) {
      const t0 = Date.now()
      await anon.get('/api/health').expect(200)
      if (!done) latencies.push(Date.now() - t0)
      await new Promise((r) => setTimeout(r, 20))
    }
    const res = await pending
    const took = Date.now() - started
    expect(res.status, JSON.stringify(res.body).slice(0, 300)).toBe(201)
    expect(res.body.result.grid.count).toBeGreaterThan(500_000)
    expect(took).toBeGreaterThan(500)
    expect(latencies.length).toBeGreaterThanOrEqual(3)
    // a blocked loop would hold a health check for most of the computation
    expect(Math.max(...latencies)).toBeLessThan(took / 2)
  })
})

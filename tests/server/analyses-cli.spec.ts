// One science path: the same file through the command line and through the API (upload →
// periodogram, model fit, search) gives the same periodogram and the same fits, because both call
// the core's periodogramReport / fitSpec / searchPlanets with the same defaults.
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { signIn, type Client } from './client.ts'
import { main } from '../../scripts/cli.ts'
import { synth } from '../shared/rv/orbit-fit-helpers.ts'
import type { ModelDetail, PeriodogramRun, SearchResponse } from '../../shared/api/analyses.ts'

// Published table (attribution in fixtures/published/README.md): 51 Peg, six instruments.
const FILE = fileURLToPath(new URL('../../fixtures/published/51peg-six-instruments.txt', import.meta.url))
const PEG51 = readFileSync(FILE)

function cli(argv: string[]): any {
  const out: string[] = [], err: string[] = []
  const code = main([...argv, '--json'], { out: (s) => out.push(s), err: (s) => err.push(s) })
  expect(code, err.join('\n')).toBe(0)
  return JSON.parse(out.join('\n'))
}

/** Equal to 1e-9 relative (the same code on the same rows; JSON round trips keep doubles exact). */
function same(a: number, b: number, what: string): void {
  expect(Math.abs(a - b), `${what}: CLI ${a} vs API ${b}`).toBeLessThanOrEqual(1e-9 * Math.max(Math.abs(a), Math.abs(b), 1e-12))
}

let t: TestApp
let a: Client
let starId: number

beforeAll(async () => {
  t = await startTestApp({ seed: true })
  a = await signIn(t.app, 'tomas.analyst@lanternfield.test')
  const star = await a.post(`/api/teams/${t.seed!.teamId!}/stars`, { name: '51 Peg (CLI vs API)', massMsun: 1.09, massErrMsun: 0.02 })
  expect(star.status, JSON.stringify(star.body)).toBe(201)
  starId = star.body.id
  const pre = await a.upload(`/api/stars/${starId}/uploads/preview`, [{ name: '51peg.txt', content: PEG51 }])
  expect(pre.status, JSON.stringify(pre.body)).toBe(200)
  const com = await a.upload(`/api/stars/${starId}/uploads/commit`, [{ name: '51peg.txt', content: PEG51 }],
    { mappings: { '51peg.txt': pre.body.files[0].detection.mapping } })
  expect(com.status, JSON.stringify(com.body)).toBe(201)
}, 120_000)
afterAll(async () => { await t?.close() })

describe('51 Peg through the CLI and through the API', () => {
  it('gives the same periodogram: grid, peaks with aliases, false-alarm levels', async () => {
    const res = await a.post(`/api/stars/${starId}/periodograms`, { kind: 'rv' })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const api = res.body as PeriodogramRun
    const doc = cli(['periodogram', FILE])
    expect(doc.input.rows).toBe(api.data.nPoints)
    expect(doc.grid.count).toBe(api.result.grid.count)
    expect(doc.grid.method).toBe(api.result.grid.method)
    same(doc.grid.minFrequency, api.result.grid.minFrequency, 'fmin')
    same(doc.grid.maxFrequency, api.result.grid.maxFrequency, 'fmax')
    same(doc.grid.minPeriod, api.settings.minPeriod, 'minPeriod')
    same(doc.grid.maxPeriod, api.settings.maxPeriod, 'maxPeriod')
    expect(doc.peaks.length).toBe(api.result.peaks.length)
    doc.peaks.forEach((p: any, i: number) => {
      const q = api.result.peaks[i]!
      same(p.period, q.period, `peak ${i} period`)
      same(p.power, q.power, `peak ${i} power`)
      same(p.fap, q.fap, `peak ${i} FAP`)
      expect(p.aliases.map((x: any) => x.source)).toEqual(q.aliases.map((x) => x.source))
    })
    doc.fapLevels.forEach((l: any, i: number) => same(l.power, api.result.fapLevels[i]!.power, `FAP level ${l.fap}`))
    // and the same Keplerian periodogram beside it
    const kp = api.result.keplerian!
    expect(doc.keplerian.count).toBe(kp.count)
    doc.keplerian.peaks.forEach((p: any, i: number) => {
      same(p.period, kp.peaks[i]!.period, `Keplerian peak ${i} period`)
      same(p.dchi2, kp.peaks[i]!.dchi2, `Keplerian peak ${i} Δχ²`)
    })
    // the top peak is 51 Peg b (Birkby et al. 2017: P = 4.2307869 d)
    expect(Math.abs(api.result.peaks[0]!.period - 4.2308)).toBeLessThan(0.002)
  }, 120_000)

  it('gives the same fit of a model given by its period only', async () => {
    const created = await a.post(`/api/stars/${starId}/models`, { name: 'b only', spec: { planets: [{ period: 4.2308 }], trend: 'none' } })
    expect(created.status, JSON.stringify(created.body)).toBe(201)
    const res = await a.post(`/api/models/${created.body.id}/fit`, {})
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    const api = (res.body as ModelDetail).current.result!
    const doc = cli(['fit', FILE, '--planet', 'period=4.2308', '--trend', 'none', '--star-mass', '1.09', '--star-mass-err', '0.02'])
    expect(api.stats.converged).toBe(true)
    same(doc.stats.lnL, api.stats.lnL!, 'lnL')
    same(doc.stats.bic, api.stats.bic!, 'BIC')
    for (const k of ['period', 'K', 'e', 'omegaDeg', 'tp', 'tc'] as const) same(doc.planets[0][k], api.planets[0]![k], `b.${k}`)
    same(doc.planets[0].msiniMjup, api.planets[0]!.msiniMjup!, 'M sin i')
    doc.instruments.forEach((i: any) => {
      const j = api.instruments.find((x) => x.name === i.name)!
      same(i.offset, j.offset!, `${i.name} offset`)
      same(i.jitter, j.jitter!, `${i.name} jitter`)
    })
  }, 120_000)

  it('gives the same search result with the default options (a small seeded table: the search is the slow part)', async () => {
    const star = await a.post(`/api/teams/${t.seed!.teamId!}/stars`, { name: 'Seeded one-planet star', massMsun: 1, massErrMsun: 0.05 })
    expect(star.status, JSON.stringify(star.body)).toBe(201)
    const { data } = synth({ seed: 31, n: 60, baseline: 500, planets: [{ period: 9.7, K: 15, e: 0.1, omega: 1, tp: 2455002 }] })
    const table = ['time,rv,err', ...Array.from(data.t, (x, i) => `${x.toFixed(6)},${data.y[i]!.toFixed(3)},${data.dy[i]!.toFixed(3)}`)].join('\n') + '\n'
    const file = join(mkdtempSync(join(tmpdir(), 'starsway-cli-api-')), 'seeded.csv')
    writeFileSync(file, table)
    const pre = await a.upload(`/api/stars/${star.body.id}/uploads/preview`, [{ name: 'seeded.csv', content: table }])
    expect(pre.status, JSON.stringify(pre.body)).toBe(200)
    const com = await a.upload(`/api/stars/${star.body.id}/uploads/commit`, [{ name: 'seeded.csv', content: table }],
      { mappings: { 'seeded.csv': pre.body.files[0].detection.mapping } })
    expect(com.status, JSON.stringify(com.body)).toBe(201)
    const res = await a.post(`/api/stars/${star.body.id}/search`, {})
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const api = res.body as SearchResponse
    const doc = cli(['fit', file])
    expect(doc.report).toEqual(api.report)
    expect(doc.planets.length).toBe(api.chosen.planets)
    expect(doc.trend?.kind ?? 'none').toBe(api.chosen.trend)
    const fit = api.model.current.result!
    same(doc.stats.lnL, fit.stats.lnL!, 'lnL')
    doc.planets.forEach((p: any, i: number) => same(p.period, fit.planets[i]!.period, `planet ${i} period`))
    expect(Math.abs(doc.planets[0].period - 9.7)).toBeLessThan(0.1)
  }, 300_000)
})

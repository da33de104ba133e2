// Compact periodogram storage (server/analyses/periodogram-store.ts, migration 0012): the binary
// codec, the plot copy served by default with every peak's top, the full curve on demand, the
// per-team bound that drops the oldest full curves, and the migration's conversion both ways.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { QueryTypes } from 'sequelize'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { signIn, type Client } from './client.ts'
import { decodeCurves, encodeCurves, frequencyCurve, gridCurve, periodCurve } from '../../server/analyses/periodogram-codec.ts'
import { createMigrator } from '../../server/db/migrate.ts'
import type { PeriodogramRun } from '../../shared/api/analyses.ts'

describe('codec', () => {
  it('regenerates grid periods and keeps Float32 powers; irregular frequencies keep Float64 periods', () => {
    const f0 = 0.001, df = 1e-5, n = 5000
    const power = Float64Array.from({ length: n }, (_, k) => Math.abs(Math.sin(k / 37)))
    const irregular = Float64Array.from({ length: 300 }, (_, k) => 0.01 + k * 1e-4 + (k % 7) * 1e-7)
    const buf = encodeCurves([
      gridCurve('curve', f0, df, power),
      frequencyCurve('kp', irregular, irregular.map((f) => f * 10)),
      periodCurve('plot', { period: [1.5, 2.25], power: [0.1, 0.9] }),
    ])
    expect(buf.byteLength).toBeLessThan(n * 4 + 300 * 12 + 2 * 8 + 100) // grid: 16 bytes for all periods
    const c = decodeCurves(buf)
    const g = c.get('curve')!
    expect(g.period.length).toBe(n)
    // increasing period = decreasing frequency
    expect(g.period[0]).toBeCloseTo(1 / (f0 + (n - 1) * df), 10)
    expect(g.period[n - 1]).toBeCloseTo(1 / f0, 8)
    for (let i = 0; i < n; i += 97) expect(Math.abs(g.power[i]! - power[n - 1 - i]!)).toBeLessThan(1e-7)
    const k = c.get('kp')!
    expect(k.period[0]).toBe(1 / irregular[299]!)
    expect(c.get('plot')).toEqual({ period: [1.5, 2.25], power: [Math.fround(0.1), Math.fround(0.9)] })
    expect(() => decodeCurves(Buffer.from('not a curve'))).toThrow(/magic/)
  })
})

describe('stored runs', () => {
  let t: TestApp
  let a: Client
  let vela: number
  let first: PeriodogramRun
  const sizes = async (id: number) => (await t.db.sequelize.query<{ display: number; full: number | null; json: number }>(
    `SELECT octet_length(c.display) AS display, octet_length(c."full") AS "full", octet_length(r.result::text) AS json
       FROM periodogram_curves c JOIN periodogram_runs r ON r.id = c.run_id WHERE r.id = :id`,
    { replacements: { id }, type: QueryTypes.SELECT },
  ))[0]!

  beforeAll(async () => {
    // bound: room for about one and a half full curves of Vela Sorrel's default grid
    t = await startTestApp({ seed: true, config: { periodogramTeamBytes: 1 } })
    a = await signIn(t.app, 'tomas.analyst@lanternfield.test')
    vela = t.seed!.starIds!['Vela Sorrel']!
  }, 180_000)
  afterAll(async () => { await t?.close() })

  it('serves the plot copy by default and every computed power with ?full=1; peaks survive the plot copy', async () => {
    t.config.periodogramTeamBytes = 1e9
    const res = await a.post(`/api/stars/${vela}/periodograms`, { kind: 'rv' })
    expect(res.status, JSON.stringify(res.body).slice(0, 300)).toBe(201)
    first = res.body
    const r = first.result
    expect(r.curve.period.length).toBeGreaterThan(100)
    expect(r.curve.period.length).toBeLessThanOrEqual(4000)
    expect(r.window.period.length).toBe(r.curve.period.length)
    expect(r.keplerian!.curve.period.length).toBeGreaterThan(100)
    expect(r.downsampling).toMatch(/full curve stored .*\?full=1/)
    // the run's answer is built without reading it back: it must equal what a read gives
    expect((await a.get(`/api/periodograms/${first.id}`).expect(200)).body).toEqual(first)
    const full = (await a.get(`/api/periodograms/${first.id}?full=1`).expect(200)).body as PeriodogramRun
    expect(full.result.curve.period.length).toBe(r.grid.count)
    expect(full.result.keplerian!.curve.period.length).toBe(r.keplerian!.count)
    expect(full.result.downsampling).toMatch(/^full grid/)
    // every listed peak's top is on both curves (Float32: 1e-6)
    for (const p of r.peaks.slice(0, 5)) {
      for (const c of [r.curve, full.result.curve]) {
        const i = c.period.reduce((b, x, k) => (Math.abs(x - p.period) < Math.abs(c.period[b]! - p.period) ? k : b), 0)
        expect(Math.max(...c.power.slice(Math.max(0, i - 2), i + 3))).toBeGreaterThan(p.power * 0.98) // the listed peak is refined between grid points
      }
    }
    expect(Math.max(...full.result.curve.power)).toBeCloseTo(Math.max(...r.curve.power), 6)
    // the full curve spans the range of the plot copy (whose periods are Float32: 7 digits)
    expect(Math.abs(full.result.curve.period[0]! / r.curve.period[0]! - 1)).toBeLessThan(1e-6)
    expect(Math.abs(full.result.curve.period.at(-1)! / r.curve.period.at(-1)! - 1)).toBeLessThan(1e-6)
    const sz = await sizes(first.id)
    expect(sz.json).toBeLessThan(20_000) // peaks, grid, levels: the curves left the JSON
    expect(sz.full).toBeGreaterThan(r.grid.count * 4)
    expect(sz.display).toBeLessThan(3 * 4000 * 8 + 200) // Float32 periods and powers
    await a.get(`/api/periodograms/${first.id}?full=maybe`).expect(400)
  }, 180_000)

  it('past the team bound drops the oldest full curves (not the newest run) and says so; plot copy and peaks stay', async () => {
    const one = (await sizes(first.id)).full!
    t.config.periodogramTeamBytes = Math.round(one * 1.5)
    const second = (await a.post(`/api/stars/${vela}/periodograms`, { kind: 'rv' }).expect(201)).body as PeriodogramRun
    expect((await sizes(second.id)).full).toBeGreaterThan(0)
    expect((await sizes(first.id)).full).toBeNull()
    const gone = await a.get(`/api/periodograms/${first.id}?full=1`).expect(409)
    expect(gone.body.error.field).toBe('full')
    expect(gone.body.error.message).toMatch(/dropped on .* to keep the team's stored curves under .*run the periodogram again/)
    const kept = (await a.get(`/api/periodograms/${first.id}`).expect(200)).body as PeriodogramRun
    expect(kept.result.curve).toEqual(first.result.curve)
    expect(kept.result.peaks).toEqual(first.result.peaks)
    expect(kept.result.downsampling).toMatch(/full curve dropped on/)
    const audit = await t.models.AuditEntry.findOne({ where: { action: 'periodogram.curves_dropped', entityId: second.id } })
    expect(audit?.detail).toMatchObject({ runIds: [first.id] })
    // a run alone over the bound still keeps its own full curve (the bound never refuses a run)
    t.config.periodogramTeamBytes = 10
    const third = (await a.post(`/api/stars/${vela}/periodograms`, { kind: 'rv', oversample: 3 }).expect(201)).body as PeriodogramRun
    expect((await sizes(third.id)).full).toBeGreaterThan(0)
    expect((await sizes(second.id)).full).toBeNull()
    t.config.periodogramTeamBytes = 1e9
  }, 180_000)

  it('migration 0012 moves existing curves out of the JSON and back (down)', async () => {
    const migrator = createMigrator(t.db.sequelize)
    const before = (await a.get(`/api/periodograms/${first.id}`).expect(200)).body as PeriodogramRun
    await migrator.down({ to: '0012-periodogram-curves' })
    const [old] = await t.db.sequelize.query<{ result: PeriodogramRun['result'] }>('SELECT result FROM periodogram_runs WHERE id = :id', { replacements: { id: first.id }, type: QueryTypes.SELECT })
    expect(old!.result.curve.period.length).toBe(before.result.curve.period.length)
    expect(old!.result.keplerian!.curve.power.length).toBe(before.result.keplerian!.curve.power.length)
    await migrator.up()
    const after = (await a.get(`/api/periodograms/${first.id}`).expect(200)).body as PeriodogramRun
    expect(after.result.curve).toEqual(before.result.curve)
    expect(after.result.window).toEqual(before.result.window)
    expect(after.result.keplerian!.curve).toEqual(before.result.keplerian!.curve)
    expect(after.result.downsampling).toMatch(/full curve not stored/)
    expect((await sizes(first.id)).json).toBeLessThan(20_000)
  }, 180_000)
})

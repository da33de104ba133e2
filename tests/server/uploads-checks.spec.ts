import { readFileSync } from 'node:fs'
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { signIn, type Client } from './client.ts'
import { toBjdTdb } from '../../shared/time/index.ts'

// Duplicates, overlaps, skipped rows, flags, units per column, time systems and archive pairs at
// the HTTP edge (issue 10). Fixtures are hand-written (fixtures/ingest/README.md).
const fx = (p: string) => readFileSync(new URL(`../../fixtures/ingest/${p}`, import.meta.url))

let t: TestApp
let analyst: Client
let teamId: number
beforeAll(async () => {
  t = await startTestApp({ seed: true })
  teamId = t.seed!.teamId!
  analyst = await signIn(t.app, 'tomas.analyst@lanternfield.test')
})
afterAll(async () => { await t?.close() })

let starId: number
let n = 0
beforeEach(async () => {
  const res = await analyst.post(`/api/teams/${teamId}/stars`, { name: `Checks target ${++n}`, massMsun: 1.0, massErrMsun: 0.05 }).expect(201)
  starId = res.body.id
})

type Body = Record<string, unknown>
const preview = (files: Array<{ name: string; content: string | Buffer }>, fields: Body = {}) =>
  analyst.upload(`/api/stars/${starId}/uploads/preview`, files, fields)
const commit = (files: Array<{ name: string; content: string | Buffer }>, mappings: Body, options?: Body) =>
  analyst.upload(`/api/stars/${starId}/uploads/commit`, files, options ? { mappings, options } : { mappings })

/** Preview one file and commit it with the detected mapping (amended). */
async function upload(name: string, content: string | Buffer, amend: Body = {}, options?: Body) {
  const pre = await preview([{ name, content }])
  expect(pre.status, JSON.stringify(pre.body)).toBe(200)
  return commit([{ name, content }], { [name]: { ...pre.body.files[0].mapping, ...amend } }, options)
}
const count = () => t.models.Measurement.count({ where: { starId } })

const TABLE = 'bjd,rv,err,instrument\n2459000.5,1.5,1.0,Kestrel-N\n2459001.5,2.5,1.0,Kestrel-N\n2459002.5,-1.5,1.2,Kestrel-N\n'

describe('the same file twice', () => {
  it('is refused the second time, naming the earlier upload; nothing more stored', async () => {
    expect((await upload('night1.csv', TABLE)).status).toBe(201)
    const pre = await preview([{ name: 'again.csv', content: TABLE }])
    expect(pre.body.files[0].duplicateOf).toMatchObject({ fileName: 'night1.csv', uploadedBy: 'Tomas Analyst' })
    const res = await upload('again.csv', TABLE)
    expect(res.status).toBe(409)
    expect(res.body.error.message).toMatch(/^again\.csv was already uploaded for this star as night1\.csv on \d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC by Tomas Analyst \(dataset \d+\): the same bytes are not stored twice\. Nothing was stored\.$/)
    expect(await count()).toBe(3)
  })

  it('in parallel: one commit wins, the other is refused (per-star lock), rows stored once', async () => {
    const pre = await preview([{ name: 'p.csv', content: TABLE }])
    const mapping = pre.body.files[0].mapping
    const results = await Promise.all([0, 1, 2].map(() => commit([{ name: 'p.csv', content: TABLE }], { 'p.csv': mapping })))
    expect(results.map((r) => r.status).sort()).toEqual([201, 409, 409])
    expect(await count()).toBe(3)
    expect(await t.models.Dataset.count({ where: { starId } })).toBe(1)
  })
})

describe('rows already stored (same time and instrument)', () => {
  const second = 'bjd,rv,err,instrument\n2459002.5,-1.5,1.2,Kestrel-N\n2459003.5,0.5,1.0,Kestrel-N\n2459002.5,7.0,1.0,Kestrel-S\n'
  beforeEach(async () => { expect((await upload('first.csv', TABLE)).status).toBe(201) })

  it('are reported in the preview and refused at commit by default, with the choice named', async () => {
    const pre = await preview([{ name: 'second.csv', content: second }])
    expect(pre.body.files[0].overlap).toEqual({ count: 1, examples: [{ line: 2, time: 2459002.5, instrument: 'Kestrel-N', earlierFile: 'first.csv' }] })
    const res = await upload('second.csv', second)
    expect(res.status).toBe(409)
    expect(res.body.error.message).toBe('Some rows are already stored for this star with the same time and instrument — second.csv: 1 row (first: line 2, Kestrel-N at JD 2459002.5, already stored from first.csv). Choose to skip those rows or to keep both, then save again. Nothing was stored.')
    expect(await count()).toBe(3)
  })

  it('skip: stored without them, the skipped line recorded with its reason', async () => {
    const res = await upload('second.csv', second, {}, { overlap: 'skip' })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.skipped).toEqual([{ fileName: 'second.csv', count: 1 }])
    expect(await count()).toBe(5)
    const ds = await t.models.Dataset.findOne({ where: { starId, fileName: 'second.csv', instrument: 'Kestrel-N' } })
    expect(ds!.skippedRows).toEqual([{ line: 2, message: 'already stored for this star (same time and instrument); skipped as chosen' }])
    expect(ds!.overlap).toMatchObject({ count: 1, choice: 'skip' })
  })

  it('keep: both stored', async () => {
    expect((await upload('second.csv', second, {}, { overlap: 'keep' })).status).toBe(201)
    expect(await count()).toBe(6)
  })
})

describe('skip problem rows', () => {
  const bad = 'bjd,rv,err\n2459000.5,1.5,1.0\n2459001.5,abc,1.0\n2459002.5,1e308,1.0\n2459003.5,2.5,1.0\n2459004.5,2.0,1.1\n'
  it('refused by default, naming the first row and the way out', async () => {
    const res = await upload('bad.csv', bad)
    expect(res.status).toBe(400)
    expect(res.body.error.message).toBe("bad.csv: line 3, column rv: velocity 'abc' is not a number (and 1 more problem). Fix the table or the mapping, or save with \"skip problem rows\"; nothing was stored.")
  })
  it('stores the good rows and records every skipped row with its reason', async () => {
    const res = await upload('bad.csv', bad, {}, { skipProblemRows: true })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.skipped).toEqual([{ fileName: 'bad.csv', count: 2 }])
    const ds = await t.models.Dataset.findOne({ where: { starId } })
    expect(ds!.skippedRows).toEqual([
      { line: 3, column: 'rv', message: "velocity 'abc' is not a number" },
      { line: 4, message: 'velocity 1.000e+308 m/s is beyond ±1000 km/s: check the velocity unit, or skip this row' },
    ])
    expect(await count()).toBe(3)
  })
})

describe('flags, units, instruments', () => {
  it('a quality column stores its rows excluded with the reason, one instrument named after the file', async () => {
    const res = await upload('quality-flag.csv', fx('traps/quality-flag.csv'))
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.datasets).toEqual([expect.objectContaining({ instrument: 'quality-flag', count: 12, excluded: 2 })])
    const ms = (await analyst.get(`/api/stars/${starId}/measurements`).expect(200)).body as Array<{ excluded: boolean; excludedReason: string | null; excludedBy: { name: string } | null }>
    expect(ms.filter((m) => m.excluded).map((m) => [m.excludedReason, m.excludedBy?.name])).toEqual([['quality: cloudy', 'Tomas Analyst'], ['quality: cloudy', 'Tomas Analyst']])
  })

  it('RV[km/s] eRV[m/s]: errors stored as written in m/s, velocities ×1000', async () => {
    expect((await upload('units.txt', fx('traps/rv-kms-erv-ms.txt'))).status).toBe(201)
    const ms = (await analyst.get(`/api/stars/${starId}/measurements`).expect(200)).body as Array<{ time: number; rv: number; error: number }>
    expect(ms.find((m) => m.time === 2459316.19784)).toMatchObject({ rv: -12348.44, error: 2.43 })
    const ds = await t.models.Dataset.findOne({ where: { starId, instrument: 'Kestrel-S' } })
    expect(ds!.units).toEqual({ rv: 'km/s', error: 'm/s', indicators: {} })
  })

  it('two files without an instrument column become two instruments; absolute next to relative under one name is warned about', async () => {
    expect((await upload('night-a.csv', 'bjd,rv,err\n2459000.5,1.5,1.0\n2459001.5,2.5,1.0\n')).status).toBe(201)
    expect((await upload('night-b.csv', 'bjd,rv,err\n2459010.5,1.5,1.0\n2459011.5,2.5,1.0\n')).status).toBe(201)
    const list = (await analyst.get(`/api/stars/${starId}/datasets`).expect(200)).body as Array<{ instrument: string }>
    expect(list.map((d) => d.instrument)).toEqual(['night-a', 'night-b'])
    const abs = 'bjd,rv,err\n2459020.5,-33012.5,1.0\n2459021.5,-33015.5,1.0\n'
    const pre = await preview([{ name: 'abs.csv', content: abs }], { hints: { 'abs.csv': { instrumentName: 'night-a' } } })
    expect(pre.body.files[0].notices).toContain("Instrument 'night-a': abs.csv has velocities near -33.014 km/s and the data already stored near 0.002 km/s — absolute (-33.014 km/s) next to relative (0.002 km/s) under one name would share one zero point. Give abs.csv its own instrument name unless they really are one series.")
  })
})

describe('time systems', () => {
  it('BJD_TDB-2457000: the dataset JSON carries scale and zero point', async () => {
    expect((await upload('tess.csv', fx('traps/bjd-tdb-2457000.csv'))).status).toBe(201)
    const list = (await analyst.get(`/api/stars/${starId}/datasets`).expect(200)).body as Array<Body>
    expect(list[0]).toMatchObject({ timeFormat: 'jd-2457000', timeScale: 'bjd_tdb', timeOffset: 2457000, timeConversion: null, skippedRows: 0 })
    const ms = (await analyst.get(`/api/stars/${starId}/measurements`).expect(200)).body as Array<{ time: number }>
    expect(ms.map((m) => m.time)).toContain(2459316.19784)
  })

  it('an open question (MJD or JD − 2400000) refuses the commit with the question', async () => {
    const res = await upload('reduced.txt', fx('traps/reduced-58000-no-header.txt'))
    expect(res.status).toBe(400)
    expect(res.body.error.message).toBe('reduced.txt: Times near 59346: are they MJD (JD − 2400000.5) or JD − 2400000? They differ by half a day and the header does not say. Choose one of: JD − 2400000; modified Julian days (JD − 2400000.5).')
    const answered = await upload('reduced.txt', fx('traps/reduced-58000-no-header.txt'), { timeFormat: 'mjd', questions: [] })
    expect(answered.status).toBe(201)
  })

  it('JD_UTC is converted to BJD_TDB with the star coordinates and the observatory; refused without them, saying what to do', async () => {
    const text = '# times at the observatory\nJD_UTC,rv,err\n2459000.5,1.5,1.0\n2459100.5,2.5,1.0\n2459200.5,-1.5,1.2\n'
    let res = await upload('utc.csv', text)
    expect(res.status).toBe(400)
    expect(res.body.error.message).toBe("utc.csv: the times are JD_UTC; converting them to BJD_TDB needs the star's coordinates. Enter the star's RA and Dec (and proper motion) on its page, then upload again.")
    await t.models.Star.update({ raDeg: 150.25, decDeg: -32.5 }, { where: { id: starId } })
    res = await upload('utc.csv', text)
    expect(res.body.error.message).toBe('utc.csv: the times are JD_UTC; converting them to BJD_TDB needs the observatory. Choose the site in the upload form (or set the star\'s default observatory), then save again.')
    const site = { name: 'Test site', lonDeg: -70.73, latDeg: -29.26, heightM: 2400 }
    res = await upload('utc.csv', text, {}, { site })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const expected = toBjdTdb(Float64Array.from([2459000.5, 2459100.5, 2459200.5]), 'utc', { raDeg: 150.25, decDeg: -32.5 }, site)
    const ms = (await analyst.get(`/api/stars/${starId}/measurements`).expect(200)).body as Array<{ time: number; timeScale: string }>
    expect(ms.map((m) => m.time)).toEqual(Array.from(expected))
    expect(ms[0]!.timeScale).toBe('bjd_tdb')
    const ds = await t.models.Dataset.findOne({ where: { starId } })
    expect(ds!.timeScale).toBe('bjd_tdb')
    expect(ds!.timeConversion).toMatchObject({ from: 'jd_utc', site: { lonDeg: -70.73, latDeg: -29.26, heightM: 2400 } })
  })
})

describe('archive pairs and the user\'s mapping', () => {
  it('a CDS ReadMe sent with its .dat: the table is read at the ReadMe\'s byte positions; both raw files kept', async () => {
    const files = [{ name: 'ReadMe', content: fx('formats/cds/ReadMe') }, { name: 'rv.dat', content: fx('formats/cds/rv.dat') }]
    const pre = await preview(files)
    expect(pre.status, JSON.stringify(pre.body)).toBe(200)
    expect(pre.body.descriptions).toEqual(['ReadMe'])
    expect(pre.body.files.map((f: { fileName: string }) => f.fileName)).toEqual(['rv.dat'])
    expect(pre.body.files[0].detection.format).toBe('cds')
    expect(pre.body.files[0].rows[0]).toMatchObject({ time: 2459316.19784, rv: -12348.44, error: 2.43 })
    const raw = await t.models.RawFile.count()
    const res = await commit(files, { 'rv.dat': pre.body.files[0].mapping })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(await t.models.RawFile.count()).toBe(raw + 2)
  })

  it('preview reads with the user\'s mapping as sent (no detect round trip)', async () => {
    const pre = await preview([{ name: 'a.csv', content: TABLE }])
    const mapping = { ...pre.body.files[0].mapping, unit: 'km/s', instrument: 'X' }
    const again = await preview([{ name: 'a.csv', content: TABLE }], { mappings: { 'a.csv': mapping } })
    expect(again.body.files[0].mapping).toEqual(mapping)
    expect(again.body.files[0].rows[0]).toMatchObject({ rv: 1500, error: 1000 })
  })

  it('spreadsheets and LaTeX are refused by name with the fix', async () => {
    const res = await preview([{ name: 'rv.xlsx', content: 'bjd,rv,err\n1,2,3\n' }])
    expect(res.status).toBe(400)
    expect(res.body.error.message).toBe('rv.xlsx: rv.xlsx is an Excel workbook. Save the sheet as CSV (File → Save as / Download → .csv) and upload that file.')
  })
})

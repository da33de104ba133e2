import { readFileSync } from 'node:fs'
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { signIn, type Client } from './client.ts'

// Published tables (attribution in fixtures/published/README.md).
const PEG51 = readFileSync(new URL('../../fixtures/published/51peg-six-instruments.txt', import.meta.url))
const HD20868 = readFileSync(new URL('../../fixtures/published/hd20868-harps.txt', import.meta.url))

const MAX_BYTES = 64 * 1024
const MAX_ROWS = 1000

let t: TestApp
let analyst: Client
let reviewer: Client
let teamId: number

beforeAll(async () => {
  t = await startTestApp({ seed: true, config: { upload: { maxBytes: MAX_BYTES, maxRows: MAX_ROWS, maxFiles: 10 } } })
  teamId = t.seed!.teamId!
  analyst = await signIn(t.app, 'tomas.analyst@lanternfield.test')
  reviewer = await signIn(t.app, 'ines.reviewer@lanternfield.test')
})
afterAll(async () => { await t?.close() })

let starId: number
let n = 0
beforeEach(async () => {
  const res = await analyst.post(`/api/teams/${teamId}/stars`, { name: `Upload target ${++n}`, massMsun: 1.1, massErrMsun: 0.05 }).expect(201)
  starId = res.body.id
})

async function stored(): Promise<{ raw: number; datasets: number; measurements: number }> {
  return { raw: await t.models.RawFile.count(), datasets: await t.models.Dataset.count(), measurements: await t.models.Measurement.count() }
}

async function preview(name: string, content: string | Buffer, hints?: object) {
  return analyst.upload(`/api/stars/${starId}/uploads/preview`, [{ name, content }], hints ? { hints: { [name]: hints } } : {})
}

/** Previews to get the detected mapping (optionally amended), then commits with it. */
async function previewAndCommit(name: string, content: string | Buffer, amend: object = {}) {
  const pre = await preview(name, content)
  expect(pre.status, JSON.stringify(pre.body)).toBe(200)
  const mapping = { ...pre.body.files[0].detection.mapping, ...amend }
  return analyst.upload(`/api/stars/${starId}/uploads/commit`, [{ name, content }], { mappings: { [name]: mapping } })
}

describe('upload happy paths with the published tables', () => {
  it('51 Peg: 639 rows in 6 instruments, one dataset per instrument, raw file kept once', async () => {
    const start = await stored()
    const delta = async () => { const now = await stored(); return { raw: now.raw - start.raw, datasets: now.datasets - start.datasets, measurements: now.measurements - start.measurements } }
    const pre = await preview('51peg.txt', PEG51)
    expect(pre.status).toBe(200)
    const f = pre.body.files[0]
    expect(f.rowCount).toBe(639)
    expect(f.problemCount).toBe(0)
    expect(f.rows).toHaveLength(50)
    expect(f.mappingError).toBeNull()
    // counts per set from the dataset's README (Birkby et al. 2017, Table 1)
    const counts = Object.fromEntries(f.instruments.map((i: { name: string; count: number }) => [i.name, i.count]))
    expect(counts).toEqual({ ELODIE: 153, HARPS: 91, HIRES: 41, Lick6: 45, Lick8: 129, Lick13: 180 })
    expect(await delta()).toEqual({ raw: 0, datasets: 0, measurements: 0 }) // a preview stores nothing

    const com = await analyst.upload(`/api/stars/${starId}/uploads/commit`, [{ name: '51peg.txt', content: PEG51 }],
      { mappings: { '51peg.txt': f.detection.mapping } })
    expect(com.status, JSON.stringify(com.body)).toBe(201)
    expect(com.body.measurementsCreated).toBe(639)
    expect(com.body.datasets).toHaveLength(6)
    expect(await delta()).toEqual({ raw: 1, datasets: 6, measurements: 639 })

    const datasets = await analyst.get(`/api/stars/${starId}/datasets`).expect(200)
    expect(Object.fromEntries(datasets.body.map((d: { instrument: string; count: number }) => [d.instrument, d.count])))
      .toEqual({ ELODIE: 153, HARPS: 91, HIRES: 41, Lick6: 45, Lick8: 129, Lick13: 180 })
    expect(datasets.body[0].uploadedBy.name).toBe('Tomas Analyst')
    const raw = await reviewer.get(`/api/datasets/${datasets.body[0].id}/raw`).buffer(true).expect(200)
    expect(Buffer.compare(raw.body as Buffer, PEG51)).toBe(0)
    expect(raw.headers['content-disposition']).toMatch(/attachment; filename="?51peg\.txt"?/)

    const star = await reviewer.get(`/api/stars/${starId}`).expect(200)
    expect(star.body.nPoints).toBe(639)
    expect(star.body.instruments.sort()).toEqual(['ELODIE', 'HARPS', 'HIRES', 'Lick13', 'Lick6', 'Lick8'])
    const ms = await reviewer.get(`/api/stars/${starId}/measurements`).expect(200)
    expect(ms.body).toHaveLength(639)
    // first line of the file: 2449610.53275500 -33258.0 9.0 ELODIE
    expect(ms.body[0]).toMatchObject({ time: 2449610.532755, rv: -33258, error: 9, instrument: 'ELODIE', excluded: false })
  })

  it('HD 20868: km/s detected from the header and stored in m/s', async () => {
    const pre = await preview('hd20868.txt', HD20868)
    const f = pre.body.files[0]
    expect(f.detection.mapping.unit).toBe('km/s')
    expect(f.detection.headerFromComment).toBe(true)
    expect(f.rowCount).toBe(48)
    const com = await analyst.upload(`/api/stars/${starId}/uploads/commit`, [{ name: 'hd20868.txt', content: HD20868 }],
      { mappings: { 'hd20868.txt': { ...f.detection.mapping, instrument: 'HARPS' } } })
    expect(com.status, JSON.stringify(com.body)).toBe(201)
    expect(com.body.datasets).toEqual([expect.objectContaining({ instrument: 'HARPS', count: 48 })])
    const ms = await analyst.get(`/api/stars/${starId}/measurements`).expect(200)
    // first data line of the file (Moutou et al. 2009, Table 4): 2452944.759761 46.30911 0.00255 (km/s)
    const first = ms.body.find((m: { time: number }) => m.time === 2452944.759761)
    expect(first.rv).toBeCloseTo(46309.11, 6)
    expect(first.error).toBeCloseTo(2.55, 9)
    const ds = await t.models.Dataset.findOne({ where: { starId } })
    expect(ds!.unit).toBe('km/s')
    // the commit reads with the confirmed mapping only (no re-detection), and records the units per column
    expect(ds!.confirmedMapping).toMatchObject({ unit: 'km/s' })
    expect(ds!.units).toEqual({ rv: 'km/s', error: 'km/s', indicators: {} })
  })

  it('several files at once go in one transaction', async () => {
    const a = 'time,rv,err\n2459000.5,1.5,1.0\n2459001.5,2.5,1.0\n'
    const b = 'time,rv,err\n2459002.5,3.5,1.0\n'
    const pre = await analyst.upload(`/api/stars/${starId}/uploads/preview`, [{ name: 'a.csv', content: a }, { name: 'b.csv', content: b }],
      { hints: { 'a.csv': { instrumentName: 'Alpha', unit: 'm/s' }, 'b.csv': { instrumentName: 'Beta', unit: 'm/s' } } }).expect(200)
    const mappings = Object.fromEntries(pre.body.files.map((f: { fileName: string; detection: { mapping: unknown } }) => [f.fileName, f.detection.mapping]))
    const com = await analyst.upload(`/api/stars/${starId}/uploads/commit`, [{ name: 'a.csv', content: a }, { name: 'b.csv', content: b }], { mappings })
    expect(com.status, JSON.stringify(com.body)).toBe(201)
    expect(com.body.datasets.map((d: { instrument: string; count: number }) => `${d.instrument}:${d.count}`)).toEqual(['Alpha:2', 'Beta:1'])
  })

  it('splits one instrument at a date the user gives (an upgrade): one dataset per set-up', async () => {
    const text = 'time,rv,err\n2459000.5,1.5,1.0\n2459001.5,2.5,1.0\n2459100.5,3.5,1.0\n'
    const res = await previewAndCommit('upgrade.csv', text, { unit: 'm/s', instrument: 'Osprey-2', splitDates: [{ before: 2459050, instrument: 'Osprey-1' }] })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.datasets.map((d: { instrument: string; count: number }) => `${d.instrument}:${d.count}`)).toEqual(['Osprey-1:2', 'Osprey-2:1'])
  })

  it('records the upload in the audit log', async () => {
    await previewAndCommit('small.csv', 'time,rv,err\n2459000.5,1.5,1.0\n', { unit: 'm/s' })
    const audit = await reviewer.get(`/api/teams/${teamId}/audit`).expect(200)
    const entry = audit.body.find((e: { action: string; entityId: number }) => e.action === 'upload.commit' && e.entityId === starId)
    expect(entry.user.name).toBe('Tomas Analyst')
    expect(entry.detail).toMatchObject({ fileName: 'small.csv', datasets: [expect.objectContaining({ count: 1 })] })
  })

  it('a reviewer\'s upload is refused with 403', async () => {
    const res = await reviewer.upload(`/api/stars/${starId}/uploads/preview`, [{ name: 'x.csv', content: 'time,rv,err\n1,2,3\n' }])
    expect(res.status).toBe(403)
    expect(res.body.error.code).toBe('forbidden')
  })
})

describe('bad input: a 4xx saying what to fix, and nothing stored', () => {
  const good = (i: number) => `${2459000.5 + i},${(i % 7) - 3}.25,1.${i % 9}`

  async function expectRefused(res: { status: number; body: { error: { message: string } } }, status: number, message: RegExp) {
    expect(res.status, JSON.stringify(res.body)).toBe(status)
    expect(res.body.error.message).toMatch(message)
    expect(await stored()).toEqual(before)
  }
  let before: { raw: number; datasets: number; measurements: number }
  beforeEach(async () => { before = await stored() })

  it('empty file', async () => {
    await expectRefused(await preview('empty.csv', ''), 400, /^empty\.csv: The file is empty/)
    const res = await analyst.upload(`/api/stars/${starId}/uploads/commit`, [{ name: 'empty.csv', content: '' }],
      { mappings: { 'empty.csv': { delimiter: ',', hasHeader: false, columns: [], unit: 'm/s', timeFormat: 'jd' } } })
    await expectRefused(res, 400, /empty\.csv: The file is empty/)
  })

  it('binary file', async () => {
    const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52, 0, 1, 2, 3])
    await expectRefused(await preview('plot.png', png), 400, /plot\.png: .*binary file/)
    const zip = Buffer.from([0x50, 0x4b, 0x03, 0x04, 1, 2, 3, 4, 5, 6, 7, 8])
    await expectRefused(await preview('sheet.xlsx', zip), 400, /sheet\.xlsx: This is not a text table: .*spreadsheet/)
  })

  it('no numeric columns', async () => {
    await expectRefused(await preview('words.csv', 'name,comment\nalpha,bright\nbeta,faint\n'), 400, /^words\.csv: .*numeric/i)
  })

  it('missing error column: refused unless one error is given for all rows', async () => {
    const text = 'time,rv\n2459000.5,10.5\n2459001.5,12.5\n'
    const pre = await preview('noerr.csv', text)
    expect(pre.status).toBe(200)
    expect(pre.body.files[0].mappingError).toMatchObject({ code: 'missing_error' })
    const mapping = { ...pre.body.files[0].detection.mapping, unit: 'm/s' }
    const res = await analyst.upload(`/api/stars/${starId}/uploads/commit`, [{ name: 'noerr.csv', content: text }], { mappings: { 'noerr.csv': mapping } })
    await expectRefused(res, 400, /^noerr\.csv: The table has no error column/)
    const ok = await analyst.upload(`/api/stars/${starId}/uploads/commit`, [{ name: 'noerr.csv', content: text }],
      { mappings: { 'noerr.csv': { ...mapping, defaultError: 2 } } })
    expect(ok.status, JSON.stringify(ok.body)).toBe(201)
    expect((await t.models.Measurement.findAll({ where: { starId } })).map((m) => m.error)).toEqual([2, 2])
  })

  it('NaN or text in a numeric cell, with the line number', async () => {
    const text = `time,rv,err\n${good(1)}\n${good(2)}\n2459010.5,NaN,1.0\n2459011.5,fast,1.0\n`
    const res = await previewAndCommit('nan.csv', text, { unit: 'm/s' })
    await expectRefused(res, 400, /^nan\.csv: line 4, column rv: velocity 'NaN' is not a number \(and 1 more problem\)/)
    const body = res.body as unknown as { error: { details: { problems: Array<{ line: number }> } } }
    expect(body.error.details.problems.map((p) => p.line)).toEqual([4, 5])
  })

  it('negative or zero errors', async () => {
    const res = await previewAndCommit('err.csv', `time,rv,err\n${good(1)}\n2459010.5,1.5,0\n2459011.5,1.5,-2\n`, { unit: 'm/s' })
    await expectRefused(res, 400, /^err\.csv: line 3, column err: error must be positive \(found 0\)/)
  })

  it('duplicate rows', async () => {
    const res = await previewAndCommit('dup.csv', `time,rv,err\n${good(1)}\n${good(2)}\n${good(1)}\n`, { unit: 'm/s' })
    await expectRefused(res, 400, /^dup\.csv: line 4: duplicate of line 2/)
  })

  it('a problem in one of several files stores none of them', async () => {
    const a = `time,rv,err\n${good(1)}\n`
    const b = `time,rv,err\n${good(2)}\n2459010.5,1.5,0\n`
    const m = { delimiter: ',', hasHeader: true, unit: 'm/s', timeFormat: 'jd',
      columns: [{ index: 0, name: 'time', role: 'time' }, { index: 1, name: 'rv', role: 'rv' }, { index: 2, name: 'err', role: 'error' }] }
    const res = await analyst.upload(`/api/stars/${starId}/uploads/commit`, [{ name: 'a.csv', content: a }, { name: 'b.csv', content: b }],
      { mappings: { 'a.csv': m, 'b.csv': m } })
    await expectRefused(res, 400, /^b\.csv: line 3/)
  })

  it('a file over the size limit', async () => {
    const lines = ['time,rv,err']
    for (let i = 0; lines.join('\n').length <= MAX_BYTES; i++) lines.push(good(i))
    const res = await preview('big.csv', lines.join('\n'))
    await expectRefused(res, 413, /larger than the 0\.063 MB limit/)
    expect(res.body.error.code).toBe('too_large')
  })

  it('a file over the row limit', async () => {
    const lines = ['time,rv,err']
    for (let i = 0; i <= MAX_ROWS; i++) lines.push(good(i))
    const text = lines.join('\n')
    expect(text.length).toBeLessThan(MAX_BYTES)
    await expectRefused(await preview('rows.csv', text), 413, /^rows\.csv: the table has 1001 data rows; the limit is 1000/)
    const m = { delimiter: ',', hasHeader: true, unit: 'm/s', timeFormat: 'jd',
      columns: [{ index: 0, name: 'time', role: 'time' }, { index: 1, name: 'rv', role: 'rv' }, { index: 2, name: 'err', role: 'error' }] }
    const res = await analyst.upload(`/api/stars/${starId}/uploads/commit`, [{ name: 'rows.csv', content: text }], { mappings: { 'rows.csv': m } })
    await expectRefused(res, 413, /rows\.csv: the table has 1001 data rows/)
  })

  it('more than 10 files at once', async () => {
    const files = Array.from({ length: 11 }, (_, i) => ({ name: `f${i}.csv`, content: `time,rv,err\n${good(i)}\n` }))
    const res = await analyst.upload(`/api/stars/${starId}/uploads/preview`, files)
    await expectRefused(res, 413, /at most 10/)
  })

  it('a commit without a mapping, or with a malformed one', async () => {
    const text = `time,rv,err\n${good(1)}\n`
    const none = await analyst.upload(`/api/stars/${starId}/uploads/commit`, [{ name: 'x.csv', content: text }])
    await expectRefused(none, 400, /"mappings" is required/)
    const bad = await analyst.upload(`/api/stars/${starId}/uploads/commit`, [{ name: 'x.csv', content: text }], { mappings: { 'x.csv': { delimiter: '|' } } })
    await expectRefused(bad, 400, /^mappings\.x\.csv\.delimiter: /)
    expect(bad.body.error.field).toBe('mappings.x.csv.delimiter')
    const other = await analyst.upload(`/api/stars/${starId}/uploads/commit`, [{ name: 'x.csv', content: text }], { mappings: {} })
    await expectRefused(other, 400, /x\.csv: no confirmed mapping/)
    const nofile = await analyst.upload(`/api/stars/${starId}/uploads/preview`, [])
    await expectRefused(nofile, 400, /No file received/)
  })
})

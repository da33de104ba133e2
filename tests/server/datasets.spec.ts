// Deleting a mistaken dataset (issue 10 item 7): only when nothing uses it, audited, raw file kept.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { signIn, type Client } from './client.ts'

let t: TestApp
let analyst: Client, reviewer: Client
let teamId: number, starId: number

/** A table of `n` points of one instrument: a 12-day sine of 20 m/s, times starting at `t0`. */
function table(instrument: string, t0: number, n: number): string {
  const rows = Array.from({ length: n }, (_, i) => {
    const time = t0 + i * 1.37
    return `${time.toFixed(5)},${(20 * Math.sin((2 * Math.PI * time) / 12)).toFixed(3)},1.5,${instrument}`
  })
  return `bjd,rv,rv_err,instrument\n${rows.join('\n')}\n`
}

async function upload(name: string, content: string): Promise<number> {
  const pre = await analyst.upload(`/api/stars/${starId}/uploads/preview`, [{ name, content }]).expect(200)
  const com = await analyst.upload(`/api/stars/${starId}/uploads/commit`, [{ name, content }], { mappings: { [name]: pre.body.files[0].detection.mapping } }).expect(201)
  return com.body.datasets[0].id
}

beforeAll(async () => {
  t = await startTestApp({ seed: true })
  teamId = t.seed!.teamId!
  analyst = await signIn(t.app, 'tomas.analyst@lanternfield.test')
  reviewer = await signIn(t.app, 'ines.reviewer@lanternfield.test')
  starId = (await analyst.post(`/api/teams/${teamId}/stars`, { name: 'Deletion probe', massMsun: 1, massErrMsun: 0.05 }).expect(201)).body.id
})
afterAll(async () => { await t?.close() })

describe('deleting a dataset', () => {
  it('deletes an unused dataset and its measurements, keeps the raw file, and audits what went', async () => {
    const id = await upload('mistake.csv', table('Wrongscope', 2459100.5, 6))
    const ds = await t.models.Dataset.findByPk(id)
    const usage = await reviewer.get(`/api/datasets/${id}/usage`).expect(200)
    expect(usage.body).toMatchObject({ datasetId: id, nMeasurements: 6, modelVersions: 0, samplingRuns: 0, reportVersions: 0, deletable: true, reason: null })

    await reviewer.call('delete', `/api/datasets/${id}`, {}).expect(403)
    await analyst.delete(`/api/datasets/${id}`).send({ reason: 'uploaded to the wrong star' }).expect(204)

    expect(await t.models.Dataset.findByPk(id)).toBeNull()
    expect(await t.models.Measurement.count({ where: { datasetId: id } })).toBe(0)
    expect(await t.models.RawFile.findByPk(ds!.rawFileId)).not.toBeNull()
    const audit = await reviewer.get(`/api/teams/${teamId}/audit`).expect(200)
    const entry = audit.body.find((e: { action: string; entityId: number }) => e.action === 'dataset.delete' && e.entityId === id)
    expect(entry.detail).toMatchObject({ starId, instrument: 'Wrongscope', fileName: 'mistake.csv', measurements: 6, rawFileId: ds!.rawFileId, reason: 'uploaded to the wrong star' })
    expect(entry.detail.firstTime).toBeCloseTo(2459100.5, 6)
    await analyst.call('delete', `/api/datasets/${id}`, {}).expect(404)
  })

  it('refuses (409) a dataset whose points a fitted model uses, saying what uses it; nothing is removed', async () => {
    const used = await upload('good.csv', table('Goodscope', 2459200.5, 24))
    const model = await analyst.post(`/api/stars/${starId}/models`, { name: 'one planet', spec: { planets: [{ period: 12, K: 20 }] } }).expect(201)
    await analyst.post(`/api/models/${model.body.id}/fit`, {}).expect(200)
    const later = await upload('later.csv', table('Laterscope', 2459300.5, 5))

    const usage = await reviewer.get(`/api/datasets/${used}/usage`).expect(200)
    expect(usage.body).toMatchObject({ deletable: false, modelVersions: 1, nMeasurements: 24 })
    expect(usage.body.reason).toMatch(/1 fitted model version.*exclude the points instead/)
    const res = await analyst.call('delete', `/api/datasets/${used}`, {}).expect(409)
    expect(res.body.error.message).toMatch(/cannot be deleted.*fitted model/)
    expect(await t.models.Measurement.count({ where: { datasetId: used } })).toBe(24)

    // a dataset added after the fit is not used by it
    expect((await reviewer.get(`/api/datasets/${later}/usage`).expect(200)).body.deletable).toBe(true)
    await analyst.call('delete', `/api/datasets/${later}`, {}).expect(204)
  })

  it('validates the reason and hides other teams\' datasets', async () => {
    const id = await upload('reason.csv', table('Reasonscope', 2459400.5, 4))
    const long = await analyst.delete(`/api/datasets/${id}`).send({ reason: 'x'.repeat(501) })
    expect(long.status).toBe(400)
    expect(long.body.error.field).toBe('reason')
    const outsider = await signIn(t.app, 'piet@quillmere.test')
    await outsider.get(`/api/datasets/${id}/usage`).expect(404)
    await outsider.call('delete', `/api/datasets/${id}`, {}).expect(404)
  })
})

describe('measurements carry their time scale', () => {
  it('a BJD column is read as BJD_TDB', async () => {
    const list = await reviewer.get(`/api/stars/${starId}/measurements`).expect(200)
    expect(list.body.length).toBeGreaterThan(0)
    for (const m of list.body) expect(m.timeScale).toBe('bjd_tdb')
  })
})

describe('star astrometry', () => {
  it('stores proper motion, its epoch and a default observatory; refuses a proper motion without coordinates', async () => {
    const site = { id: 'la-silla', name: 'La Silla', lonDeg: -70.73, latDeg: -29.256667, heightM: 2347 }
    const created = await analyst.post(`/api/teams/${teamId}/stars`, {
      name: 'Fast mover', massMsun: 0.16, massErrMsun: 0.01, raDeg: 269.4486, decDeg: 4.7392,
      pmRaMasYr: -801.55, pmDecMasYr: 10362.5, coordEpochJd: 2457389.0, defaultSite: site,
    }).expect(201)
    expect(created.body).toMatchObject({ pmRaMasYr: -801.55, pmDecMasYr: 10362.5, coordEpochJd: 2457389.0, defaultSite: site })

    const noCoords = await analyst.post(`/api/teams/${teamId}/stars`, { name: 'No coords', massMsun: 1, massErrMsun: 0.1, pmRaMasYr: 10 })
    expect(noCoords.status).toBe(400)
    expect(noCoords.body.error.field).toBe('raDeg')
    const tooFast = await analyst.post(`/api/teams/${teamId}/stars`, { name: 'Too fast', massMsun: 1, massErrMsun: 0.1, raDeg: 1, decDeg: 1, pmDecMasYr: 30000 })
    expect(tooFast.status).toBe(400)
    expect(tooFast.body.error.field).toBe('pmDecMasYr')
    const badSite = await analyst.patch(`/api/stars/${created.body.id}`, { defaultSite: { ...site, latDeg: 95 } })
    expect(badSite.status).toBe(400)
    expect(badSite.body.error.field).toBe('defaultSite.latDeg')

    // removing the coordinates of a star with a proper motion is refused; with the motion cleared it is fine
    const drop = await analyst.patch(`/api/stars/${created.body.id}`, { raDeg: null })
    expect(drop.status).toBe(400)
    expect(drop.body.error.field).toBe('raDeg')
    const cleared = await analyst.patch(`/api/stars/${created.body.id}`, { pmRaMasYr: null, pmDecMasYr: null, defaultSite: null }).expect(200)
    expect(cleared.body).toMatchObject({ pmRaMasYr: null, pmDecMasYr: null, defaultSite: null })
    const audit = await reviewer.get(`/api/teams/${teamId}/audit`).expect(200)
    const upd = audit.body.find((e: { action: string; entityId: number }) => e.action === 'star.update' && e.entityId === created.body.id)
    expect(Object.keys(upd.detail.changes).sort()).toEqual(['defaultSite', 'pmDecMasYr', 'pmRaMasYr'])
  })
})

describe('archived stars', () => {
  it('lists archived stars and lets an owner restore one, audited; a taken name is a conflict', async () => {
    const owner = await signIn(t.app, 'nadia.owner@lanternfield.test')
    const id = (await analyst.post(`/api/teams/${teamId}/stars`, { name: 'Shelved', massMsun: 1, massErrMsun: 0.1 }).expect(201)).body.id
    await owner.delete(`/api/stars/${id}`).expect(204)
    await reviewer.get(`/api/stars/${id}`).expect(404)
    const archived = await reviewer.get(`/api/teams/${teamId}/stars/archived`).expect(200)
    expect(archived.body.map((x: { id: number }) => x.id)).toContain(id)
    await analyst.post(`/api/teams/${teamId}/stars/${id}/restore`, {}).expect(403)

    // meanwhile someone made a new star with the freed name
    const twin = (await analyst.post(`/api/teams/${teamId}/stars`, { name: 'Shelved', massMsun: 1, massErrMsun: 0.1 }).expect(201)).body.id
    await owner.post(`/api/teams/${teamId}/stars/${id}/restore`, {}).expect(409)
    await analyst.patch(`/api/stars/${twin}`, { name: 'Shelved (new)' }).expect(200)

    const back = await owner.post(`/api/teams/${teamId}/stars/${id}/restore`, {}).expect(200)
    expect(back.body).toMatchObject({ id, name: 'Shelved' })
    await reviewer.get(`/api/stars/${id}`).expect(200)
    await owner.post(`/api/teams/${teamId}/stars/${id}/restore`, {}).expect(404)
    const audit = await reviewer.get(`/api/teams/${teamId}/audit`).expect(200)
    expect(audit.body.some((e: { action: string; entityId: number }) => e.action === 'star.restore' && e.entityId === id)).toBe(true)
  })
})

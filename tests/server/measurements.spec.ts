import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { signIn, type Client } from './client.ts'

let t: TestApp
let analyst: Client
let reviewer: Client
let teamId: number
let starId: number

const TABLE = 'bjd,rv,rv_err,instrument\n2459000.5,10.5,1.5,Alpha\n2459001.5,-3.25,1.25,Alpha\n2459002.5,7.5,2.0,Beta\n'

beforeAll(async () => {
  t = await startTestApp({ seed: true })
  teamId = t.seed!.teamId!
  analyst = await signIn(t.app, 'tomas.analyst@lanternfield.test')
  reviewer = await signIn(t.app, 'ines.reviewer@lanternfield.test')
  starId = (await analyst.post(`/api/teams/${teamId}/stars`, { name: 'Exclusion probe', massMsun: 0.9, massErrMsun: 0.05 }).expect(201)).body.id
  const pre = await analyst.upload(`/api/stars/${starId}/uploads/preview`, [{ name: 't.csv', content: TABLE }], { hints: { 't.csv': { unit: 'm/s' } } }).expect(200)
  await analyst.upload(`/api/stars/${starId}/uploads/commit`, [{ name: 't.csv', content: TABLE }], { mappings: { 't.csv': pre.body.files[0].detection.mapping } }).expect(201)
})
afterAll(async () => { await t?.close() })

describe('measurements', () => {
  it('lists points in time order with instrument, m/s values and no exclusion', async () => {
    const res = await reviewer.get(`/api/stars/${starId}/measurements`).expect(200)
    expect(res.body.map((m: { instrument: string; rv: number }) => `${m.instrument}:${m.rv}`)).toEqual(['Alpha:10.5', 'Alpha:-3.25', 'Beta:7.5'])
    expect(res.body[0]).toMatchObject({ time: 2459000.5, error: 1.5, excluded: false, excludedReason: null, excludedBy: null, excludedAt: null })
  })

  it('excludes a point with a reason, who and when, then restores it; both are audited; nothing is deleted', async () => {
    const list = await analyst.get(`/api/stars/${starId}/measurements`).expect(200)
    const id = list.body[1].id
    const noReason = await analyst.patch(`/api/measurements/${id}`, { excluded: true })
    expect(noReason.status).toBe(400)
    expect(noReason.body.error).toMatchObject({ field: 'reason' })
    await reviewer.patch(`/api/measurements/${id}`, { excluded: true, reason: 'cloud' }).expect(403)

    const t0 = Date.now()
    const ex = await analyst.patch(`/api/measurements/${id}`, { excluded: true, reason: 'moon too close' }).expect(200)
    expect(ex.body).toMatchObject({ id, excluded: true, excludedReason: 'moon too close', excludedBy: { name: 'Tomas Analyst' } })
    expect(Date.parse(ex.body.excludedAt)).toBeGreaterThanOrEqual(t0 - 1000)
    const seen = await reviewer.get(`/api/stars/${starId}/measurements`).expect(200)
    expect(seen.body.find((m: { id: number }) => m.id === id).excluded).toBe(true)
    expect((await reviewer.get(`/api/stars/${starId}`).expect(200)).body.nPoints).toBe(3)

    const back = await analyst.patch(`/api/measurements/${id}`, { excluded: false }).expect(200)
    expect(back.body).toMatchObject({ excluded: false, excludedReason: null, excludedBy: null, excludedAt: null })
    expect(await t.models.Measurement.count({ where: { starId } })).toBe(3)

    const audit = await reviewer.get(`/api/teams/${teamId}/audit`).expect(200)
    const mine = audit.body.filter((e: { entity: string; entityId: number }) => e.entity === 'measurement' && e.entityId === id)
    expect(mine.map((e: { action: string }) => e.action)).toEqual(['measurement.restore', 'measurement.exclude'])
    expect(mine[1].detail).toMatchObject({ reason: 'moon too close', starId })
    expect(mine[0].detail).toMatchObject({ previousReason: 'moon too close' })
  })

  it('stars: create, validate, rename conflict, update, archive keeps the data', async () => {
    const bad = await analyst.post(`/api/teams/${teamId}/stars`, { name: 'Bad', massMsun: -1, massErrMsun: 0.1 })
    expect(bad.status).toBe(400)
    expect(bad.body.error.field).toBe('massMsun')
    const dup = await analyst.post(`/api/teams/${teamId}/stars`, { name: 'Exclusion probe', massMsun: 1, massErrMsun: 0.1 })
    expect(dup.status).toBe(409)
    expect(dup.body.error.field).toBe('name')
    const up = await analyst.patch(`/api/stars/${starId}`, { teffK: 5600, notes: 'K dwarf' }).expect(200)
    expect(up.body).toMatchObject({ teffK: 5600, notes: 'K dwarf', nPoints: 3, instruments: ['Alpha', 'Beta'] })
    const list = await reviewer.get(`/api/teams/${teamId}/stars`).expect(200)
    expect(list.body.find((s: { id: number }) => s.id === starId)).toMatchObject({ nPoints: 3, instruments: ['Alpha', 'Beta'] })

    const owner = await signIn(t.app, 'nadia.owner@lanternfield.test')
    await owner.delete(`/api/stars/${starId}`).expect(204)
    await owner.get(`/api/stars/${starId}`).expect(404)
    const after = await reviewer.get(`/api/teams/${teamId}/stars`).expect(200)
    expect(after.body.find((s: { id: number }) => s.id === starId)).toBeUndefined()
    expect(await t.models.Measurement.count({ where: { starId } })).toBe(3)
    expect(await t.models.RawFile.count()).toBeGreaterThan(0)
    // the name is free again once archived
    await analyst.post(`/api/teams/${teamId}/stars`, { name: 'Exclusion probe', massMsun: 1, massErrMsun: 0.1 }).expect(201)
  })
})

// A 100 000-row table previews and commits in one go; the times are logged, not asserted
// (speed targets are measured, never asserted in tests).
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { createRandom } from '../../shared/math/random.ts'
import { signIn } from './client.ts'

const ROWS = 100_000
let t: TestApp
beforeAll(async () => { t = await startTestApp({ seed: true }) })
afterAll(async () => { await t?.close() })

function table(): string {
  const rng = createRandom(20261201)
  const lines = ['bjd,rv,rv_err,instrument,s_index']
  for (let i = 0; i < ROWS; i++) {
    const time = 2458000 + i * 0.01 + rng.next() * 0.001
    const rv = 12 * Math.sin((2 * Math.PI * time) / 17.3) + 2 * rng.normal()
    lines.push(`${time.toFixed(6)},${rv.toFixed(3)},${(1 + rng.next()).toFixed(2)},${i % 3 === 0 ? 'Kestrel' : 'Harrier'},${(0.17 + 0.01 * rng.next()).toFixed(4)}`)
  }
  return lines.join('\n') + '\n'
}

describe('a 100 000-row table', () => {
  it('previews and commits, every row stored', async () => {
    const text = table()
    const analyst = await signIn(t.app, 'tomas.analyst@lanternfield.test')
    const star = await analyst.post(`/api/teams/${t.seed!.teamId}/stars`, { name: 'Bulk', massMsun: 1, massErrMsun: 0.1 }).expect(201)
    let t0 = performance.now()
    const pre = await analyst.upload(`/api/stars/${star.body.id}/uploads/preview`, [{ name: 'bulk.csv', content: text }], { hints: { 'bulk.csv': { unit: 'm/s' } } })
    const previewMs = performance.now() - t0
    expect(pre.status, JSON.stringify(pre.body).slice(0, 500)).toBe(200)
    expect(pre.body.files[0].rowCount).toBe(ROWS)
    t0 = performance.now()
    const com = await analyst.upload(`/api/stars/${star.body.id}/uploads/commit`, [{ name: 'bulk.csv', content: text }],
      { mappings: { 'bulk.csv': pre.body.files[0].detection.mapping } })
    const commitMs = performance.now() - t0
    expect(com.status, JSON.stringify(com.body).slice(0, 500)).toBe(201)
    expect(com.body.measurementsCreated).toBe(ROWS)
    t0 = performance.now()
    const ms = await analyst.get(`/api/stars/${star.body.id}/measurements`).expect(200)
    const listMs = performance.now() - t0
    expect(ms.body).toHaveLength(ROWS)
    console.log(`100 000 rows (${(text.length / 1e6).toFixed(1)} MB): preview ${previewMs.toFixed(0)} ms, commit ${commitMs.toFixed(0)} ms, list ${listMs.toFixed(0)} ms`)
  }, 120_000)
})

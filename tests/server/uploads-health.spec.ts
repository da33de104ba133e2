import { afterAll, beforeAll, expect, it } from 'vitest'
import request from 'supertest'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { signIn, type Client } from './client.ts'

// A hostile wide table (10 003 columns, ~0.5 MB, as in issue 10) is decoded, detected and parsed in
// the worker pool: /api/health keeps answering while the upload is in flight. The assertion is
// about order (a health reply arrives before the upload's), never about a duration.
let t: TestApp
let analyst: Client
let starId: number
beforeAll(async () => {
  t = await startTestApp({ seed: true })
  analyst = await signIn(t.app, 'tomas.analyst@lanternfield.test')
  const res = await analyst.post(`/api/teams/${t.seed!.teamId}/stars`, { name: 'Wide table', massMsun: 1, massErrMsun: 0.1 }).expect(201)
  starId = res.body.id
})
afterAll(async () => { await t?.close() })

function wideTable(columns: number, rows: number): string {
  const lines = [['time', 'rv', 'err', ...Array.from({ length: columns - 3 }, (_, j) => `x${j}`)].join(',')]
  for (let i = 0; i < rows; i++) {
    lines.push([(2459000.5 + i).toFixed(1), (i % 7).toString(), '1', ...Array.from({ length: columns - 3 }, (_, j) => String((i + j) % 10))].join(','))
  }
  return lines.join('\n') + '\n'
}

it('answers /api/health while a 10 003-column upload is being read', async () => {
  const text = wideTable(10_003, 22)
  expect(text.length).toBeGreaterThan(400_000)
  let uploadDone = false
  const upload = analyst.upload(`/api/stars/${starId}/uploads/preview`, [1, 2, 3].map((k) => ({ name: `wide-${k}.csv`, content: text })))
    .then((res) => { uploadDone = true; return res })
  const answeredDuring: number[] = []
  while (!uploadDone) {
    const h = await request(t.app).get('/api/health')
    expect(h.status).toBe(200)
    if (!uploadDone) answeredDuring.push(h.status)
  }
  const res = await upload
  expect(res.status, JSON.stringify(res.body).slice(0, 300)).toBe(200)
  expect(res.body.files[0].detection.columnCount).toBe(10_003)
  expect(res.body.files[0].rowCount).toBe(22)
  expect(answeredDuring.length).toBeGreaterThan(0)
}, 180_000)

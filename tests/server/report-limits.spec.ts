// Reports with detection limits: a finished limit run chosen at freezing is stored in the frozen
// version (map, contours, table, seed, the non-detection sentence), the JSON export carries it, the
// PDF has a page with the map and the sentence (read back by Debian's pdftotext when installed);
// an unfinished or foreign run is refused naming limitsRunId.
import { execFileSync } from 'node:child_process'
import { existsSync, mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startJobWorkers, type JobWorkers } from '../../server/jobs/index.ts'
import { startSamplingWorld, type SamplingWorld } from './sampling-setup.ts'
import { SMALL_GRID } from './limits-setup.ts'

let w: SamplingWorld
let workers: JobWorkers | undefined
let runId: number
beforeAll(async () => {
  w = await startSamplingWorld()
  runId = (await w.analyst.post(`/api/models/${w.modelId}/limits`, { ...SMALL_GRID, seed: 11 }).expect(201)).body.id
}, 180_000) // the world's set-up (demo seed, upload, fit) is slow on a busy machine
afterAll(async () => {
  await workers?.stop()
  w?.services.mailer.close()
  await w?.t.close()
})

async function finished(id: number, timeoutMs = 120_000) {
  const end = Date.now() + timeoutMs
  for (;;) {
    const r = (await w.reviewer.get(`/api/limits/${id}`).expect(200)).body
    if (['succeeded', 'failed', 'cancelled'].includes(r.state)) return r
    if (Date.now() > end) throw new Error(`run ${id} still ${r.state} after ${timeoutMs} ms`)
    await new Promise((res) => setTimeout(res, 250))
  }
}

describe('reports with detection limits', () => {
  it('refuses a run that has not finished, naming limitsRunId', async () => {
    const r = await w.analyst.post(`/api/models/${w.modelId}/report`, { limitsRunId: runId }).expect(400)
    expect(r.body.error.field).toBe('limitsRunId')
    expect(r.body.error.message).toMatch(/not succeeded/)
    const r2 = await w.analyst.post(`/api/models/${w.modelId}/report`, { limitsRunId: runId + 1000 }).expect(400)
    expect(r2.body.error.field).toBe('limitsRunId')
  })

  it('stores the finished run in the frozen version; JSON and PDF carry it', async () => {
    workers = await startJobWorkers(w.services, { concurrency: 2, pollingIntervalSeconds: 0.5, staleSeconds: 5 })
    const run = await finished(runId)
    expect(run.state).toBe('succeeded')
    const plain = await w.analyst.post(`/api/models/${w.modelId}/report`, {}).expect(201)
    const reportId = plain.body.id as number
    const withLimits = await w.analyst.post(`/api/models/${w.modelId}/report`, { limitsRunId: runId })
    expect(withLimits.status, JSON.stringify(withLimits.body).slice(0, 300)).toBe(201)
    expect(withLimits.body.currentVersion).toBe(2) // adding the limits makes a new version
    const json = (await w.reviewer.get(`/api/reports/${reportId}/versions/2/json`).expect(200)).body
    expect(json.limits).toMatchObject({ runId, seed: 11, settings: { periods: 4, masses: 4, phases: 2 } })
    expect(json.limits.result.fraction).toEqual(run.result.fraction)
    expect(json.limits.result.contour90).toEqual(run.result.contour90)
    expect(json.limits.sentence).toMatch(/exclude with 90 % completeness planets with M sin i above/)
    expect(json.limits.sentence).toContain('seed 11')
    const v1 = (await w.reviewer.get(`/api/reports/${reportId}/versions/1/json`).expect(200)).body
    expect(v1.limits ?? null).toBeNull()
    const again = await w.analyst.post(`/api/models/${w.modelId}/report`, { limitsRunId: runId })
    expect(again.body.currentVersion).toBe(2) // nothing changed: no new version

    const pdf = await w.reviewer.get(`/api/reports/${reportId}/versions/2/pdf`).buffer(true).parse((res, cb) => {
      const parts: Buffer[] = []
      res.on('data', (c: Buffer) => parts.push(c))
      res.on('end', () => cb(null, Buffer.concat(parts)))
    }).expect(200)
    const bytes = pdf.body as Buffer
    expect(bytes.subarray(0, 5).toString()).toBe('%PDF-')
    if (!existsSync('/usr/bin/pdftotext')) { console.log('pdftotext is missing (poppler-utils): the page text check is skipped'); return }
    const dir = mkdtempSync(join(tmpdir(), 'starsway-limits-pdf-'))
    writeFileSync(join(dir, 'r.pdf'), bytes)
    const text = execFileSync('/usr/bin/pdftotext', [join(dir, 'r.pdf'), '-'], { timeout: 30_000 }).toString()
    for (const s of ['Detection limits', '50 % completeness', '90 % completeness', 'Period (days)', 'M sin i (Earth masses)', 'exclude with 90 %', `detection-limit run ${runId}`]) expect(text, s).toContain(s)
  }, 300_000)
})

// Survey triage end to end: 50 seeded synthetic stars uploaded at once (40 files, one per star, and
// one table with a star column for the other 10) through the ordinary upload path, the search
// queued per star on the `triage` queue and worked by two job handlers; the team table then shows
// every star, with the planet stars' signals found near their injected periods and none on the
// noise-only stars. Refusals: a file with a bad row, a new star without a mass, a repeated file.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startJobWorkers, type JobWorkers } from '../../server/jobs/index.ts'
import type { SurveyUploadResponse, TriageQueueStatus, TriageRow } from '../../shared/api/survey.ts'
import { starFile, startTriageWorld, surveyTable, syntheticSurvey, waitForTable, type TriageWorld } from './triage-setup.ts'

let w: TriageWorld
let workers: JobWorkers | undefined
beforeAll(async () => { w = await startTriageWorld() }, 180_000) // the demo seed is slow on a busy machine
afterAll(async () => {
  await workers?.stop()
  w?.services.mailer.close()
  await w?.t.close()
})

const stars = syntheticSurvey(50, 36)

describe('survey triage', () => {
  it('stores 50 stars from one upload, queues one search each, and the table finds the planets', async () => {
    const files = stars.slice(0, 40).map((st) => ({ name: `${st.name.replace(' ', '_')}.txt`, content: starFile(st) }))
    files.push({ name: 'rest.csv', content: surveyTable(stars.slice(40)) })
    const res = await w.analyst.upload(`/api/teams/${w.teamId}/survey/upload`, files, { options: { starMass: 0.8, starMassErr: 0.1 } })
    expect(res.status, JSON.stringify(res.body).slice(0, 800)).toBe(201)
    const up = res.body as SurveyUploadResponse
    expect(up.files.filter((f) => f.status !== 'stored')).toEqual([])
    expect(up.files).toHaveLength(50)
    expect(up.stars).toHaveLength(50)
    expect(up.stars.every((s) => s.created)).toBe(true)
    expect(up.queued).toBe(50)
    expect(up.files.every((f) => f.measurements === 36)).toBe(true)
    // the table star's mass came from the form, the files' from their header
    const list = (await w.reviewer.get(`/api/teams/${w.teamId}/stars`).expect(200)).body as Array<{ name: string; massMsun: number }>
    expect(list.find((s) => s.name === stars[45]!.name)?.massMsun).toBe(0.8)
    expect(list.find((s) => s.name === stars[0]!.name)?.massMsun).toBe(0.9)

    const queued = (await w.owner.get(`/api/teams/${w.teamId}/survey/queue`).expect(200)).body as TriageQueueStatus
    expect(queued.queued).toBe(50)
    expect(queued.queueDepth).toBeGreaterThanOrEqual(50)

    workers = await startJobWorkers(w.services, { concurrency: 2, pollingIntervalSeconds: 0.5, staleSeconds: 30 })
    const rows = await waitForTable(w, stars.map((s) => s.name), 600_000)
    const byName = new Map<string, TriageRow>(rows.map((r) => [r.starName, r]))
    const missed: string[] = []
    for (const st of stars) {
      const r = byName.get(st.name)!
      expect(r.state, `${st.name}: ${r.error}`).toBe('done')
      const s = r.summary!
      expect(s.points).toBe(36)
      expect(s.baseline).toBeGreaterThan(90)
      expect(s.indicators).toEqual([])
      if (st.K === 0) {
        expect(s.planets, `${st.name} (noise only) ${JSON.stringify(s.signals)}`).toBe(0)
      } else {
        const hit = s.signals.find((g) => Math.abs(g.period - st.period) / st.period < 0.02)
        if (!(s.planets >= 1 && hit)) missed.push(`${st.name}: P ${st.period.toFixed(2)} d, K ${st.K.toFixed(1)} → ${JSON.stringify(s.signals)}`)
        expect(s.deltaBic!).toBeGreaterThan(10)
        expect(s.strongestPeriod).not.toBeNull()
      }
    }
    expect(missed, missed.join('\n')).toEqual([])
    const status = (await w.owner.get(`/api/teams/${w.teamId}/survey/queue`).expect(200)).body as TriageQueueStatus
    expect(status).toMatchObject({ queued: 0, running: 0, doneLastHour: 50 })
    expect(status.workers.length).toBe(1)
    expect(status.workers[0]!.jobs).toBe(50)
  }, 900_000) // 50 searches on a machine shared by several engineers

  it('re-queues the team on request; the table shows the newest result per star', async () => {
    const ids = ((await w.reviewer.get(`/api/teams/${w.teamId}/survey`).expect(200)).body as TriageRow[]).filter((r) => r.starName === stars[0]!.name).map((r) => r.starId)
    const r = await w.analyst.post(`/api/teams/${w.teamId}/survey/runs`, { starIds: ids }).expect(201)
    expect(r.body.queued).toBe(1)
    const [row] = await waitForTable(w, [stars[0]!.name], 120_000)
    expect(row!.runId).toBe(r.body.runId)
    await w.analyst.post(`/api/teams/${w.teamId}/survey/runs`, { starIds: [999999] }).expect(400)
    await w.analyst.post(`/api/teams/${w.teamId}/survey/runs`, { other: 1 }).expect(400)
  }, 180_000)

  it('refuses, per file and with a message, a bad row, a new star without a mass and a repeated file; stores the rest', async () => {
    const good = syntheticSurvey(1, 36, 'Extra')[0]!
    const lines = starFile({ ...good, name: 'Broken star', seed: 5 }).split('\n')
    lines[12] = lines[12]!.replace(/ [-0-9.]+ /, ' oops ') // a row in the middle of the table
    const bad = lines.join('\n')
    const noMass = starFile({ ...good, name: 'Massless', seed: 6 }).replace('# starMass: 0.9 ± 0.05\n', '')
    const repeat = starFile(stars[1]!)
    const res = await w.analyst.upload(`/api/teams/${w.teamId}/survey/upload`, [
      { name: 'extra.txt', content: starFile(good) }, { name: 'broken.txt', content: bad }, { name: 'massless.txt', content: noMass }, { name: 'again.txt', content: repeat },
    ], { options: { queue: false } }).expect(201)
    const up = res.body as SurveyUploadResponse
    const by = new Map(up.files.map((f) => [f.fileName, f]))
    expect(by.get('extra.txt')).toMatchObject({ status: 'stored', star: good.name, measurements: 36 })
    expect(by.get('broken.txt')!.status, JSON.stringify(by.get('broken.txt'))).toBe('refused')
    expect(by.get('broken.txt')!.message).toMatch(/line \d+/)
    expect(by.get('massless.txt')!.status).toBe('refused')
    expect(by.get('massless.txt')!.message).toMatch(/starMass/)
    expect(by.get('again.txt')!.status).toBe('refused')
    expect(by.get('again.txt')!.message).toMatch(/already uploaded/)
    expect(up).toMatchObject({ runId: null, queued: 0 })
    const names = ((await w.reviewer.get(`/api/teams/${w.teamId}/stars`).expect(200)).body as Array<{ name: string }>).map((s) => s.name)
    expect(names).toContain(good.name)
    expect(names).not.toContain('Broken star') // a refused file leaves no empty star behind
    expect(names).not.toContain('Massless')
    const bad2 = await w.analyst.upload(`/api/teams/${w.teamId}/survey/upload`, [{ name: 'x.csv', content: 'a,b\n1,2\n' }], { options: { starColumn: 'object' } }).expect(201)
    expect(bad2.body.files[0].message).toMatch(/no column "object"/)
    await w.analyst.upload(`/api/teams/${w.teamId}/survey/upload`, [{ name: 'x.txt', content: '1 2 3\n' }], { options: { starMass: -1 } }).expect(400)
  }, 180_000)
})

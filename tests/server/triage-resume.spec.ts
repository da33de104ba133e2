// A triage worker process killed (SIGKILL, no chance to clean up) while it searches a star loses
// nothing: its heartbeat stops, another worker's stale check puts the star back on the queue, and
// every star ends done, the killed one with the same summary as a direct search of its data.
import { spawn, type ChildProcess } from 'node:child_process'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { QueryTypes } from 'sequelize'
import { startJobWorkers, type JobWorkers } from '../../server/jobs/index.ts'
import { triageInput } from '../../server/triage/worker.ts'
import { triageSearch } from '../../server/triage/summary.ts'
import type { SurveyUploadResponse, TriageRow } from '../../shared/api/survey.ts'
import { starFile, startTriageWorld, syntheticSurvey, waitForTable, type TriageWorld } from './triage-setup.ts'

let w: TriageWorld
let workers: JobWorkers | undefined
let child: ChildProcess | undefined
let childLog = ''
beforeAll(async () => { w = await startTriageWorld() }, 180_000)
afterAll(async () => {
  if (child && child.exitCode === null && child.signalCode === null) child.kill('SIGKILL')
  await workers?.stop()
  w?.services.mailer.close()
  await w?.t.close()
})

function startWorkerProcess(): ChildProcess {
  // node --import tsx (not npx) so that the pid killed is the worker itself, not a wrapper
  const p = spawn(process.execPath, ['--import', 'tsx', 'scripts/worker.ts'], {
    env: {
      ...process.env, NODE_ENV: 'test', DATABASE_URL: w.t.db.url, APP_URL: w.t.config.appUrl, LOG_LEVEL: 'warn',
      SMTP_HOST: '127.0.0.1', SMTP_PORT: String(w.t.config.smtp.port), JOB_CONCURRENCY: '1', JOB_STALE_SECONDS: '2',
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  p.stdout!.on('data', (c: Buffer) => { childLog += c.toString() })
  p.stderr!.on('data', (c: Buffer) => { childLog += c.toString() })
  return p
}

async function states(): Promise<Array<{ id: number; star_id: number; state: string; attempts: number }>> {
  return w.services.sequelize.query(`SELECT id, star_id, state, attempts FROM triage_results ORDER BY id`, { type: QueryTypes.SELECT })
}

describe('a triage worker killed mid-run', () => {
  it('loses nothing: the star it held is searched again by another worker', async () => {
    const stars = syntheticSurvey(8, 200, 'Resume')
    const res = await w.analyst.upload(`/api/teams/${w.teamId}/survey/upload`, stars.map((st) => ({ name: `${st.name}.txt`, content: starFile(st) }))).expect(201)
    expect((res.body as SurveyUploadResponse).queued).toBe(8)
    child = startWorkerProcess()
    const end = Date.now() + 120_000
    for (;;) { // wait until the child holds a star (and has finished at least one, so it is well under way)
      const s = await states()
      if (s.some((r) => r.state === 'running') && s.some((r) => r.state === 'done')) break
      if (Date.now() > end) throw new Error(`the worker process took no star in time: ${JSON.stringify(s)}\nworker output:\n${childLog}`)
      await new Promise((r) => setTimeout(r, 50))
    }
    child.kill('SIGKILL')
    await new Promise<void>((r) => (child!.exitCode !== null || child!.signalCode !== null ? r() : child!.once('exit', () => r())))
    const atKill = await states()
    const held = atKill.filter((r) => r.state === 'running').map((r) => r.id)
    console.log(`[triage-resume] killed with ${atKill.filter((r) => r.state === 'done').length} done, ${held.length} running`)
    expect(held.length).toBe(1)

    workers = await startJobWorkers(w.services, { concurrency: 1, pollingIntervalSeconds: 0.5, staleSeconds: 2 })
    const rows = await waitForTable(w, stars.map((s) => s.name), 300_000)
    expect(rows.every((r) => r.state === 'done')).toBe(true)
    const after = await states()
    const again = after.find((r) => r.id === held[0])!
    expect(again).toMatchObject({ state: 'done', attempts: 2 })
    const row = rows.find((r) => r.resultId === again.id) as TriageRow
    const direct = triageSearch((await triageInput(w.services, again.star_id)) as Exclude<Awaited<ReturnType<typeof triageInput>>, string>)
    expect(row.summary).toEqual(JSON.parse(JSON.stringify(direct)))
    expect(after.filter((r) => r.attempts !== 1).map((r) => r.id)).toEqual(held) // the others ran once
  }, 600_000) // a second Node process starts from the TypeScript sources: slow on a busy machine
})

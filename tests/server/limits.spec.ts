// Detection-limit runs worked on by job workers: the map made by two workers equals the one
// computed in one piece in-process with the same seed; a chunk held by a worker that died (its
// heartbeat stops) is requeued and the run still finishes with the same map.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startJobWorkers, type JobWorkers } from '../../server/jobs/index.ts'
import { claimChunk } from '../../server/limits/service.ts'
import { problemOf } from '../../server/limits/problem.ts'
import { computeLimitMap } from '../../shared/limits/index.ts'
import { startSamplingWorld, type SamplingWorld } from './sampling-setup.ts'
import { SMALL_GRID } from './limits-setup.ts'

let w: SamplingWorld
let workers: JobWorkers | null = null
beforeAll(async () => { w = await startSamplingWorld() }, 180_000) // demo seed, upload and fit: slow on a busy machine
afterAll(async () => {
  await workers?.stop()
  w?.services.mailer.close()
  await w?.t.close()
})

async function waitFor(id: number, timeoutMs = 90_000) {
  const end = Date.now() + timeoutMs
  for (;;) {
    const r = (await w.reviewer.get(`/api/limits/${id}`).expect(200)).body
    if (['succeeded', 'failed', 'cancelled'].includes(r.state)) return r
    if (Date.now() > end) throw new Error(`run ${id} still ${r.state} after ${timeoutMs} ms (${JSON.stringify(r.progress)})`)
    await new Promise((res) => setTimeout(res, 250))
  }
}

/** The same map computed in-process from the run's frozen input. */
async function inProcessFraction(id: number): Promise<number[][]> {
  const [rows] = await w.services.sequelize.query(`SELECT input, settings, seed FROM limit_runs WHERE id = ${id}`)
  const r = (rows as Array<{ input: never; settings: never; seed: string }>)[0]
  const map = computeLimitMap(problemOf(r.input, r.settings, Number(r.seed)))
  const nM = map.grid.massesEarth.length
  return Array.from(map.grid.periods, (_, i) => Array.from(map.fraction.subarray(i * nM, (i + 1) * nM)))
}

describe('detection-limit runs on the queue', () => {
  it('two workers produce the map computed in one piece with the same seed, with contours, table and planets', async () => {
    workers = await startJobWorkers(w.services, { concurrency: 2, pollingIntervalSeconds: 0.5, staleSeconds: 3 })
    const id = (await w.analyst.post(`/api/models/${w.modelId}/limits`, { ...SMALL_GRID, seed: 2024 }).expect(201)).body.id
    const run = await waitFor(id)
    expect(run.state, run.error).toBe('succeeded')
    expect(run.progress).toMatchObject({ trialsDone: run.trials, chunksDone: 4 })
    expect(run.result.fraction).toEqual(await inProcessFraction(id))
    expect(run.result.contour50).toHaveLength(4)
    expect(run.result.planets[0]).toMatchObject({ label: 'b' })
    expect(run.result.planets[0].period).toBeCloseTo(12.3, 0)
    expect(run.result.giants.map((g: { name: string }) => g.name)).toEqual(['Jupiter', 'Saturn', 'Uranus', 'Neptune'])
    await workers.stop(); workers = null
  }, 120_000)

  it('a chunk whose worker died is requeued by the stale check and the run finishes with the same map', async () => {
    const id = (await w.analyst.post(`/api/models/${w.modelId}/limits`, { ...SMALL_GRID, seed: 77 }).expect(201)).body.id
    // a worker takes chunk 0 and dies at once: no heartbeat, no result
    expect(await claimChunk(w.services, id, 0, 'dead-worker', 3)).not.toBeNull()
    workers = await startJobWorkers(w.services, { concurrency: 1, pollingIntervalSeconds: 0.5, staleSeconds: 2 })
    const run = await waitFor(id)
    expect(run.state, run.error).toBe('succeeded')
    const [rows] = await w.services.sequelize.query(`SELECT attempts FROM limit_chunks WHERE run_id = ${id} AND index = 0`)
    expect((rows as Array<{ attempts: number }>)[0].attempts).toBe(2)
    expect(run.result.fraction).toEqual(await inProcessFraction(id))
  }, 120_000)
})

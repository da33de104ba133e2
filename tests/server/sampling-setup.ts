// Shared set-up of the sampling and job tests: a demo app, a star with a synthetic one-planet
// series (seeded), a fitted model, signed-in clients and job workers on the test database.
import { expect } from 'vitest'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { signIn, type Client } from './client.ts'
import { createRandom } from '../../shared/math/random.ts'
import { createMailer } from '../../server/mail/mailer.ts'
import type { Services } from '../../server/services.ts'
import { samplingModels, type SamplingRun } from '../../server/db/models-sampling.ts'

export const EMAIL = {
  outsider: 'piet@quillmere.test', reviewer: 'ines.reviewer@lanternfield.test',
  analyst: 'tomas.analyst@lanternfield.test', owner: 'nadia.owner@lanternfield.test',
}

/** n velocities of one planet on a circular orbit (a sinusoid, P = 12.3 d, K = 30 m/s) plus 3 m/s Gaussian noise, seeded: this test's own data. */
export function syntheticTable(n: number, seed = 7): string {
  const rnd = createRandom(seed)
  const lines = ['# bjd rv err']
  for (let i = 0; i < n; i++) {
    const t = 2459000 + (i * 97.3) / n + 0.3 * rnd.next()
    const rv = 30 * Math.sin((2 * Math.PI * (t - 2459001.2)) / 12.3) + 3 * rnd.normal()
    lines.push(`${t.toFixed(5)} ${rv.toFixed(3)} 3.0`)
  }
  return lines.join('\n') + '\n'
}

export interface SamplingWorld {
  t: TestApp; services: Services; teamId: number; starId: number; modelId: number
  analyst: Client; reviewer: Client; owner: Client; outsider: Client
}

export async function startSamplingWorld(opts: { points?: number; config?: Parameters<typeof startTestApp>[0] extends infer O ? O extends { config?: infer C } ? C : never : never } = {}): Promise<SamplingWorld> {
  const t = await startTestApp({ seed: true, config: opts.config })
  const teamId = t.seed!.teamId!
  const [analyst, reviewer, owner, outsider] = await Promise.all([signIn(t.app, EMAIL.analyst), signIn(t.app, EMAIL.reviewer), signIn(t.app, EMAIL.owner), signIn(t.app, EMAIL.outsider)])
  const star = await analyst.post(`/api/teams/${teamId}/stars`, { name: 'Sampling Probe', massMsun: 0.9, massErrMsun: 0.05 }).expect(201)
  const starId = star.body.id as number
  const table = syntheticTable(opts.points ?? 40)
  const pre = await analyst.upload(`/api/stars/${starId}/uploads/preview`, [{ name: 'rv.txt', content: table }]).expect(200)
  const mapping = pre.body.files[0].detection.mapping
  await analyst.upload(`/api/stars/${starId}/uploads/commit`, [{ name: 'rv.txt', content: table }], { mappings: { 'rv.txt': mapping } }).expect(201)
  const model = await analyst.post(`/api/stars/${starId}/models`, { name: 'One planet', spec: { planets: [{ period: 12.3, K: 25 }] } })
  expect(model.status, JSON.stringify(model.body)).toBe(201)
  const fit = await analyst.post(`/api/models/${model.body.id}/fit`, {})
  expect(fit.status, JSON.stringify(fit.body).slice(0, 500)).toBe(200)
  expect(fit.body.status).toBe('fitted')
  const services: Services = { config: t.config, sequelize: t.db.sequelize, models: t.models, mailer: createMailer(t.config.smtp) }
  return { t, services, teamId, starId, modelId: model.body.id, analyst, reviewer, owner, outsider }
}

export async function runRow(w: SamplingWorld, id: number): Promise<SamplingRun> {
  return (await samplingModels(w.services.sequelize, w.services.models).SamplingRun.findByPk(id))!
}

/** Polls the run's row until `pred` holds. */
export async function waitForRun(w: SamplingWorld, id: number, pred: (r: SamplingRun) => boolean, timeoutMs = 30_000, what = 'the expected state'): Promise<SamplingRun> {
  const end = Date.now() + timeoutMs
  for (;;) {
    const r = await runRow(w, id)
    if (pred(r)) return r
    if (Date.now() > end) throw new Error(`run ${id} did not reach ${what} within ${timeoutMs} ms (state ${r.state}, step ${r.progress?.stepsDone}, error ${r.error})`)
    await new Promise((res) => setTimeout(res, 100))
  }
}

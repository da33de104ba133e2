// Shared pieces of the survey-triage tests: seeded synthetic stars (this test's own data), a demo
// app with signed-in clients, and polling of the team table.
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { signIn, type Client } from './client.ts'
import { EMAIL } from './roles.ts'
import { createRandom } from '../../shared/math/random.ts'
import { createMailer } from '../../server/mail/mailer.ts'
import type { Services } from '../../server/services.ts'
import type { TriageRow } from '../../shared/api/survey.ts'

/** A synthetic star: a circular planet (period, K) or none (K = 0), n points at random times over `span` days, σ = 3 m/s, seeded. */
export interface SyntheticStar { name: string; period: number; K: number; n: number; seed: number; span?: number }

export function starRows(st: SyntheticStar): Array<[number, number, number]> {
  const rnd = createRandom(st.seed)
  const span = st.span ?? 120
  const phase = rnd.next() * 2 * Math.PI
  const times = Array.from({ length: st.n }, () => 2459000 + span * rnd.next()).sort((a, b) => a - b)
  const out: Array<[number, number, number]> = []
  for (const t of times) {
    const rv = st.K * Math.sin((2 * Math.PI * (t - 2459000)) / st.period + phase) + 3 * rnd.normal()
    out.push([t, rv, 3])
  }
  return out
}

/** One file per star: a "# star:" line and a "# starMass:" line, then "bjd rv err" rows. */
export function starFile(st: SyntheticStar): string {
  return [`# star: ${st.name}`, '# starMass: 0.9 ± 0.05', '# bjd rv err', ...starRows(st).map(([t, v, e]) => `${t.toFixed(5)} ${v.toFixed(3)} ${e.toFixed(1)}`)].join('\n') + '\n'
}

/** One comma-separated table holding several stars in a "star" column. */
export function surveyTable(stars: SyntheticStar[]): string {
  const lines = ['star,bjd,rv,err']
  for (const st of stars) for (const [t, v, e] of starRows(st)) lines.push(`${st.name},${t.toFixed(5)},${v.toFixed(3)},${e.toFixed(1)}`)
  return lines.join('\n') + '\n'
}

/** `count` stars: every third one noise only, the others a planet of K = 12–20 m/s at 3–40 d. */
export function syntheticSurvey(count: number, n: number, prefix = 'Survey'): SyntheticStar[] {
  const rnd = createRandom(1234)
  return Array.from({ length: count }, (_, i) => {
    const noise = i % 3 === 2
    return { name: `${prefix} ${String(i + 1).padStart(3, '0')}`, period: 3 * Math.exp(rnd.next() * Math.log(40 / 3)), K: noise ? 0 : 12 + 8 * rnd.next(), n, seed: 100 + i }
  })
}

export interface TriageWorld { t: TestApp; services: Services; teamId: number; analyst: Client; reviewer: Client; owner: Client; outsider: Client }

export async function startTriageWorld(): Promise<TriageWorld> {
  const t = await startTestApp({ seed: true })
  const teamId = t.seed!.teamId!
  const [analyst, reviewer, owner, outsider] = await Promise.all([signIn(t.app, EMAIL.analyst), signIn(t.app, EMAIL.reviewer), signIn(t.app, EMAIL.owner), signIn(t.app, EMAIL.outsider)])
  const services: Services = { config: t.config, sequelize: t.db.sequelize, models: t.models, mailer: createMailer(t.config.smtp) }
  return { t, services, teamId, analyst, reviewer, owner, outsider }
}

/** Polls the team table until every listed star is done or failed. */
export async function waitForTable(w: TriageWorld, names: string[], timeoutMs: number): Promise<TriageRow[]> {
  const end = Date.now() + timeoutMs
  for (;;) {
    const rows = (await w.reviewer.get(`/api/teams/${w.teamId}/survey`).expect(200)).body as TriageRow[]
    const mine = rows.filter((r) => names.includes(r.starName))
    if (mine.length === names.length && mine.every((r) => r.state === 'done' || r.state === 'failed')) return mine
    if (Date.now() > end) throw new Error(`triage not finished within ${timeoutMs} ms: ${mine.filter((r) => r.state === 'done').length}/${names.length} done`)
    await new Promise((r) => setTimeout(r, 250))
  }
}

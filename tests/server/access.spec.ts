// For every route of the API: what anonymous, reviewer, analyst, owner and a member of another team get.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { routes } from '../../server/routes.ts'
import * as analysisHandlers from '../../server/analyses/routes.ts'
import * as samplingHandlers from '../../server/sampling/routes.ts'
import * as reportHandlers from '../../server/reports/routes.ts'
import * as limitsHandlers from '../../server/limits/routes.ts'
import * as planHandlers from '../../server/plan/routes.ts'
import * as triageHandlers from '../../server/triage/routes.ts'
import { hashToken, newToken } from '../../server/auth/tokens.ts'
import { signIn, type Client } from './client.ts'
import { analyst, anyone, EMAIL, member, owner, personaClient as freshClient, PERSONAS, signedIn, type Expect, type Persona } from './roles.ts'


const TABLE = '# bjd rv err\n2459000.5 10.0 1.0\n2459001.5 12.0 1.1\n2459002.5 9.0 1.0\n'

interface Case {
  method: string
  /** The route pattern, as in server/routes.ts. */
  route: string
  expect: Expect
  /** Makes a fresh target for one call (so a successful call does not change the next one). */
  prepare?: () => Promise<{ path?: string; body?: object }>
  path?: string
  body?: object | (() => object)
  upload?: { fields?: () => Record<string, unknown> }
}

let t: TestApp
let teamId: number, starId: number, datasetId: number, measurementId: number
let mapping: unknown
let counter = 0
const unique = () => `${Date.now()}-${++counter}`

beforeAll(async () => {
  t = await startTestApp({ seed: true })
  teamId = t.seed!.teamId!
  const analystClient = await signIn(t.app, EMAIL.analyst)
  const star = await analystClient.post(`/api/teams/${teamId}/stars`, { name: 'Access Probe', massMsun: 1, massErrMsun: 0.1 }).expect(201)
  starId = star.body.id
  const pre = await analystClient.upload(`/api/stars/${starId}/uploads/preview`, [{ name: 'probe.txt', content: TABLE }]).expect(200)
  mapping = pre.body.files[0].detection.mapping
  const com = await analystClient.upload(`/api/stars/${starId}/uploads/commit`, [{ name: 'probe.txt', content: TABLE }], { mappings: { 'probe.txt': mapping } })
  expect(com.status, JSON.stringify(com.body)).toBe(201)
  datasetId = com.body.datasets[0].id
  measurementId = (await t.models.Measurement.findOne({ where: { datasetId } }))!.id
})
afterAll(async () => { await t?.close() })

async function extraMember(): Promise<number> {
  const u = await t.models.User.create({ email: `extra-${unique()}@example.test`, name: 'Extra', passwordHash: 'x' })
  await t.models.Membership.create({ teamId, userId: u.id, role: 'reviewer' })
  return u.id
}
async function openInvitation(email = `invitee-${unique()}@example.test`, pendingApproval = false): Promise<{ id: number; token: string }> {
  const { token, hash } = newToken()
  const inv = await t.models.Invitation.create({ teamId, email, role: 'reviewer', tokenHash: hash, expiresAt: new Date(Date.now() + 86400_000), acceptedAt: null, invitedBy: null, pendingApproval })
  expect(hashToken(token)).toBe(hash)
  return { id: inv.id, token }
}

/** A fresh API token of the analyst persona in the probe team (its id). */
async function analystToken(): Promise<number> {
  const c = await signIn(t.app, EMAIL.analyst)
  return (await c.post(`/api/teams/${teamId}/tokens`, { name: `held ${unique()}` }).expect(201)).body.id
}

/** A fresh, unused dataset on the probe star (each successful deletion removes one). */
async function spareDataset(): Promise<number> {
  const n = ++counter
  const name = `spare-${n}.txt`
  const content = `# bjd rv err\n${2459500.5 + n * 10} 10.0 1.0\n${2459501.5 + n * 10} 12.0 1.1\n${2459502.5 + n * 10} 9.0 1.0\n`
  const c = await signIn(t.app, EMAIL.analyst)
  const pre = await c.upload(`/api/stars/${starId}/uploads/preview`, [{ name, content }]).expect(200)
  const com = await c.upload(`/api/stars/${starId}/uploads/commit`, [{ name, content }], { mappings: { [name]: pre.body.files[0].detection.mapping } }).expect(201)
  return com.body.datasets[0].id
}

const cases: Case[] = [
  { method: 'get', route: '/api/health', path: '/api/health', expect: anyone(200) },
  { method: 'get', route: '/api/health/ready', path: '/api/health/ready', expect: anyone(200) },
  { method: 'get', route: '/api/openapi.json', path: '/api/openapi.json', expect: anyone(200) },
  { method: 'get', route: '/api/docs', path: '/api/docs', expect: anyone(200) },
  { method: 'post', route: '/api/auth/register', path: '/api/auth/register', expect: anyone(201),
    body: () => ({ email: `new-${unique()}@example.test`, password: 'long enough pw', name: 'New' }) },
  { method: 'post', route: '/api/auth/login', path: '/api/auth/login', expect: anyone(200),
    body: { email: 'tomas.analyst@lanternfield.test', password: 'starsway-demo' } },
  { method: 'post', route: '/api/auth/logout', path: '/api/auth/logout', expect: anyone(204) },
  { method: 'get', route: '/api/auth/me', path: '/api/auth/me', expect: signedIn(200) },
  // a wrong current password: the guard lets signed-in users through, the service refuses
  { method: 'post', route: '/api/auth/password', path: '/api/auth/password', expect: signedIn(400),
    body: { currentPassword: 'not the password', newPassword: 'another long one' } },
  { method: 'post', route: '/api/auth/reset-request', path: '/api/auth/reset-request', expect: anyone(202), body: { email: 'nobody@example.test' } },
  { method: 'post', route: '/api/auth/reset', path: '/api/auth/reset', expect: anyone(400), body: { token: 'bogus', newPassword: 'long enough pw' } },

  { method: 'get', route: '/api/teams', path: '/api/teams', expect: signedIn(200) },
  { method: 'post', route: '/api/teams', path: '/api/teams', expect: signedIn(201), body: () => ({ name: `Team ${unique()}` }) },
  { method: 'get', route: '/api/teams/:teamId', path: '/api/teams/TEAM', expect: member(200) },
  { method: 'patch', route: '/api/teams/:teamId/members/:userId', expect: owner(200),
    prepare: async () => ({ path: `/api/teams/${teamId}/members/${await extraMember()}`, body: { role: 'analyst' } }) },
  { method: 'delete', route: '/api/teams/:teamId/members/:userId', expect: owner(204),
    prepare: async () => ({ path: `/api/teams/${teamId}/members/${await extraMember()}` }) },
  { method: 'get', route: '/api/teams/:teamId/invitations', path: '/api/teams/TEAM/invitations', expect: owner(200) },
  { method: 'post', route: '/api/teams/:teamId/invitations', path: '/api/teams/TEAM/invitations', expect: owner(201),
    body: () => ({ email: `invitee-${unique()}@example.test`, role: 'reviewer' }) },
  { method: 'post', route: '/api/teams/:teamId/invitations/:invitationId/approve', expect: owner(200),
    prepare: async () => ({ path: `/api/teams/${teamId}/invitations/${(await openInvitation(undefined, true)).id}/approve` }) },
  { method: 'delete', route: '/api/teams/:teamId/invitations/:invitationId', expect: owner(204),
    prepare: async () => ({ path: `/api/teams/${teamId}/invitations/${(await openInvitation()).id}` }) },
  { method: 'get', route: '/api/invitations/:token', expect: anyone(200),
    prepare: async () => ({ path: `/api/invitations/${(await openInvitation()).token}` }) },
  // the invitation is for another address: signed-in users reach the service, which refuses
  { method: 'post', route: '/api/invitations/:token/accept', expect: signedIn(400),
    prepare: async () => ({ path: `/api/invitations/${(await openInvitation()).token}/accept` }) },

  { method: 'get', route: '/api/teams/:teamId/stars', path: '/api/teams/TEAM/stars', expect: member(200) },
  { method: 'post', route: '/api/teams/:teamId/stars', path: '/api/teams/TEAM/stars', expect: analyst(201),
    body: () => ({ name: `Star ${unique()}`, massMsun: 1.1, massErrMsun: 0.1 }) },
  { method: 'get', route: '/api/stars/:starId', path: '/api/stars/STAR', expect: member(200) },
  { method: 'patch', route: '/api/stars/:starId', path: '/api/stars/STAR', expect: analyst(200), body: () => ({ notes: `note ${unique()}` }) },
  { method: 'delete', route: '/api/stars/:starId', expect: owner(204),
    prepare: async () => {
      const st = await t.models.Star.create({ teamId, name: `Doomed ${unique()}`, massMsun: 1, massErrMsun: 0.1, radiusRsun: null, teffK: null, luminosityLsun: null, raDeg: null, decDeg: null, notes: null, archivedAt: null })
      return { path: `/api/stars/${st.id}` }
    } },

  { method: 'get', route: '/api/teams/:teamId/stars/archived', path: '/api/teams/TEAM/stars/archived', expect: member(200) },
  { method: 'post', route: '/api/teams/:teamId/stars/:starId/restore', expect: owner(200),
    prepare: async () => {
      const st = await t.models.Star.create({ teamId, name: `Archived ${unique()}`, massMsun: 1, massErrMsun: 0.1, radiusRsun: null, teffK: null, luminosityLsun: null, raDeg: null, decDeg: null, notes: null, archivedAt: new Date() })
      return { path: `/api/teams/${teamId}/stars/${st.id}/restore` }
    } },

  { method: 'post', route: '/api/stars/:starId/uploads/preview', path: '/api/stars/STAR/uploads/preview', expect: analyst(200), upload: {} },
  { method: 'post', route: '/api/stars/:starId/uploads/commit', path: '/api/stars/STAR/uploads/commit', expect: analyst(201),
    upload: { fields: () => ({ mappings: { 'probe.txt': mapping } }) } },
  { method: 'get', route: '/api/stars/:starId/datasets', path: '/api/stars/STAR/datasets', expect: member(200) },
  { method: 'get', route: '/api/datasets/:datasetId/raw', path: '/api/datasets/DATASET/raw', expect: member(200) },
  { method: 'get', route: '/api/datasets/:datasetId/usage', path: '/api/datasets/DATASET/usage', expect: member(200) },
  { method: 'delete', route: '/api/datasets/:datasetId', expect: analyst(204),
    prepare: async () => ({ path: `/api/datasets/${await spareDataset()}` }) },
  { method: 'get', route: '/api/stars/:starId/measurements', path: '/api/stars/STAR/measurements', expect: member(200) },
  { method: 'patch', route: '/api/measurements/:measurementId', path: '/api/measurements/MEASUREMENT', expect: analyst(200),
    body: { excluded: true, reason: 'access test' } },
  { method: 'get', route: '/api/teams/:teamId/audit', path: '/api/teams/TEAM/audit', expect: member(200) },
  { method: 'get', route: '/api/teams/:teamId/tokens', path: '/api/teams/TEAM/tokens', expect: member(200) },
  { method: 'post', route: '/api/teams/:teamId/tokens', path: '/api/teams/TEAM/tokens', expect: member(201), body: () => ({ name: `probe ${unique()}` }) },
  // a token held by the analyst: its holder and owners may revoke it, another reviewer may not
  { method: 'delete', route: '/api/teams/:teamId/tokens/:tokenId', expect: { anonymous: 401, outsider: 404, reviewer: 403, analyst: 200, owner: 200 },
    prepare: async () => ({ path: `/api/teams/${teamId}/tokens/${await analystToken()}` }) },
  // development only (404 in production, tests/server/app.spec.ts), and behind sign-in
  { method: 'get', route: '/api/dev/mail', path: '/api/dev/mail', expect: signedIn(200) },
  { method: 'get', route: '/dev/mail', path: '/dev/mail', expect: signedIn(200) },
]

function fill(path: string): string {
  return path.replace('TEAM', String(teamId)).replace('STAR', String(starId))
    .replace('DATASET', String(datasetId)).replace('MEASUREMENT', String(measurementId))
}

const cached = new Map<Persona, Client>()
/** Signed-in clients are reused, except for the routes that change the session itself. */
async function personaClient(p: Persona, route: string): Promise<Client> {
  const fresh = async () => freshClient(t.app, p)
  if (/^\/api\/auth\/(register|login|logout)$/.test(route)) return fresh()
  if (!cached.has(p)) cached.set(p, await fresh())
  return cached.get(p)!
}

describe('access to every route', () => {
  it('covers every route of the routes table', () => {
    // the analysis routes have their own table in analyses-access.spec.ts, the sampling routes in sampling-access.spec.ts,
    // the detection-limit and planner routes in limits-access.spec.ts, the survey-triage routes in triage-access.spec.ts
    const elsewhere = new Set<unknown>([...Object.values(analysisHandlers), ...Object.values(samplingHandlers), ...Object.values(reportHandlers), ...Object.values(limitsHandlers), ...Object.values(planHandlers), ...Object.values(triageHandlers)])
    const inTable = routes.filter((r) => !elsewhere.has(r.handler)).map((r) => `${r.method.toUpperCase()} ${r.path}`).sort()
    const tested = cases.map((c) => `${c.method.toUpperCase()} ${c.route}`).sort()
    expect(tested).toEqual(inTable)
  })

  for (const c of cases) {
    it(`${c.method.toUpperCase()} ${c.route}: ${PERSONAS.map((p) => `${p} ${c.expect[p]}`).join(', ')}`, async () => {
      const got: Partial<Expect> = {}
      const bodies: Record<string, unknown> = {}
      for (const p of PERSONAS) {
        const client = await personaClient(p, c.route)
        const prepared = c.prepare ? await c.prepare() : {}
        const path = fill(prepared.path ?? c.path!)
        const body = prepared.body ?? (typeof c.body === 'function' ? c.body() : c.body)
        const res = c.upload
          // times of its own per call: the same bytes, or the same time and instrument, are not stored twice
          ? await client.upload(path, [{ name: 'probe.txt', content: TABLE.replace(/2459(\d{3})\.5/g, (_m, d: string) => `${2459000 + 10 * ++counter + Number(d)}.5`) }], c.upload.fields?.() ?? {})
          : await client.call(c.method, path, body)
        got[p] = res.status
        bodies[p] = res.body
        if (res.status === 404 && c.expect[p] === 404) expect(res.body.error.code).toBe('not_found')
        if (res.status === 403 && c.expect[p] === 403) expect(res.body.error.message).toMatch(/role/)
      }
      expect(got, JSON.stringify(bodies).slice(0, 2000)).toEqual(c.expect)
    })
  }

  it('answers 404 for a star of another team even to its own team\'s owner of a different team', async () => {
    const piet = await signIn(t.app, EMAIL.outsider)
    const res = await piet.get(`/api/stars/${starId}/measurements`).expect(404)
    expect(JSON.stringify(res.body)).not.toMatch(/2459000/)
    await piet.get(`/api/stars/999999`).expect(404)
    await piet.get(`/api/stars/not-a-number`).expect(404)
  })
})

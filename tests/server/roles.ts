// The personas of the route-access tables (demo seed users, scripts/seed.ts) and the status each
// expects: anonymous, a member of another team, and the demo team's reviewer, analyst and owner.
import type { Express } from 'express'
import { expect, it } from 'vitest'
import { anonymous, signIn, type Client } from './client.ts'

export type Persona = 'anonymous' | 'outsider' | 'reviewer' | 'analyst' | 'owner'
export const PERSONAS: Persona[] = ['anonymous', 'outsider', 'reviewer', 'analyst', 'owner']
export const EMAIL: Record<Exclude<Persona, 'anonymous'>, string> = {
  outsider: 'piet@quillmere.test', reviewer: 'ines.reviewer@lanternfield.test',
  analyst: 'tomas.analyst@lanternfield.test', owner: 'nadia.owner@lanternfield.test',
}
/** The HTTP status each persona gets. */
export type Expect = Record<Persona, number>
/** Open to all, signed in or not. */
export const anyone = (ok: number): Expect => ({ anonymous: ok, outsider: ok, reviewer: ok, analyst: ok, owner: ok })
/** Any signed-in user. */
export const signedIn = (ok: number): Expect => ({ anonymous: 401, outsider: ok, reviewer: ok, analyst: ok, owner: ok })
/** Any member of the team (another team gets 404). */
export const member = (ok: number): Expect => ({ anonymous: 401, outsider: 404, reviewer: ok, analyst: ok, owner: ok })
/** Analysts and owners of the team. */
export const analyst = (ok: number): Expect => ({ anonymous: 401, outsider: 404, reviewer: 403, analyst: ok, owner: ok })
/** The team's owner only. */
export const owner = (ok: number): Expect => ({ anonymous: 401, outsider: 404, reviewer: 403, analyst: 403, owner: ok })

/** A client for `p`: anonymous, or freshly signed in with the demo password. */
export function personaClient(app: Express, p: Persona): Promise<Client> | Client {
  return p === 'anonymous' ? anonymous(app) : signIn(app, EMAIL[p])
}

/** Per-persona clients signed in once and reused; `app` is read on first use of each persona. */
export function cachedPersonas(app: () => Express): (p: Persona) => Promise<Client> {
  const clients = new Map<Persona, Client>()
  return async (p) => {
    if (!clients.has(p)) clients.set(p, await personaClient(app(), p))
    return clients.get(p)!
  }
}

/** One row of a route-access table: the route as the routes table spells it and what each persona gets. */
export interface RoleCase { method: string; route: string; expect: Expect }

export interface RoleTableOptions<C extends RoleCase> {
  /** The feature's handlers module: the table must have a case for each of its routes. */
  handlers: object
  /** The routes table (server/routes.ts). */
  routes: Array<{ method: string; path: string; handler: unknown }>
  cases: C[]
  client: (p: Persona) => Promise<Client> | Client
  /** The concrete path and body of a case for one call (may create what the call consumes). */
  request: (c: C) => Promise<{ path: string; body?: object }> | { path: string; body?: object }
  /** Text that must not leak in a 404 answer (the probe's own data). */
  hidden: RegExp
  timeout?: number
}

/**
 * Defines the tests of a route-access table: one checks that every route of `handlers` in the routes
 * table has a case, and one test per case calls it as each persona and compares the statuses; an
 * expected 404 must say not_found and reveal nothing, an expected 403 must name the role.
 */
export function roleTable<C extends RoleCase>(o: RoleTableOptions<C>): void {
  it('has a case for every route of the feature in the routes table', () => {
    const handlers = new Set<unknown>(Object.values(o.handlers))
    const inTable = o.routes.filter((r) => handlers.has(r.handler)).map((r) => `${r.method.toUpperCase()} ${r.path}`).sort()
    expect(o.cases.map((c) => `${c.method.toUpperCase()} ${c.route}`).sort()).toEqual(inTable)
  })

  for (const c of o.cases) {
    it(`${c.method.toUpperCase()} ${c.route}: ${PERSONAS.map((p) => `${p} ${c.expect[p]}`).join(', ')}`, async () => {
      const got: Partial<Expect> = {}
      const bodies: Record<string, unknown> = {}
      for (const p of PERSONAS) {
        const { path, body } = await o.request(c)
        const res = await (await o.client(p)).call(c.method, path, body)
        got[p] = res.status
        bodies[p] = res.body
        if (res.status === 404 && c.expect[p] === 404) {
          expect(res.body.error.code).toBe('not_found')
          expect(JSON.stringify(res.body)).not.toMatch(o.hidden)
        }
        if (res.status === 403 && c.expect[p] === 403) expect(res.body.error.message).toMatch(/role/)
      }
      expect(got, JSON.stringify(bodies).slice(0, 2000)).toEqual(c.expect)
    }, o.timeout)
  }
}

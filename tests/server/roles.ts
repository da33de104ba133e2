// The personas of the route-access tables (demo seed users, scripts/seed.ts) and the status each
// expects: anonymous, a member of another team, and the demo team's reviewer, analyst and owner.
import type { Express } from 'express'
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

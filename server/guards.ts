import type { Request, RequestHandler, Response } from 'express'
import multer from 'multer'
import type { Services } from './services.ts'
import type { Dataset, Membership, Measurement, Star, Team, User } from './db/models.ts'
import { ForbiddenError, NotFoundError, UnauthorizedError } from './errors.ts'
import { ROLE_RANK, type Role } from '../shared/api/common.ts'

/**
 * A guard runs before a handler: it throws (401/403/404…) or records what it found in
 * res.locals.scope. Order of checks on a team resource: signed in (401) → the resource exists
 * and the user is in its team (404 otherwise, never revealing it) → the role suffices (403).
 */
export type Guard = (req: Request, res: Response, s: Services) => Promise<void> | void

export interface Scope {
  membership: Membership
  team?: Team
  star?: Star
  dataset?: Dataset
  measurement?: Measurement
}

export function signedInUser(res: Response): User {
  const user = res.locals.user as User | null
  if (!user) throw new UnauthorizedError()
  return user
}

export function scope(res: Response): Scope {
  return res.locals.scope as Scope
}

export const signedIn: Guard = (_req, res) => { signedInUser(res) }

/** Development-only routes: absent (404) in production, and behind sign-in elsewhere. */
export const devOnly: Guard = (_req, _res, s) => { if (!s.config.devRoutes) throw new NotFoundError('Route') }

function idOf(req: Request, name: string, what: string): number {
  const raw = req.params[name]
  const n = Number(raw)
  if (!Number.isSafeInteger(n) || n <= 0 || String(n) !== raw) throw new NotFoundError(what)
  return n
}

async function membershipFor(s: Services, user: User, teamId: number, min: Role, what: string): Promise<Membership> {
  const m = await s.models.Membership.findOne({ where: { userId: user.id, teamId } })
  if (!m) throw new NotFoundError(what)
  if (ROLE_RANK[m.role] < ROLE_RANK[min]) {
    throw new ForbiddenError(`This needs the ${min} role or higher in the team; you are ${m.role === 'analyst' ? 'an' : 'a'} ${m.role}.`)
  }
  return m
}

/** The user is a member of team :teamId with at least `min`. */
export function team(min: Role): Guard {
  return async (req, res, s) => {
    const user = signedInUser(res)
    const teamId = idOf(req, 'teamId', 'Team')
    const membership = await membershipFor(s, user, teamId, min, 'Team')
    const t = await s.models.Team.findByPk(teamId)
    if (!t) throw new NotFoundError('Team')
    res.locals.scope = { membership, team: t } satisfies Scope
  }
}

async function loadStar(s: Services, id: number): Promise<Star> {
  const star = await s.models.Star.findOne({ where: { id, archivedAt: null } })
  if (!star) throw new NotFoundError('Star')
  return star
}

/** Star :starId (not archived) belongs to a team where the user has at least `min`. */
export function star(min: Role): Guard {
  return async (req, res, s) => {
    const user = signedInUser(res)
    const st = await loadStar(s, idOf(req, 'starId', 'Star'))
    const membership = await membershipFor(s, user, st.teamId, min, 'Star')
    res.locals.scope = { membership, star: st } satisfies Scope
  }
}

export function dataset(min: Role): Guard {
  return async (req, res, s) => {
    const user = signedInUser(res)
    const ds = await s.models.Dataset.findByPk(idOf(req, 'datasetId', 'Dataset'))
    if (!ds) throw new NotFoundError('Dataset')
    const st = await s.models.Star.findByPk(ds.starId)
    if (!st || st.archivedAt) throw new NotFoundError('Dataset')
    const membership = await membershipFor(s, user, st.teamId, min, 'Dataset')
    res.locals.scope = { membership, star: st, dataset: ds } satisfies Scope
  }
}

export function measurement(min: Role): Guard {
  return async (req, res, s) => {
    const user = signedInUser(res)
    const m = await s.models.Measurement.findByPk(idOf(req, 'measurementId', 'Measurement'))
    if (!m) throw new NotFoundError('Measurement')
    const st = await s.models.Star.findByPk(m.starId)
    if (!st || st.archivedAt) throw new NotFoundError('Measurement')
    const membership = await membershipFor(s, user, st.teamId, min, 'Measurement')
    res.locals.scope = { membership, star: st, measurement: m } satisfies Scope
  }
}

/** Runs an Express middleware (rate limiter, multer) as a guard; it must call next(err) to refuse. */
export function middleware(pick: (s: Services & { extras: Extras }) => RequestHandler): Guard {
  return (req, res, s) => new Promise<void>((resolve, reject) => {
    pick(s as Services & { extras: Extras })(req, res, (err?: unknown) => (err ? reject(err) : resolve()))
  })
}

/** Per-app middleware instances (their state, such as rate-limit counters, belongs to one app). */
export interface Extras {
  loginLimiter: RequestHandler
  loginAddressLimiter: RequestHandler
  resetLimiter: RequestHandler
  shareLimiter: RequestHandler
  files: RequestHandler
}

export function createFilesMiddleware(s: Services): RequestHandler {
  return multer({
    storage: multer.memoryStorage(),
    defParamCharset: 'utf8', // browsers send UTF-8 file names
    limits: { fileSize: s.config.upload.maxBytes, files: s.config.upload.maxFiles, fields: 20, fieldSize: 2 * 1024 * 1024 },
  }).array('files', s.config.upload.maxFiles)
}

export const loginLimit = middleware((s) => s.extras.loginLimiter)
export const loginAddressLimit = middleware((s) => s.extras.loginAddressLimiter)
export const shareLimit = middleware((s) => s.extras.shareLimiter)
export const resetLimit = middleware((s) => s.extras.resetLimiter)
export const files = middleware((s) => s.extras.files)

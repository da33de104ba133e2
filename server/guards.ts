import type { Request, RequestHandler, Response } from 'express'
import multer from 'multer'
import type { Services } from './services.ts'
import { Star as StarModel, type Dataset, type Membership, type Measurement, type Star, type Team, type User } from './db/models.ts'
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

/**
 * The one parser of route ids (`:teamId`, `:starId`, `:version`…): a positive safe integer written
 * in its plain form ("12", not "012", "1e1" or "12.0"); anything else is 404 `what`, as an id
 * that does not exist.
 */
export function routeId(req: Request, name: string, what: string): number {
  const raw = req.params[name]
  const n = Number(raw)
  if (typeof raw !== 'string' || !Number.isSafeInteger(n) || n <= 0 || String(n) !== raw) throw new NotFoundError(what)
  return n
}

/**
 * The user's membership of team `teamId` with at least `min`, from a membership already loaded
 * (null: none): 404 outside the team (or outside an API token's team), 403 below `min`.
 */
function checkMembership(res: Response, m: Membership | null | undefined, teamId: number, min: Role, what: string): Membership {
  // a request made with an API token reaches the token's team only (others look as if they did not exist)
  const token = res.locals.apiToken as { teamId: number } | undefined
  if (token && token.teamId !== teamId) throw new NotFoundError(what)
  if (!m) throw new NotFoundError(what)
  if (ROLE_RANK[m.role] < ROLE_RANK[min]) {
    throw new ForbiddenError(`This needs the ${min} role or higher in the team; you are ${m.role === 'analyst' ? 'an' : 'a'} ${m.role}.`)
  }
  return m
}

/** The user is a member of team :teamId with at least `min` (membership and team in one query). */
export function team(min: Role): Guard {
  return withRole(min, async (req, res, s) => {
    const user = signedInUser(res)
    const teamId = routeId(req, 'teamId', 'Team')
    const token = res.locals.apiToken as { teamId: number } | undefined
    if (token && token.teamId !== teamId) throw new NotFoundError('Team')
    // plain SQL mapped onto the models (see starForUser)
    const [m] = await s.sequelize.query(
      `SELECT m.*, t.name AS team_name, t.created_at AS team_created_at, t.updated_at AS team_updated_at
         FROM memberships m JOIN teams t ON t.id = m.team_id WHERE m.user_id = :userId AND m.team_id = :teamId`,
      { replacements: { userId: user.id, teamId }, model: s.models.Membership, mapToModel: true },
    )
    const membership = checkMembership(res, m, teamId, min, 'Team')
    const v = membership.dataValues as unknown as Record<string, unknown>
    const t = s.models.Team.build({ id: teamId, name: v.team_name as string, createdAt: v.team_created_at as Date, updatedAt: v.team_updated_at as Date }, { isNewRecord: false, raw: true })
    dropExtra(membership, ['team_name', 'team_created_at', 'team_updated_at'])
    res.locals.scope = { membership, team: t } satisfies Scope
  })
}

/**
 * Star `id` (not archived) with the user's membership of its team as `viewer` (null: not a member),
 * in one query; plain SQL mapped onto the models, as findOne with an include cost more of the
 * event loop than the query took (CPU profile under load, issue 11).
 */
async function starForUser(s: Services, id: number, userId: number): Promise<Star | null> {
  const [st] = await s.sequelize.query(
    `SELECT s.*, m.id AS viewer_id, m.role AS viewer_role, m.created_at AS viewer_created_at, m.updated_at AS viewer_updated_at
       FROM stars s LEFT JOIN memberships m ON m.team_id = s.team_id AND m.user_id = :userId
      WHERE s.id = :id AND s.archived_at IS NULL`,
    { replacements: { id, userId }, model: s.models.Star, mapToModel: true },
  )
  if (!st) return null
  const v = st.dataValues as unknown as Record<string, unknown>
  const viewer = v.viewer_id == null ? null : s.models.Membership.build(
    { id: v.viewer_id as number, userId, teamId: st.teamId, role: v.viewer_role as Role, createdAt: v.viewer_created_at as Date, updatedAt: v.viewer_updated_at as Date },
    { isNewRecord: false, raw: true },
  )
  dropExtra(st, ['viewer_id', 'viewer_role', 'viewer_created_at', 'viewer_updated_at'])
  st.viewer = viewer
  return st
}

/** Removes the joined columns from an instance mapped from plain SQL (they are not its attributes). */
function dropExtra(instance: object, keys: string[]): void {
  const i = instance as { dataValues: Record<string, unknown>; _previousDataValues: Record<string, unknown> }
  for (const k of keys) { delete i.dataValues[k]; delete i._previousDataValues[k] }
}

/** A guard that requires a team role, labelled with that role (for the API description). */
export type RoleGuard = Guard & { minRole: Role }
function withRole(min: Role, g: Guard): RoleGuard {
  return Object.assign(g, { minRole: min })
}

/** How to find one kind of resource of a star and where the handler finds it. */
export interface ResourceSpec<T> {
  /** The route parameter holding its id. */
  param: string
  /** Its name in the 404 message ("Model not found."). */
  what: string
  /** The resource, or null when it does not exist (or is archived); `userId`: the signed-in user. */
  load: (s: Services, id: number, userId: number) => Promise<T | null>
  /** The star it belongs to: its team decides who may see it. */
  starIdOf: (resource: T) => number
  /** Records the resource for the handler (besides res.locals.scope's membership and star). */
  keep?: (res: Response, resource: T) => void
}

/**
 * The one access rule of a team resource, as a guard factory: signed in (401) → the resource
 * exists, its star is not archived and the user is in the star's team (404 otherwise, the same
 * answer as for an id that does not exist) → the role is at least `min` (403).
 */
export function resource<T>(spec: ResourceSpec<T>): (min: Role) => Guard {
  return (min) => withRole(min, async (req, res, s) => {
    const user = signedInUser(res)
    const found = await spec.load(s, routeId(req, spec.param, spec.what), user.id)
    if (!found) throw new NotFoundError(spec.what)
    const starId = spec.starIdOf(found)
    // one query for the star and the user's membership of its team (the star guard's load is that query)
    const st = found instanceof StarModel && found.id === starId && found.viewer !== undefined ? found : await starForUser(s, starId, user.id)
    if (!st || st.archivedAt) throw new NotFoundError(spec.what)
    const membership = checkMembership(res, st.viewer, st.teamId, min, spec.what)
    res.locals.scope = { membership, star: st } satisfies Scope
    spec.keep?.(res, found)
  })
}

/** Star :starId (not archived) belongs to a team where the user has at least `min`. */
export const star = resource<Star>({
  param: 'starId', what: 'Star', starIdOf: (st) => st.id,
  load: (s, id, userId) => starForUser(s, id, userId),
})

export const dataset = resource<Dataset>({
  param: 'datasetId', what: 'Dataset', starIdOf: (ds) => ds.starId,
  load: (s, id) => s.models.Dataset.findByPk(id),
  keep: (res, ds) => { scope(res).dataset = ds },
})

export const measurement = resource<Measurement>({
  param: 'measurementId', what: 'Measurement', starIdOf: (m) => m.starId,
  load: (s, id) => s.models.Measurement.findByPk(id),
  keep: (res, m) => { scope(res).measurement = m },
})

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

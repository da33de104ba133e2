import type { Request, Response, NextFunction, RequestHandler } from 'express'
import jwt from 'jsonwebtoken'
import { createHmac, createSecretKey, type KeyObject } from 'node:crypto'
import type { Services } from '../services.ts'
import type { User } from '../db/models.ts'
import { ForbiddenError } from '../errors.ts'
import { safeEqual } from './tokens.ts'
import { createSession, deleteSession, sessionUser } from './sessions.ts'
import { timeRequest } from '../db/timing.ts'

export const SESSION_COOKIE = 'starsway_session'
export const CSRF_COOKIE = 'starsway_csrf'
export const CSRF_HEADER = 'x-csrf-token'
export const SESSION_DAYS = 7

interface SessionClaims { sub: string; tv: number; sid?: string }

/** The session this request carries (set by sessionMiddleware when the cookie names a live session). */
export interface CurrentSession { id: string }

const signingKeys = new Map<string, KeyObject>()
/**
 * The JWT key as a KeyObject, made once per secret: given a string, jsonwebtoken first tries to
 * read it as a public key (createPublicKey, which throws) on every request — ~2 ms of the event
 * loop per request under load (CPU profile, issue 11). Same bytes, so tokens are unchanged.
 */
function signingKey(secret: string): KeyObject {
  let k = signingKeys.get(secret)
  if (!k) { k = createSecretKey(Buffer.from(secret, 'utf8')); signingKeys.set(secret, k) }
  return k
}

function cookieBase(s: Services) {
  return { sameSite: 'lax' as const, secure: s.config.env === 'production', path: '/' }
}

/**
 * The CSRF token of one session: HMAC-SHA256 of the session id under the server secret, so a
 * token planted in a cookie (or taken from another session) does not pass (OWASP CSRF cheat
 * sheet, "signed double-submit cookie"; common practice).
 */
export function csrfFor(s: Services, sessionId: string): string {
  return createHmac('sha256', s.config.jwtSecret).update(`csrf|${sessionId}`).digest('base64url')
}

/** Signs the user in: a server-side session, its id in a signed JWT (httpOnly cookie), and the readable CSRF cookie. */
export async function startSession(s: Services, res: Response, user: User): Promise<void> {
  const id = await createSession(s, user.id, SESSION_DAYS)
  const token = jwt.sign({ tv: user.tokenVersion, sid: id }, signingKey(s.config.jwtSecret), {
    subject: String(user.id), expiresIn: `${SESSION_DAYS}d`, algorithm: 'HS256',
  })
  res.cookie(SESSION_COOKIE, token, { ...cookieBase(s), httpOnly: true, maxAge: SESSION_DAYS * 86400_000 })
  res.locals.session = { id } satisfies CurrentSession
  issueCsrf(s, res)
}

/** Signs out: the session row is deleted, so the cookie (even a copy of it) no longer signs anyone in. */
export async function endSession(s: Services, res: Response): Promise<void> {
  const current = res.locals.session as CurrentSession | undefined
  if (current) await deleteSession(s, current.id)
  res.clearCookie(SESSION_COOKIE, { ...cookieBase(s), httpOnly: true })
  res.clearCookie(CSRF_COOKIE, cookieBase(s))
}

/** (Re)sets the CSRF cookie of the current session; nothing without one. */
export function issueCsrf(s: Services, res: Response): void {
  const current = res.locals.session as CurrentSession | undefined
  if (!current) return
  res.cookie(CSRF_COOKIE, csrfFor(s, current.id), { ...cookieBase(s), httpOnly: false, maxAge: SESSION_DAYS * 86400_000 })
}

/**
 * Reads the session cookie and loads the user into res.locals.user (null when absent, forged,
 * expired, signed out or older than the last password change). A database failure is passed on
 * (503 from the error middleware), never turned into a silent sign-out.
 */
export function sessionMiddleware(s: Services): RequestHandler {
  // the database-time diagnostic (server/db/timing.ts) starts here, so the session query counts
  return (req, res, next) => timeRequest(req, res, () => void loadSession(s, req, res, next))
}

async function loadSession(s: Services, req: Request, res: Response, next: NextFunction): Promise<void> {
  res.locals.user = null
  const token = req.cookies?.[SESSION_COOKIE] as string | undefined
  if (token) {
    let claims: SessionClaims | null = null
    try {
      claims = jwt.verify(token, signingKey(s.config.jwtSecret), { algorithms: ['HS256'] }) as unknown as SessionClaims
    } catch { /* expired or forged: treated as signed out */ }
    const userId = Number(claims?.sub)
    if (claims && typeof claims.sid === 'string' && Number.isSafeInteger(userId)) {
      try {
        const user = await sessionUser(s, claims.sid, userId)
        if (user && user.tokenVersion === claims.tv) {
          res.locals.user = user
          res.locals.session = { id: claims.sid } satisfies CurrentSession
        }
      } catch (err) {
        return next(err)
      }
    }
  }
  next()
}

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS'])

/**
 * CSRF check bound to the session: a state-changing request made within a live session must send
 * that session's token (the `starsway_csrf` cookie's value) in X-CSRF-Token. Requests without a
 * live session cannot act as anyone, so they pass here (protected routes answer 401).
 */
export function csrfMiddleware(s: Services): RequestHandler {
  return (req, res, next) => {
    const current = res.locals.session as CurrentSession | undefined
    if (SAFE.has(req.method) || !current) return next()
    const header = req.get(CSRF_HEADER)
    if (!header || !safeEqual(header, csrfFor(s, current.id))) {
      return next(new ForbiddenError('Missing or wrong CSRF token: send the value of the starsway_csrf cookie in the X-CSRF-Token header.'))
    }
    next()
  }
}

export function currentUser(res: Response): User | null {
  return (res.locals.user as User | null) ?? null
}

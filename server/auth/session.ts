import type { Request, Response, NextFunction, RequestHandler } from 'express'
import jwt from 'jsonwebtoken'
import { randomBytes } from 'node:crypto'
import type { Services } from '../services.ts'
import type { User } from '../db/models.ts'
import { ForbiddenError } from '../errors.ts'
import { safeEqual } from './tokens.ts'

export const SESSION_COOKIE = 'starsway_session'
export const CSRF_COOKIE = 'starsway_csrf'
export const CSRF_HEADER = 'x-csrf-token'
const SESSION_DAYS = 7

interface SessionClaims { sub: string; tv: number }

function cookieBase(s: Services) {
  return { sameSite: 'lax' as const, secure: s.config.env === 'production', path: '/' }
}

/** Signs the user in: a signed JWT in an httpOnly cookie, plus the readable CSRF cookie. */
export function startSession(s: Services, res: Response, user: User): void {
  const token = jwt.sign({ tv: user.tokenVersion }, s.config.jwtSecret, {
    subject: String(user.id), expiresIn: `${SESSION_DAYS}d`, algorithm: 'HS256',
  })
  res.cookie(SESSION_COOKIE, token, { ...cookieBase(s), httpOnly: true, maxAge: SESSION_DAYS * 86400_000 })
  issueCsrf(s, res)
}

export function endSession(s: Services, res: Response): void {
  res.clearCookie(SESSION_COOKIE, { ...cookieBase(s), httpOnly: true })
  res.clearCookie(CSRF_COOKIE, cookieBase(s))
}

export function issueCsrf(s: Services, res: Response, existing?: string): string {
  const value = existing ?? randomBytes(24).toString('base64url')
  res.cookie(CSRF_COOKIE, value, { ...cookieBase(s), httpOnly: false, maxAge: SESSION_DAYS * 86400_000 })
  return value
}

/** Reads the session cookie and loads the user into res.locals.user (null when absent or stale). */
export function sessionMiddleware(s: Services): RequestHandler {
  return async (req: Request, res: Response, next: NextFunction) => {
    res.locals.user = null
    const token = req.cookies?.[SESSION_COOKIE] as string | undefined
    if (token) {
      let claims: SessionClaims | null = null
      try {
        claims = jwt.verify(token, s.config.jwtSecret, { algorithms: ['HS256'] }) as unknown as SessionClaims
      } catch { /* expired or forged: treated as signed out */ }
      if (claims) {
        try {
          const user = await s.models.User.findByPk(Number(claims.sub))
          if (user && user.tokenVersion === claims.tv) res.locals.user = user
        } catch (err) {
          return next(err) // a database failure is a 500, not a silent sign-out
        }
      }
    }
    next()
  }
}

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS'])

/**
 * Double-submit CSRF check: a state-changing request that carries a session cookie must send the
 * `starsway_csrf` cookie's value in X-CSRF-Token. Requests without a session cookie cannot act
 * as anyone, so they pass here (and protected routes answer 401).
 */
export function csrfMiddleware(): RequestHandler {
  return (req, _res, next) => {
    if (SAFE.has(req.method) || !req.cookies?.[SESSION_COOKIE]) return next()
    const cookie = req.cookies?.[CSRF_COOKIE] as string | undefined
    const header = req.get(CSRF_HEADER)
    if (!cookie || !header || !safeEqual(cookie, header)) {
      return next(new ForbiddenError('Missing or wrong CSRF token: send the value of the starsway_csrf cookie in the X-CSRF-Token header.'))
    }
    next()
  }
}

export function currentUser(res: Response): User | null {
  return (res.locals.user as User | null) ?? null
}

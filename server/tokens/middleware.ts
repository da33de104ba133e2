import type { NextFunction, Request, RequestHandler, Response } from 'express'
import type { Services } from '../services.ts'
import { ForbiddenError, UnauthorizedError } from '../errors.ts'
import { tokenUser, type TokenScope } from './service.ts'

const SAFE = new Set(['GET', 'HEAD', 'OPTIONS'])
/** Routes a token never reaches: the account, tokens themselves, team creation and membership, mail. */
const ACCOUNT_ONLY = [/^\/api\/auth\//, /^\/api\/teams\/?$/, /^\/api\/teams\/\d+\/tokens/, /^\/api\/invitations\//, /^\/api\/dev\//]

/** The token scope of this request, when it came with `Authorization: Bearer sw_…` instead of a session. */
export function apiTokenScope(res: Response): TokenScope | null {
  return (res.locals.apiToken as TokenScope | undefined) ?? null
}

/**
 * Signs a request in from a personal API token when it carries no session. A bearer header is not
 * sent by browsers on their own, so these requests need no CSRF token. A wrong, revoked or expired
 * token is a 401 (never a silent anonymous request); a read-only token that writes is a 403.
 */
export function apiTokenMiddleware(s: Services): RequestHandler {
  return async (req: Request, res: Response, next: NextFunction) => {
    const header = req.get('authorization')
    if (!header || res.locals.user) return next()
    const m = /^Bearer\s+(\S+)$/i.exec(header)
    if (!m) return next(new UnauthorizedError('The Authorization header must be "Bearer <token>".'))
    try {
      const found = await tokenUser(s, m[1]!)
      if (!found) return next(new UnauthorizedError('This API token is unknown, revoked or expired: create a new one on the team page.'))
      if (ACCOUNT_ONLY.some((r) => r.test(req.baseUrl + req.path))) return next(new ForbiddenError('API tokens reach a team\'s data only; sign in to manage the account, teams or tokens.'))
      if (found.scope.readOnly && !SAFE.has(req.method)) return next(new ForbiddenError('This API token is read-only.'))
      res.locals.user = found.user
      res.locals.apiToken = found.scope
      next()
    } catch (err) {
      next(err)
    }
  }
}

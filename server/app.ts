import express, { type Express, type NextFunction, type Request, type Response } from 'express'
import helmet from 'helmet'
import cookieParser from 'cookie-parser'
import { pinoHttp } from 'pino-http'
import { pino, type Logger } from 'pino'
import { rateLimit, ipKeyGenerator } from 'express-rate-limit'
import { existsSync } from 'node:fs'
import { randomUUID } from 'node:crypto'
import { join, resolve } from 'node:path'
import type { Sequelize } from 'sequelize'
import type { Config } from './config.ts'
import type { Models } from './db/models.ts'
import type { Mailer } from './mail/mailer.ts'
import type { Services } from './services.ts'
import { routes } from './routes.ts'
import { health } from './dev/routes.ts'
import { errorForLog, errorMiddleware, HttpError, NotFoundError } from './errors.ts'
import { normaliseEmail } from '../shared/api/auth.ts'
import { refuseUnstorableText } from './input.ts'
import { csrfMiddleware, sessionMiddleware } from './auth/session.ts'
import { apiTokenMiddleware } from './tokens/middleware.ts'
import { createFilesMiddleware, type Extras } from './guards.ts'

export interface AppDeps {
  config: Config
  sequelize: Sequelize
  models: Models
  mailer: Mailer
  logger?: Logger
  /** Folder of the built client; served with an SPA fallback when it exists. Default `dist/`. */
  distDir?: string
}

/** Client address + normalised e-mail: " V@t.test" and "v@t.test" share one counter. */
function addressAndEmail(req: Request): string {
  const email = (req.body as { email?: unknown } | undefined)?.email
  return `${ipKeyGenerator(req.ip ?? '')}|${typeof email === 'string' ? normaliseEmail(email) : ''}`
}

/**
 * Failed sign-ins per address + e-mail: only a wrong password (401) counts. Refusals of the input
 * (400), the limit itself (429) and outages (503) leave the counter as it was, so a database
 * outage locks nobody out.
 */
function signInLimiter(windowMs: number, limit: number, key: (req: Request) => string) {
  return rateLimit({
    windowMs, limit, skipSuccessfulRequests: true, requestWasSuccessful: (_req, res) => res.statusCode !== 401,
    standardHeaders: 'draft-8', legacyHeaders: false, keyGenerator: key,
    handler: (_req, _res, next) => next(new HttpError(429, 'rate_limited', 'Too many failed sign-in attempts: wait 15 minutes and try again, or reset your password.')),
  })
}

/** Every request counts except those the server failed (5xx). */
function requestLimiter(windowMs: number, limit: number, what: string, key: (req: Request, res: Response) => string) {
  return rateLimit({
    windowMs, limit, skipFailedRequests: true, requestWasSuccessful: (_req, res) => res.statusCode < 500,
    standardHeaders: 'draft-8', legacyHeaders: false, keyGenerator: key,
    handler: (_req, _res, next) => next(new HttpError(429, 'rate_limited', `Too many ${what}: wait and try again later.`)),
  })
}

/** Access-log form of a URL: link tokens (invitations, resets) never reach the log. */
export function loggedUrl(url: string): string {
  return url
    .replace(/(\/api\/invitations\/)[^/?#]+/, '$1<token>')
    .replace(/([?&](?:token|inviteToken)=)[^&#]*/g, '$1<token>')
}

/** Builds the Express app around its dependencies; `index.ts` listens, tests call it directly. */
export function createApp(deps: AppDeps): Express {
  const { config } = deps
  const logger = deps.logger ?? pino({ level: config.env === 'test' ? 'silent' : 'info' })
  const services: Services = { config, sequelize: deps.sequelize, models: deps.models, mailer: deps.mailer }
  const extras: Extras = {
    loginLimiter: signInLimiter(15 * 60_000, config.loginRateLimit, addressAndEmail),
    // one address trying many e-mails (credential stuffing)
    loginAddressLimiter: signInLimiter(15 * 60_000, config.loginRateLimit * 10, (req) => ipKeyGenerator(req.ip ?? '')),
    resetLimiter: requestLimiter(15 * 60_000, config.loginRateLimit, 'password reset attempts', addressAndEmail),
    shareLimiter: requestLimiter(60 * 60_000, config.shareRateLimit, 'share messages in an hour', (req, res) => `user|${(res.locals.user as { id?: number } | null)?.id ?? ipKeyGenerator(req.ip ?? '')}`),
    files: createFilesMiddleware(services),
  }
  const s = Object.assign({}, services, { extras })

  const app = express()
  app.disable('x-powered-by')
  app.set('trust proxy', 'loopback')
  app.use(pinoHttp({
    logger,
    genReqId: (req) => (req.headers['x-request-id'] as string | undefined) ?? randomUUID(),
    autoLogging: { ignore: (req) => req.url === '/api/health' }, // polled often; a line each would flood the log
    // one short line per request: no headers (they carry the session cookie)
    serializers: {
      req: (req: { id: unknown; method: string; url: string }) => ({ id: req.id, method: req.method, url: loggedUrl(req.url) }),
      res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
      err: errorForLog,
    },
  }))
  app.use(helmet({
    contentSecurityPolicy: {
      directives: {
        // 'wasm-unsafe-eval' lets the page and its workers compile our own WebAssembly (the dense GP
        // Cholesky kernel, shared/rv/gp/dense-wasm.ts); it allows no JavaScript eval
        defaultSrc: ["'self'"], scriptSrc: ["'self'", "'wasm-unsafe-eval'"], styleSrc: ["'self'", "'unsafe-inline'"], imgSrc: ["'self'", 'data:', 'blob:'],
        fontSrc: ["'self'", 'data:'], connectSrc: ["'self'"], workerSrc: ["'self'", 'blob:'], objectSrc: ["'none'"],
        frameAncestors: ["'none'"], baseUri: ["'self'"], formAction: ["'self'"],
        upgradeInsecureRequests: config.env === 'production' ? [] : null,
      },
    },
  }))
  // liveness first: no logging, body parsing, session lookup (a database query) or CSRF check
  app.get('/api/health', (req, res) => { res.set('Cache-Control', 'no-store'); health(req, res) })
  app.use(cookieParser())
  app.use(express.json({ limit: '1mb' }))
  app.use(refuseUnstorableText)
  // API answers carry user data: never stored by the browser or a proxy
  app.use('/api', (_req, res, next) => { res.set('Cache-Control', 'no-store'); next() })
  app.use(sessionMiddleware(s))
  app.use('/api', apiTokenMiddleware(s))
  app.use('/api', csrfMiddleware(s))

  for (const route of routes) {
    app[route.method](route.path, async (req: Request, res: Response) => {
      for (const guard of route.guards) await guard(req, res, s)
      await route.handler(req, res, s)
    })
  }
  app.use('/api', (_req, _res, next: NextFunction) => next(new NotFoundError('Route')))

  const dist = resolve(deps.distDir ?? 'dist')
  if (existsSync(join(dist, 'index.html'))) {
    app.use(express.static(dist, { index: false, maxAge: '1h' }))
    app.get('/{*splat}', (_req, res) => res.sendFile(join(dist, 'index.html')))
  }

  app.use(errorMiddleware({
    maxUploadBytes: config.upload.maxBytes,
    log: (err, requestId) => logger.error({ err: errorForLog(err), requestId }, 'unexpected error'),
    warn: (err) => logger.warn({ err: errorForLog(err) }, 'database unavailable: answered 503'),
  }))
  return app
}

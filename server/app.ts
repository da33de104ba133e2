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
import { errorMiddleware, HttpError, NotFoundError } from './errors.ts'
import { csrfMiddleware, sessionMiddleware } from './auth/session.ts'
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

function limiter(windowMs: number, limit: number, what: string, skipSuccessfulRequests: boolean) {
  return rateLimit({
    windowMs, limit, skipSuccessfulRequests, standardHeaders: 'draft-8', legacyHeaders: false,
    keyGenerator: (req) => `${ipKeyGenerator(req.ip ?? '')}|${String((req.body as { email?: unknown } | undefined)?.email ?? '').toLowerCase()}`,
    handler: (_req, _res, next) => next(new HttpError(429, 'rate_limited', `Too many ${what} attempts: wait 15 minutes and try again.`)),
  })
}

/** Builds the Express app around its dependencies; `index.ts` listens, tests call it directly. */
export function createApp(deps: AppDeps): Express {
  const { config } = deps
  const logger = deps.logger ?? pino({ level: config.env === 'test' ? 'silent' : 'info' })
  const services: Services = { config, sequelize: deps.sequelize, models: deps.models, mailer: deps.mailer }
  const extras: Extras = {
    loginLimiter: limiter(15 * 60_000, config.loginRateLimit, 'sign-in', true),
    resetLimiter: limiter(15 * 60_000, config.loginRateLimit, 'password reset', false),
    files: createFilesMiddleware(services),
  }
  const s = Object.assign({}, services, { extras })

  const app = express()
  app.disable('x-powered-by')
  app.set('trust proxy', 'loopback')
  app.use(pinoHttp({
    logger,
    genReqId: (req) => (req.headers['x-request-id'] as string | undefined) ?? randomUUID(),
    // one short line per request: no headers (they carry the session cookie)
    serializers: {
      req: (req: { id: unknown; method: string; url: string }) => ({ id: req.id, method: req.method, url: req.url }),
      res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
    },
  }))
  app.use(helmet({
    contentSecurityPolicy: {
      directives: {
        defaultSrc: ["'self'"], scriptSrc: ["'self'"], styleSrc: ["'self'", "'unsafe-inline'"], imgSrc: ["'self'", 'data:', 'blob:'],
        fontSrc: ["'self'", 'data:'], connectSrc: ["'self'"], workerSrc: ["'self'", 'blob:'], objectSrc: ["'none'"],
        frameAncestors: ["'none'"], baseUri: ["'self'"], formAction: ["'self'"],
        upgradeInsecureRequests: config.env === 'production' ? [] : null,
      },
    },
  }))
  app.use(cookieParser())
  app.use(express.json({ limit: '1mb' }))
  app.use(sessionMiddleware(s))
  app.use('/api', csrfMiddleware())

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
    log: (err, requestId) => logger.error({ err, requestId }, 'unexpected error'),
  }))
  return app
}

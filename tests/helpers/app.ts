// A full Starsway app for tests: its own database, a real local SMTP server on a random port
// writing to a temp folder, a mailer pointing at it, and optionally the demo seed and a listening
// HTTP server (for browser tests; it then also serves dist/ when built).
import { createServer, type Server } from 'node:http'
import { mkdtemp, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { AddressInfo } from 'node:net'
import type { Express } from 'express'
import { createApp } from '../../server/app.ts'
import { loadConfig, type Config } from '../../server/config.ts'
import { initModels, type Models } from '../../server/db/index.ts'
import { createMailer } from '../../server/mail/mailer.ts'
import { listDevMail, startDevMailServer } from '../../server/mail/dev-server.ts'
import type { DevMailMessage } from '../../shared/api/misc.ts'
import { seed as seedDemo, type SeedResult } from '../../scripts/seed.ts'
import { createTestDatabase, type TestDatabase } from './db.ts'

export interface TestAppOptions {
  /** Seed the demo teams, users and stars (and upload fixtures/demo/*.csv when present). */
  seed?: boolean
  /** Listen on 127.0.0.1:0 and report baseUrl (needed by a browser). */
  listen?: boolean
  /** Config fields to override (e.g. a small upload limit). */
  config?: Partial<Config>
  /** Folder of the built client to serve (default dist/). */
  distDir?: string
}

export interface TestMail {
  messages(): Promise<DevMailMessage[]>
  /** Resolves with the first message matching `predicate`, polling the mail folder. */
  waitFor(predicate: (m: DevMailMessage) => boolean, timeoutMs?: number): Promise<DevMailMessage>
}

export interface TestApp {
  app: Express
  baseUrl?: string
  config: Config
  db: TestDatabase
  models: Models
  seed?: SeedResult
  mail: TestMail
  close(): Promise<void>
}

export async function startTestApp(opts: TestAppOptions = {}): Promise<TestApp> {
  const db = await createTestDatabase()
  const mailDir = await mkdtemp(join(tmpdir(), 'starsway-mail-'))
  const smtp = await startDevMailServer({ port: 0, dir: mailDir })
  let server: Server | undefined
  let baseUrl: string | undefined
  if (opts.listen) {
    server = createServer()
    await new Promise<void>((r) => server!.listen(0, '127.0.0.1', () => r()))
    baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`
  }
  const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: db.url }, {
    bcryptCost: 4, mailDir, appUrl: baseUrl ?? 'http://starsway.test',
    smtp: { host: '127.0.0.1', port: smtp.port, from: 'Starsway <no-reply@starsway.test>' },
    ...opts.config,
  })
  const models = initModels(db.sequelize)
  const mailer = createMailer(config.smtp)
  const app = createApp({ config, sequelize: db.sequelize, models, mailer, distDir: opts.distDir })
  if (server) server.on('request', app)
  const seed = opts.seed ? await seedDemo({ sequelize: db.sequelize, models, config }) : undefined

  const mail: TestMail = {
    messages: () => listDevMail(mailDir),
    async waitFor(predicate, timeoutMs = 5000) {
      const end = Date.now() + timeoutMs
      for (;;) {
        const found = (await listDevMail(mailDir)).find(predicate)
        if (found) return found
        if (Date.now() > end) throw new Error(`no matching e-mail within ${timeoutMs} ms`)
        await new Promise((r) => setTimeout(r, 50))
      }
    },
  }
  return {
    app, baseUrl, config, db, models, seed, mail,
    async close() {
      if (server) {
        server.closeAllConnections()
        await new Promise<void>((r) => server!.close(() => r()))
      }
      mailer.close()
      await smtp.close()
      await db.drop()
      await rm(mailDir, { recursive: true, force: true })
    },
  }
}

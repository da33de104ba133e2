// Regression tests of issue 11, holes 1 and 2: the sign-in rate limit keys on the normalised
// e-mail and counts only wrong passwords; a database outage answers 503 + Retry-After, the
// readiness route says so, and failed sign-ins during the outage lock nobody out.
import { createServer, Socket, type Server } from 'node:net'
import type { AddressInfo } from 'node:net'
import bcrypt from 'bcryptjs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Express } from 'express'
import { createApp } from '../../server/app.ts'
import { loadConfig } from '../../server/config.ts'
import { createSequelize, initModels } from '../../server/db/index.ts'
import { createMailer } from '../../server/mail/mailer.ts'
import { createTestDatabase, type TestDatabase } from '../helpers/db.ts'
import { anonymous, signIn } from './client.ts'
import type { Sequelize } from 'sequelize'

/** A TCP relay in front of PostgreSQL that can be cut (connections reset, port closed) and restored: an outage. */
class Relay {
  private server: Server | null = null
  private sockets = new Set<Socket>()
  port = 0
  constructor(private readonly target: { host: string; port: number }) {}
  async open(): Promise<void> {
    this.server = createServer((client) => {
      const upstream = new Socket()
      upstream.connect(this.target.port, this.target.host)
      for (const sock of [client, upstream]) { this.sockets.add(sock); sock.on('close', () => this.sockets.delete(sock)); sock.on('error', () => sock.destroy()) }
      client.pipe(upstream).pipe(client)
    })
    await new Promise<void>((r) => this.server!.listen(this.port, '127.0.0.1', () => r()))
    this.port = (this.server!.address() as AddressInfo).port
  }
  async cut(): Promise<void> {
    for (const sock of this.sockets) sock.destroy()
    await new Promise<void>((r) => this.server!.close(() => r()))
    this.server = null
  }
}

const PASSWORD = 'correct horse battery'
const EMAIL = 'v@t.test'
let db: TestDatabase
let relay: Relay
let sequelize: Sequelize
let app: Express

beforeAll(async () => {
  db = await createTestDatabase()
  const url = new URL(db.url)
  relay = new Relay({ host: url.hostname, port: Number(url.port) })
  await relay.open()
  url.port = String(relay.port)
  sequelize = createSequelize(url.toString(), { pool: 3 })
  const models = initModels(sequelize)
  const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: url.toString() }, { bcryptCost: 4, loginRateLimit: 5, appUrl: 'http://starsway.test' })
  await models.User.create({ email: EMAIL, name: 'Vera', passwordHash: await bcrypt.hash(PASSWORD, 4) })
  await models.User.create({ email: 'w@t.test', name: 'Wim', passwordHash: await bcrypt.hash(PASSWORD, 4) })
  app = createApp({ config, sequelize, models, mailer: createMailer({ host: '127.0.0.1', port: 9, from: 'x@starsway.test' }) })
})
afterAll(async () => {
  await sequelize?.close().catch(() => undefined)
  await db?.drop()
})

describe('hole 1: the sign-in limit keys on the normalised e-mail', () => {
  it('a locked account stays locked under spaces and capitals, and only wrong passwords count', async () => {
    const c = anonymous(app)
    // refusals of the input do not count
    for (let i = 0; i < 8; i++) await c.post('/api/auth/login', { email: EMAIL, password: '' }).expect(400)
    for (let i = 0; i < 5; i++) await c.post('/api/auth/login', { email: EMAIL, password: `guess number ${i}` }).expect(401)
    for (const variant of [` ${EMAIL}`, `${EMAIL}  `, 'V@T.TEST', ` V@t.Test `]) {
      const res = await c.post('/api/auth/login', { email: variant, password: PASSWORD })
      expect(res.status, variant).toBe(429)
      expect(res.body.error.code).toBe('rate_limited')
    }
    // another account from the same address is not locked
    await signIn(app, 'w@t.test', PASSWORD)
  })
})

describe('hole 2: a database outage', () => {
  it('answers 503 with Retry-After, readiness fails, health stays cheap, and nobody is locked out afterwards', async () => {
    const before = await anonymous(app).get('/api/health/ready')
    expect(before.status).toBe(200)
    expect(before.body).toMatchObject({ ok: true, database: 'up' })
    const session = await signIn(app, 'w@t.test', PASSWORD)

    await relay.cut()
    try {
      // 12 sign-ins with the right password during the outage: more than the limit of 5
      for (let i = 0; i < 12; i++) {
        const res = await anonymous(app).post('/api/auth/login', { email: 'w@t.test', password: PASSWORD })
        expect(res.status).toBe(503)
        expect(res.headers['retry-after']).toMatch(/^\d+$/)
        expect(res.body.error.code).toBe('unavailable')
        expect(res.body.error.message).toMatch(/database is not reachable/)
      }
      const me = await session.get('/api/auth/me')
      expect(me.status).toBe(503) // not a silent sign-out (401), not "Something went wrong" (500)
      const ready = await anonymous(app).get('/api/health/ready')
      expect(ready.status).toBe(503)
      expect(ready.headers['retry-after']).toBeDefined()
      await anonymous(app).get('/api/health').expect(200)
    } finally {
      await relay.open()
    }
    await anonymous(app).get('/api/health/ready').expect(200)
    await signIn(app, 'w@t.test', PASSWORD)
    await session.get('/api/auth/me').expect(200)
  })
})

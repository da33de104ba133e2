// Regression tests of issue 11, holes 6 and 7 (logs): an over-long instrument name is a 4xx with a
// short log, errors never log SQL values, and invitation or reset tokens never reach the access log.
import { Writable } from 'node:stream'
import { pino } from 'pino'
import { DatabaseError } from 'sequelize'
import request from 'supertest'
import type { Express } from 'express'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createApp, loggedUrl } from '../../server/app.ts'
import { errorForLog } from '../../server/errors.ts'
import { loadConfig } from '../../server/config.ts'
import { initModels } from '../../server/db/index.ts'
import { createMailer } from '../../server/mail/mailer.ts'
import { seed } from '../../scripts/seed.ts'
import { newToken } from '../../server/auth/tokens.ts'
import { createTestDatabase, type TestDatabase } from '../helpers/db.ts'
import { signIn } from './client.ts'
import { EMAIL } from './roles.ts'

const lines: string[] = []
let db: TestDatabase
let app: Express
let teamId: number

beforeAll(async () => {
  db = await createTestDatabase()
  const models = initModels(db.sequelize)
  const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: db.url }, { bcryptCost: 4, appUrl: 'http://starsway.test' })
  const logger = pino({ level: 'info' }, new Writable({ write(chunk, _enc, cb) { lines.push(String(chunk)); cb() } }))
  app = createApp({ config, sequelize: db.sequelize, models, mailer: createMailer({ host: '127.0.0.1', port: 9, from: 'x@starsway.test' }), logger })
  teamId = (await seed({ sequelize: db.sequelize, models, config }, { fixturesDir: '/nonexistent' })).teamId!
})
afterAll(async () => { await db?.drop() })

describe('hole 7: what the logs keep', () => {
  it('invitation and reset tokens never reach the access log', async () => {
    const { token } = newToken()
    await request(app).get(`/api/invitations/${token}`).expect(404)
    await request(app).post(`/api/invitations/${token}/accept`).expect(401)
    await request(app).get(`/reset?token=${token}&x=1`)
    expect(lines.join('\n')).not.toContain(token)
    expect(lines.some((l) => l.includes('/api/invitations/<token>'))).toBe(true)
    expect(loggedUrl(`/invite?token=${token}`)).toBe('/invite?token=<token>')
  })

  it('an error is logged without its SQL or bound values', () => {
    const secret = 'x'.repeat(6_000_000)
    const err = new DatabaseError(Object.assign(new Error('value too long for type character varying(120)'), {
      code: '22001', sql: 'INSERT INTO datasets (instrument) VALUES ($1)', parameters: [secret],
    }) as never)
    Object.assign(err, { sql: 'INSERT INTO datasets (instrument) VALUES ($1)', parameters: [secret] })
    const logged = JSON.stringify(errorForLog(err))
    expect(logged.length).toBeLessThan(10_000)
    expect(logged).not.toContain('xxxxxxxxxx')
    expect(logged).not.toContain('INSERT')
    expect(logged).toContain('22001')
  })
})

describe('hole 6: an instrument name longer than its column', () => {
  it('answers 4xx with a message, and the log stays short', async () => {
    const c = await signIn(app, EMAIL.analyst)
    const star = await c.post(`/api/teams/${teamId}/stars`, { name: 'Long Names', massMsun: 1, massErrMsun: 0.1 }).expect(201)
    const long = 'I'.repeat(5000)
    const table = `# bjd rv err instrument\n2459000.5 10.0 1.0 ${long}\n2459001.5 12.0 1.1 ${long}\n2459002.5 9.0 1.0 ${long}\n`
    const pre = await c.upload(`/api/stars/${star.body.id}/uploads/preview`, [{ name: 'long.txt', content: table }])
    const before = lines.length
    let status = pre.status
    if (pre.status === 200) {
      const mapping = pre.body.files[0].detection.mapping
      const res = await c.upload(`/api/stars/${star.body.id}/uploads/commit`, [{ name: 'long.txt', content: table }], { mappings: { 'long.txt': mapping } })
      status = res.status
      expect(res.body.error?.message ?? '', JSON.stringify(res.body).slice(0, 500)).toMatch(/long|characters/i)
    }
    const unexpected = lines.slice(before).filter((l) => l.includes('unexpected error')).map((l) => l.slice(0, 2000))
    expect(unexpected, unexpected.join('\n')).toEqual([])
    expect(status).toBeGreaterThanOrEqual(400)
    expect(status).toBeLessThan(500)
    for (const l of lines.slice(before)) expect(l.length).toBeLessThan(10_000)
    expect(await db.sequelize.query(`SELECT count(*)::int AS n FROM datasets WHERE star_id = ${Number(star.body.id)}`, { plain: true })).toMatchObject({ n: 0 })
  })
})

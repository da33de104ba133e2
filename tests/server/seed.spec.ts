import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { QueryTypes } from 'sequelize'
import { startTestApp, type TestApp } from '../helpers/app.ts'
import { createTestDatabase } from '../helpers/db.ts'
import { createMigrator } from '../../server/db/index.ts'
import { seed, DEMO_USERS } from '../../scripts/seed.ts'
import { signIn } from './client.ts'

let t: TestApp
beforeAll(async () => { t = await startTestApp() })
afterAll(async () => { await t?.close() })

describe('demo seed', () => {
  it('creates the two invented teams, four users and three stars with their demo tables', async () => {
    const r = await seed({ sequelize: t.db.sequelize, models: t.models, config: t.config })
    expect(r.seeded).toBe(true)
    expect(await t.models.User.count()).toBe(4)
    expect(await t.models.Team.count()).toBe(2)
    expect((await t.models.Star.findAll({ order: [['name', 'ASC']] })).map((s) => s.name)).toEqual(["Corvin's Lamp", 'Tarn Meridian', 'Vela Sorrel'])

    const analyst = await signIn(t.app, DEMO_USERS.analyst.email)
    const stars = await analyst.get(`/api/teams/${r.teamId}/stars`).expect(200)
    const vela = stars.body.find((s: { name: string }) => s.name === 'Vela Sorrel')
    // counts from fixtures/demo/README.md
    expect(vela).toMatchObject({ massMsun: 0.92, massErrMsun: 0.04, nPoints: 220 })
    expect([...vela.instruments].sort()).toEqual(['Harrier', 'Kestrel'])
    const corvin = stars.body.find((s: { name: string }) => s.name === "Corvin's Lamp")
    expect(corvin.nPoints).toBe(129)
    const ms = await analyst.get(`/api/stars/${vela.id}/measurements`).expect(200)
    expect(Object.keys(ms.body[0].indicators).sort()).toEqual(['bisector_span', 'fwhm', 's_index'])

    const piet = await signIn(t.app, DEMO_USERS.otherOwner.email)
    expect((await piet.get('/api/teams').expect(200)).body).toEqual([{ id: r.otherTeamId, name: 'Quillmere Observatory Group', role: 'owner' }])
    await piet.get(`/api/stars/${vela.id}`).expect(404)
  })

  it('does nothing the second time', async () => {
    const before = await t.models.Measurement.count()
    const r = await seed({ sequelize: t.db.sequelize, models: t.models, config: t.config })
    expect(r.seeded).toBe(false)
    const forced = await seed({ sequelize: t.db.sequelize, models: t.models, config: t.config }, { force: true })
    expect(forced.seeded).toBe(false)
    expect(await t.models.Measurement.count()).toBe(before)
  })

  it('skips a missing demo table with a message', async () => {
    const db = await createTestDatabase()
    try {
      const { initModels } = await import('../../server/db/index.ts')
      const messages: string[] = []
      const r = await seed({ sequelize: db.sequelize, models: initModels(db.sequelize), config: t.config }, { fixturesDir: '/nonexistent', log: (m) => messages.push(m) })
      expect(r.seeded).toBe(true)
      expect(messages.filter((m) => /is missing/.test(m))).toHaveLength(3)
    } finally {
      await db.drop()
    }
    // the app's own database is untouched: models are bound per Sequelize instance
    expect(await t.models.User.count()).toBe(4)
  })
})

describe('migrations', () => {
  it('go down to zero and up again', async () => {
    const db = await createTestDatabase()
    try {
      const migrator = createMigrator(db.sequelize)
      expect((await migrator.executed()).length).toBeGreaterThan(0)
      await migrator.down({ to: 0 })
      const tables = async () => (await db.sequelize.query<{ t: string }>(
        `SELECT table_name AS t FROM information_schema.tables WHERE table_schema = 'public' ORDER BY 1`, { type: QueryTypes.SELECT })).map((r) => r.t)
      expect(await tables()).toEqual(['schema_migrations'])
      await migrator.up()
      expect(await tables()).toEqual(expect.arrayContaining(['audit_log', 'datasets', 'invitations', 'measurements', 'memberships', 'password_resets', 'raw_files', 'schema_migrations', 'stars', 'teams', 'users']))
      expect((await migrator.pending()).length).toBe(0)
    } finally {
      await db.drop()
    }
  })
})

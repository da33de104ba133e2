// Seeds the invented demo teams, users and stars into DATABASE_URL, uploading the demo tables in
// fixtures/demo/ through the same ingest + commit path as the web upload.
//   tsx scripts/seed.ts            does nothing when any user exists (never seeds over real data)
//   tsx scripts/seed.ts --force    seeds even when other users exist (not when the demo team is there)
import bcrypt from 'bcryptjs'
import { existsSync, readFileSync } from 'node:fs'
import { join, resolve } from 'node:path'
import { pathToFileURL } from 'node:url'
import type { Sequelize } from 'sequelize'
import type { Config } from '../server/config.ts'
import type { Models } from '../server/db/models.ts'
import type { Services } from '../server/services.ts'
import { commit } from '../server/uploads/service.ts'
import { record } from '../server/audit/service.ts'
import { decodeTableBytes, detectTable } from '../shared/ingest/index.ts'

export const DEMO_PASSWORD = 'starsway-demo'
export const DEMO_USERS = {
  owner: { email: 'nadia.owner@lanternfield.test', name: 'Nadia Owner' },
  analyst: { email: 'tomas.analyst@lanternfield.test', name: 'Tomas Analyst' },
  reviewer: { email: 'ines.reviewer@lanternfield.test', name: 'Ines Reviewer' },
  otherOwner: { email: 'piet@quillmere.test', name: 'Piet Quillmere' },
} as const
export const DEMO_TEAM = 'Lanternfield Velocity Survey'
export const OTHER_TEAM = 'Quillmere Observatory Group'
export const DEMO_STARS = [
  { name: 'Vela Sorrel', massMsun: 0.92, massErrMsun: 0.04, luminosityLsun: 0.71, teffK: 5480, file: 'vela-sorrel.csv' },
  { name: "Corvin's Lamp", massMsun: 1.08, massErrMsun: 0.05, luminosityLsun: 1.35, teffK: 6010, file: 'corvins-lamp.csv' },
  { name: 'Tarn Meridian', massMsun: 0.81, massErrMsun: 0.03, luminosityLsun: 0.42, teffK: 5120, file: 'tarn-meridian.csv' },
] as const

export interface SeedDeps { sequelize: Sequelize; models: Models; config: Config }
export interface SeedResult { seeded: boolean; message: string; teamId?: number; otherTeamId?: number; starIds?: Record<string, number> }

export async function seed(deps: SeedDeps, opts: { force?: boolean; fixturesDir?: string; log?: (m: string) => void } = {}): Promise<SeedResult> {
  const log = opts.log ?? (() => {})
  const { models } = deps
  if (!opts.force && (await models.User.count()) > 0) return { seeded: false, message: 'Users exist already: the demo was not seeded.' }
  if (await models.User.findOne({ where: { email: DEMO_USERS.owner.email } })) return { seeded: false, message: 'The demo team exists already.' }

  const s: Services = { ...deps, mailer: { send: async () => {}, close: () => {} } }
  const passwordHash = await bcrypt.hash(DEMO_PASSWORD, deps.config.bcryptCost)
  const { team, other, users } = await deps.sequelize.transaction(async (transaction) => {
    const mk = (u: { email: string; name: string }) => models.User.create({ ...u, passwordHash }, { transaction })
    const users = { owner: await mk(DEMO_USERS.owner), analyst: await mk(DEMO_USERS.analyst), reviewer: await mk(DEMO_USERS.reviewer), otherOwner: await mk(DEMO_USERS.otherOwner) }
    const team = await models.Team.create({ name: DEMO_TEAM }, { transaction })
    const other = await models.Team.create({ name: OTHER_TEAM }, { transaction })
    await models.Membership.bulkCreate([
      { teamId: team.id, userId: users.owner.id, role: 'owner' },
      { teamId: team.id, userId: users.analyst.id, role: 'analyst' },
      { teamId: team.id, userId: users.reviewer.id, role: 'reviewer' },
      { teamId: other.id, userId: users.otherOwner.id, role: 'owner' },
    ], { transaction })
    return { team, other, users }
  })

  const starIds: Record<string, number> = {}
  const dir = resolve(opts.fixturesDir ?? 'fixtures/demo')
  for (const def of DEMO_STARS) {
    const star = await models.Star.create({
      teamId: team.id, name: def.name, massMsun: def.massMsun, massErrMsun: def.massErrMsun, luminosityLsun: def.luminosityLsun,
      teffK: def.teffK, radiusRsun: null, raDeg: null, decDeg: null, notes: 'Invented demo star.', archivedAt: null,
    })
    await record(s, { teamId: team.id, userId: users.owner.id, action: 'star.create', entity: 'star', entityId: star.id, detail: { name: def.name } })
    starIds[def.name] = star.id
    const path = join(dir, def.file)
    if (!existsSync(path)) { log(`Demo table ${path} is missing: ${def.name} has no data yet.`); continue }
    const buffer = readFileSync(path)
    const mapping = detectTable(decodeTableBytes(new Uint8Array(buffer)), {}).mapping
    const out = await commit(s, users.analyst, star, [{ originalname: def.file, buffer, size: buffer.length }], { [def.file]: mapping })
    log(`${def.name}: ${out.measurementsCreated} measurements from ${def.file} (${out.datasets.map((d) => `${d.instrument} ${d.count}`).join(', ')}).`)
  }
  return { seeded: true, message: `Seeded ${DEMO_TEAM} and ${OTHER_TEAM}.`, teamId: team.id, otherTeamId: other.id, starIds }
}

if (process.argv[1] && import.meta.url === pathToFileURL(resolve(process.argv[1])).href) {
  const { loadConfig } = await import('../server/config.ts')
  const { createSequelize, initModels } = await import('../server/db/index.ts')
  const config = loadConfig()
  const sequelize = createSequelize(config.databaseUrl, { pool: 2 })
  try {
    const result = await seed({ sequelize, models: initModels(sequelize), config }, { force: process.argv.includes('--force'), log: console.log })
    console.log(result.message)
  } finally {
    await sequelize.close()
  }
}

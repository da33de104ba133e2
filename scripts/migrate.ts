// Migrates DATABASE_URL to the latest schema: `tsx scripts/migrate.ts` (up) or `--down` (back to 0).
import { createMigrator, createSequelize } from '../server/db/index.ts'
import { loadConfig } from '../server/config.ts'

const config = loadConfig()
const sequelize = createSequelize(config.databaseUrl, { pool: 2 })
try {
  const migrator = createMigrator(sequelize)
  if (process.argv.includes('--down')) {
    const done = await migrator.down({ to: 0 })
    console.log(`Reverted ${done.length} migration(s).`)
  } else {
    const done = await migrator.up()
    console.log(done.length ? `Applied ${done.map((m) => m.name).join(', ')}.` : 'Schema is up to date.')
  }
} finally {
  await sequelize.close()
}

// Test databases on the throwaway cluster of TEST_DATABASE_URL (an admin URL, set by scripts/test.sh):
// one migrated template made once per run, cloned per test file so files run in parallel, isolated.
import { randomBytes } from 'node:crypto'
import type { Sequelize } from 'sequelize'
import { createMigrator, createSequelize } from '../../server/db/index.ts'

const TEMPLATE = 'starsway_test_template'

function adminUrl(): string {
  const url = process.env.TEST_DATABASE_URL
  if (!url) throw new Error('TEST_DATABASE_URL is not set: run the API tests through scripts/test.sh')
  return url
}

function urlFor(db: string): string {
  const u = new URL(adminUrl())
  u.pathname = `/${db}`
  return u.toString()
}

interface AdminClient { query(sql: string): Promise<unknown> }

async function admin<T>(fn: (c: AdminClient) => Promise<T>): Promise<T> {
  const sequelize = createSequelize(adminUrl(), { pool: 1 })
  try { return await fn({ query: (sql) => sequelize.query(sql) }) } finally { await sequelize.close() }
}

/** Creates the migrated template database (dropping an old one). Called once, from global-setup. */
export async function prepareTemplate(): Promise<void> {
  await admin(async (c) => {
    await c.query(`DROP DATABASE IF EXISTS ${TEMPLATE} WITH (FORCE)`)
    await c.query(`CREATE DATABASE ${TEMPLATE}`)
  })
  const sequelize = createSequelize(urlFor(TEMPLATE), { pool: 1 })
  try { await createMigrator(sequelize).up() } finally { await sequelize.close() }
}

export interface TestDatabase { name: string; url: string; sequelize: Sequelize; drop(): Promise<void> }

/** A fresh database cloned from the template, with its own Sequelize instance. */
export async function createTestDatabase(): Promise<TestDatabase> {
  const name = `starsway_t_${process.pid}_${randomBytes(4).toString('hex')}`
  await admin(async (c) => {
    for (let attempt = 0; ; attempt++) {
      try { await c.query(`CREATE DATABASE ${name} TEMPLATE ${TEMPLATE}`); return }
      catch (err) {
        // another file cloning the template at the same moment: wait and retry
        if (attempt >= 20 || !/being accessed by other users/.test(String(err))) throw err
        await new Promise((r) => setTimeout(r, 100 + Math.random() * 200))
      }
    }
  })
  const url = urlFor(name)
  const sequelize = createSequelize(url, { pool: 5 })
  return {
    name, url, sequelize,
    async drop() {
      await sequelize.close()
      await admin((c) => c.query(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`))
    },
  }
}

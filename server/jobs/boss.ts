// The job queue: pg-boss 10 on the application's PostgreSQL database, schema `pgboss`.
// The schema and the queues are created by migration 0003 (so every database that is migrated can
// take jobs); a worker's `boss.start()` only checks and, after an upgrade, migrates it.
import PgBoss from 'pg-boss'
import type { Sequelize } from 'sequelize'

export const BOSS_SCHEMA = 'pgboss'
/** Queue of posterior sampling runs: job data `{ runId }`. */
export const SAMPLING_QUEUE = 'sampling'
export const QUEUES = [SAMPLING_QUEUE] as const

/** pg-boss's database adapter interface (`executeSql(text, values)` → a pg result). */
export interface BossDb { executeSql(text: string, values?: unknown[]): Promise<{ rows: unknown[]; rowCount?: number | null }> }

interface PgConnection { query(text: string, values?: unknown[]): Promise<{ rows: unknown[]; rowCount: number | null }> }
interface ConnectionManager { getConnection(o: { type: 'write' }): Promise<PgConnection>; releaseConnection(c: PgConnection): Promise<void> | void }

/** Runs pg-boss's SQL on a connection of the Sequelize pool (no second pool for sending jobs). */
export function sequelizeBossDb(sequelize: Sequelize): BossDb {
  const cm = sequelize.connectionManager as unknown as ConnectionManager
  return {
    async executeSql(text, values) {
      const c = await cm.getConnection({ type: 'write' })
      try { return await c.query(text, values) } finally { await cm.releaseConnection(c) }
    },
  }
}

/**
 * A pg-boss instance that is never started: it only sends, cancels and reads jobs, through the
 * Sequelize pool. This is what the API uses; the workers (`startJobWorkers`) have their own.
 */
export function createJobSender(sequelize: Sequelize): PgBoss {
  return new PgBoss({ db: sequelizeBossDb(sequelize), schema: BOSS_SCHEMA } as PgBoss.ConstructorOptions)
}

/** Creates the pg-boss schema and the queues (migration 0003; idempotent for the queues). */
export async function installJobSchema(sequelize: Sequelize): Promise<void> {
  const [rows] = await sequelize.query(`SELECT 1 FROM information_schema.tables WHERE table_schema = '${BOSS_SCHEMA}' AND table_name = 'version'`)
  if (!rows.length) await sequelize.query(PgBoss.getConstructionPlans(BOSS_SCHEMA))
  const sender = createJobSender(sequelize)
  for (const q of QUEUES) if (!(await sender.getQueue(q))) await sender.createQueue(q)
}

/** A started pg-boss with its own small pool, for a process that works on jobs. */
export async function startBoss(databaseUrl: string, onError: (err: Error) => void, applicationName?: string): Promise<PgBoss> {
  const boss = new PgBoss({
    connectionString: databaseUrl, schema: BOSS_SCHEMA, max: 4, ...(applicationName ? { application_name: applicationName } : {}),
    // maintenance also expires jobs whose worker vanished without a trace (backstop of the
    // heartbeat check in server/sampling/runner.ts)
    maintenanceIntervalSeconds: 60,
  })
  boss.on('error', onError)
  await boss.start()
  for (const q of QUEUES) if (!(await boss.getQueue(q))) await boss.createQueue(q)
  return boss
}

import { Sequelize } from 'sequelize'
import { instrument, resetPoolPeaks, timingOptions } from './timing.ts'

export interface PoolOptions {
  /** Most connections open at once (default 20). */
  pool?: number
  /** Keep every connection open once made (min = max), for the API; warmPool() makes them at start. */
  keepOpen?: boolean
}

/**
 * One Sequelize instance per database URL; SQL logging stays off (pino logs requests).
 * Pool (issue 11, 50 users on 2 cores): a query holds a connection for its round trip, which under
 * load lasts far longer than the query itself (tens of ms against well under one), and a write
 * holds one for its whole transaction; with 10 connections reads queued behind each other and
 * behind the writes (p99 wait ~350 ms of a ~700 ms p99). 20 keeps that queue short while staying
 * far below PostgreSQL's 100. Idle ones close after 30 s (not 10) unless `keepOpen`.
 */
export function createSequelize(url: string, opts: PoolOptions = {}): Sequelize {
  const max = opts.pool ?? 20
  const sequelize = new Sequelize(url, {
    dialect: 'postgres',
    ...timingOptions(), // off (logging: false) unless STARSWAY_DB_TIMING names a file
    pool: { max, min: opts.keepOpen ? max : 0, idle: 30_000 },
    define: { underscored: true },
  })
  minimum.set(sequelize, opts.keepOpen ? max : 0)
  instrument(sequelize, max)
  return sequelize
}

const minimum = new WeakMap<Sequelize, number>()

/**
 * Opens the pool's kept connections now, all at once (the API at start), so the first burst of
 * requests does not wait for new PostgreSQL backends: on the loaded 2-core machine opening one
 * took ~700 ms, and the ~20 opened during a 50-user ramp were the reads' p99 (issue 11). A
 * connection that fails to open is left to be made on demand, as without this.
 */
export async function warmPool(sequelize: Sequelize): Promise<void> {
  const n = minimum.get(sequelize) ?? 0
  const cm = sequelize.connectionManager
  const opened = await Promise.allSettled(Array.from({ length: n }, () => cm.getConnection({ type: 'write' })))
  for (const c of opened) if (c.status === 'fulfilled') cm.releaseConnection(c.value)
  resetPoolPeaks() // the diagnostic's peaks describe requests, not this
}

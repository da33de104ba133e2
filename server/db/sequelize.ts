import { Sequelize } from 'sequelize'
import { availableParallelism } from 'node:os'
import { instrument, resetPoolPeaks, timingOptions } from './timing.ts'

export interface PoolOptions {
  /** Most connections open at once (default {@link defaultPoolSize}). */
  pool?: number
  /** Keep every connection open once made (min = max), for the API; warmPool() makes them at start. */
  keepOpen?: boolean
}

/**
 * One Sequelize instance per database URL; SQL logging stays off (pino logs requests).
 *
 * Pool size (issue 11, 50 users on 2 cores, PostgreSQL on the same machine): {@link defaultPoolSize},
 * about four connections per core. Measured with scripts/load.ts after the reads came down to two
 * round trips: 20 connections let bursts of ~40 queries time-slice in 20 backends on 2 cores (reads'
 * p99 306–347 ms, most of it waiting in PostgreSQL); 10 gave 257–372 ms; 8 gave 164–262 ms with the
 * connection wait near 0, since the queries then finish one after another instead of all slowly.
 * Idle ones close after 30 s unless `keepOpen`.
 */
export function defaultPoolSize(cores = availableParallelism()): number {
  return Math.min(20, Math.max(4, 4 * cores))
}

export function createSequelize(url: string, opts: PoolOptions = {}): Sequelize {
  const max = opts.pool ?? defaultPoolSize()
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

import { Sequelize } from 'sequelize'
import { instrument, timingOptions } from './timing.ts'

/**
 * One Sequelize instance per database URL; SQL logging stays off (pino logs requests).
 * Pool (issue 11, 50 users on 2 cores): a query holds a connection for its round trip, which under
 * load lasts far longer than the query itself (tens of ms against well under one), and a write
 * holds one for its whole transaction; with 10 connections reads queued behind each other and
 * behind the writes (p99 wait ~350 ms of a ~700 ms p99). 20 keeps that queue short while staying
 * far below PostgreSQL's 100. Idle ones close after 30 s (not 10), so a pause between bursts does
 * not make the next burst open new backends.
 */
export function createSequelize(url: string, opts: { pool?: number } = {}): Sequelize {
  const max = opts.pool ?? 20
  const sequelize = new Sequelize(url, {
    dialect: 'postgres',
    ...timingOptions(), // off (logging: false) unless STARSWAY_DB_TIMING names a file
    pool: { max, min: 0, idle: 30_000 },
    define: { underscored: true },
  })
  instrument(sequelize, max)
  return sequelize
}

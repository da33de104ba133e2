// Diagnostic: where a request's database time goes, per route (issue 11, the read latency tail).
// Off unless STARSWAY_DB_TIMING names a file; then every request (from the session lookup on)
// counts its queries, the time it waited for a pool connection and the time its queries took,
// and the totals per route are written to that file as JSON every 2 s (scripts/load.ts
// --db-timing FILE prints them). Query counts do not depend on what else runs on the machine;
// the wait/query split says whether the tail is the pool (too few connections, held too long)
// or PostgreSQL itself. Nothing is kept per request beyond its own counters.
import { AsyncLocalStorage } from 'node:async_hooks'
import { writeFileSync } from 'node:fs'
import type { Request, Response } from 'express'
import type { Sequelize } from 'sequelize'

interface RequestDb { queries: number; waitMs: number; queryMs: number }
interface RouteTotals { n: number; queries: number; waitMs: number; queryMs: number; totalMs: number; waits: number[]; totals: number[]; inQueries: number[] }

const store = new AsyncLocalStorage<RequestDb>()
const routes = new Map<string, RouteTotals>()
const acquireStart = new WeakMap<object, number>()
let file: string | null = null
let outside = { queries: 0, waitMs: 0, queryMs: 0 }
let pool = { max: 0, waiting: 0, maxWaiting: 0, maxUsed: 0, connects: 0, connectMs: 0, maxConnectMs: 0 }
let connectStart: number[] = []

/** The file named by STARSWAY_DB_TIMING, or null when the diagnostic is off. */
export function dbTimingFile(): string | null {
  return process.env.STARSWAY_DB_TIMING || null
}

/** Sequelize options that time every query (benchmark + a logging callback), when the diagnostic is on. */
export function timingOptions(): { benchmark?: boolean; logging: false | ((sql: string, ms?: number) => void) } {
  if (!dbTimingFile()) return { logging: false }
  return {
    benchmark: true,
    logging: (_sql, ms) => {
      const st = store.getStore() ?? outside
      st.queries++
      st.queryMs += ms ?? 0
    },
  }
}

/** Hooks timing the wait for a pool connection (a query inside a transaction waits for none). */
export function instrument(sequelize: Sequelize, max: number): void {
  file = dbTimingFile()
  if (!file) return
  pool.max = max
  // new connections (a PostgreSQL backend each): how many and how long they took to open
  sequelize.addHook('beforeConnect', () => { connectStart.push(performance.now()) })
  sequelize.addHook('afterConnect', () => {
    const ms = performance.now() - (connectStart.shift() ?? performance.now())
    pool.connects++; pool.connectMs += ms; pool.maxConnectMs = Math.max(pool.maxConnectMs, ms)
  })
  sequelize.addHook('beforePoolAcquire', (options) => { acquireStart.set(options as object, performance.now()); pool.waiting++; pool.maxWaiting = Math.max(pool.maxWaiting, pool.waiting) })
  sequelize.addHook('afterPoolAcquire', (_connection, options) => {
    pool.waiting--
    const t0 = acquireStart.get(options as object)
    if (t0 === undefined) return
    const st = store.getStore() ?? outside
    st.waitMs += performance.now() - t0
    // connections in use right now (sequelize's pool wraps sequelize-pool)
    const p = (sequelize.connectionManager as unknown as { pool?: { using?: number } }).pool
    if (typeof p?.using === 'number') pool.maxUsed = Math.max(pool.maxUsed, p.using)
  })
  setInterval(() => {
    const out = {
      at: new Date().toISOString(), pool, outside,
      routes: Object.fromEntries(routes),
    }
    try { writeFileSync(file!, JSON.stringify(out)) } catch { /* diagnostic only */ }
  }, 2000).unref()
}

/** Runs the rest of the request inside its own counters (a no-op when the diagnostic is off). */
export function timeRequest(req: Request, res: Response, next: () => void): void {
  if (!file) return next()
  const st: RequestDb = { queries: 0, waitMs: 0, queryMs: 0 }
  const t0 = performance.now()
  res.on('finish', () => {
    const key = `${req.method} ${(req.route as { path?: string } | undefined)?.path ?? req.path}`
    const r = routes.get(key) ?? { n: 0, queries: 0, waitMs: 0, queryMs: 0, totalMs: 0, waits: [], totals: [], inQueries: [] }
    const total = performance.now() - t0
    r.n++; r.queries += st.queries; r.waitMs += st.waitMs; r.queryMs += st.queryMs; r.totalMs += total
    r.waits.push(Math.round(st.waitMs)); r.totals.push(Math.round(total)); r.inQueries.push(Math.round(st.queryMs))
    routes.set(key, r)
  })
  store.run(st, next)
}

/** Forgets the pool's peaks (after warmPool opened every connection at once). */
export function resetPoolPeaks(): void { pool.maxWaiting = 0; pool.maxUsed = 0 }

/** Forgets the totals (tests). */
export function resetTiming(): void { routes.clear(); outside = { queries: 0, waitMs: 0, queryMs: 0 }; pool = { max: pool.max, waiting: 0, maxWaiting: 0, maxUsed: 0, connects: 0, connectMs: 0, maxConnectMs: 0 }; connectStart = [] }

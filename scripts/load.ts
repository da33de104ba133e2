// Load test: N signed-in users on loopback against a running API, a realistic mix of reads and
// computations for a bounded time; prints p50/p95/p99 per request kind, the errors, and the API's
// memory (RSS) before, right after, and a minute after the load, and the API's event-loop delay p99
// over the last minute of the load (from /api/health; use --duration 60 or more).
//
//   node --import tsx scripts/load.ts [--url http://127.0.0.1:3000] [--users 50] [--duration 120]
//        [--pid API_PID] [--settle 60] [--password starsway-demo] [--db-timing FILE] [--reads-only] [--burst]
//
// --reads-only: the same users and reads, without the periodograms and fits (their effect on reads).
// --burst: every user sends its first request at the same moment (by default each starts after a
// think time of its own).
// --db-timing: the file an API started with STARSWAY_DB_TIMING=FILE writes (server/db/timing.ts);
// then the database side is printed per route: queries per request, time waiting for a pool
// connection and time in queries (means, and the p99 of the pool wait), over the load only.
//
// The users are sessions of the demo team's analyst, owner and reviewer (scripts/seed.ts): each
// session is one browser. Reviewers only read. Loopback only: the URL must be 127.0.0.1/localhost.
// Targets (issue 11, 2-core machine, 50 users): reads p99 ≤ 300 ms, periodogram/fit p99 ≤ 2 s,
// health p99 ≤ 50 ms, RSS a minute after ≤ 1.2 × before, 0 errors. Speed lives here, never in tests.
import { readFileSync } from 'node:fs'
import { parseArgs } from 'node:util'
import { availableParallelism, loadavg } from 'node:os'
import { monitorEventLoopDelay } from 'node:perf_hooks'

const { values: args } = parseArgs({
  options: {
    url: { type: 'string', default: 'http://127.0.0.1:3000' },
    users: { type: 'string', default: '50' },
    duration: { type: 'string', default: '120' },
    settle: { type: 'string', default: '60' },
    pid: { type: 'string' },
    password: { type: 'string', default: 'starsway-demo' },
    seed: { type: 'string', default: '11' },
    'db-timing': { type: 'string' },
    'reads-only': { type: 'boolean', default: false },
    burst: { type: 'boolean', default: false },
  },
})
const BASE = args.url!.replace(/\/$/, '')
if (!/^https?:\/\/(127\.0\.0\.1|localhost|\[::1\])(:\d+)?$/.test(BASE)) throw new Error(`--url must be on loopback, not ${BASE}`)
const USERS = Number(args.users)
const DURATION_MS = Number(args.duration) * 1000
const SETTLE_MS = Number(args.settle) * 1000
const ACCOUNTS = [
  { email: 'tomas.analyst@lanternfield.test', writes: true },
  { email: 'nadia.owner@lanternfield.test', writes: true },
  { email: 'ines.reviewer@lanternfield.test', writes: false },
]

/** Mulberry32: a small seeded generator, so two runs make the same choices (common practice). */
function random(seed: number): () => number {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6d2b79f5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}
const rand = random(Number(args.seed))

class Session {
  private cookies = new Map<string, string>()
  constructor(readonly email: string, readonly writes: boolean) {}
  private cookieHeader(): string { return [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ') }
  async call(method: string, path: string, body?: unknown): Promise<{ status: number; body: unknown }> {
    const headers: Record<string, string> = { cookie: this.cookieHeader() }
    if (body !== undefined) headers['content-type'] = 'application/json'
    const csrf = this.cookies.get('starsway_csrf')
    if (csrf && method !== 'GET') headers['x-csrf-token'] = decodeURIComponent(csrf)
    const res = await fetch(`${BASE}${path}`, { method, headers, body: body === undefined ? undefined : JSON.stringify(body) })
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(';')
      const i = pair!.indexOf('=')
      this.cookies.set(pair!.slice(0, i), pair!.slice(i + 1))
    }
    // the response is complete when its last byte has arrived; parsing it is this client's own work,
    // done only when a caller reads `body` (set-up, error examples), outside the timed span
    const text = await res.text()
    let parsed: unknown
    return {
      status: res.status,
      get body(): unknown {
        if (parsed === undefined) { try { parsed = JSON.parse(text) } catch { parsed = text /* PDF, CSV */ } }
        return parsed
      },
    }
  }
}

// --- measurements -------------------------------------------------------------------------------
/** Every timed request: its kind, when it started (ms since the load began) and how long it took. */
const timings: Array<{ kind: string; at: number; ms: number }> = []
let loadStart = performance.now()
const errors = new Map<string, number>()
const errorExamples: string[] = []
async function timed(kind: string, fn: () => Promise<{ status: number; body: unknown }>, ok: (status: number) => boolean = (s) => s < 400): Promise<unknown> {
  const t0 = performance.now()
  try {
    const r = await fn()
    const ms = performance.now() - t0
    timings.push({ kind, at: t0 - loadStart, ms })
    if (!ok(r.status)) {
      errors.set(kind, (errors.get(kind) ?? 0) + 1)
      if (errorExamples.length < 10) errorExamples.push(`${kind}: ${r.status} ${JSON.stringify(r.body).slice(0, 200)}`)
    }
    return r
  } catch (err) {
    errors.set(kind, (errors.get(kind) ?? 0) + 1)
    if (errorExamples.length < 10) errorExamples.push(`${kind}: ${(err as Error).message}`)
    return null
  }
}
function quantile(sorted: number[], q: number): number {
  if (sorted.length === 0) return NaN
  const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1)) // nearest rank
  return sorted[i]!
}
function rssMb(pid: string | undefined): number | null {
  if (!pid) return null
  try {
    const m = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'))
    return m ? Number(m[1]) / 1024 : null
  } catch { return null }
}

// --- the mix ------------------------------------------------------------------------------------
interface World { teamId: number; starIds: number[]; peaks: Map<number, number>; models: Map<Session, number> }
type Action = { kind: string; weight: number; writes?: boolean; run: (s: Session, w: World) => Promise<unknown> }
const pick = <T>(xs: T[]): T => xs[Math.floor(rand() * xs.length)]!

const ACTIONS: Action[] = [
  { kind: 'health', weight: 8, run: (s) => timed('health', () => s.call('GET', '/api/health')) },
  { kind: 'list stars', weight: 20, run: (s, w) => timed('list stars', () => s.call('GET', `/api/teams/${w.teamId}/stars`)) },
  { kind: 'star', weight: 10, run: (s, w) => timed('star', () => s.call('GET', `/api/stars/${pick(w.starIds)}`)) },
  { kind: 'measurements', weight: 18, run: (s, w) => timed('measurements', () => s.call('GET', `/api/stars/${pick(w.starIds)}/measurements`)) },
  { kind: 'models', weight: 8, run: (s, w) => timed('models', () => s.call('GET', `/api/stars/${pick(w.starIds)}/models`)) },
  { kind: 'periodograms', weight: 6, run: (s, w) => timed('periodograms', () => s.call('GET', `/api/stars/${pick(w.starIds)}/periodograms`)) },
  { kind: 'me', weight: 6, run: (s) => timed('me', () => s.call('GET', '/api/auth/me')) },
  { kind: 'periodogram', weight: 5, writes: true, run: (s, w) => timed('periodogram', () => s.call('POST', `/api/stars/${pick(w.starIds)}/periodograms`, { kind: 'rv' })) },
  // each writing session fits its own model (two people refitting one model at once get 409, by design)
  { kind: 'fit', weight: 3, writes: true, run: (s, w) => timed('fit', () => s.call('POST', `/api/models/${w.models.get(s)}/fit`, {})) },
]

async function setUp(): Promise<{ sessions: Session[]; world: World }> {
  const sessions: Session[] = []
  for (let i = 0; i < USERS; i++) {
    const a = ACCOUNTS[i % ACCOUNTS.length]!
    const s = new Session(a.email, a.writes)
    const r = await s.call('POST', '/api/auth/login', { email: a.email, password: args.password })
    if (r.status !== 200) throw new Error(`sign-in of ${a.email} failed (${r.status}): is the demo seeded? ${JSON.stringify(r.body)}`)
    sessions.push(s)
  }
  const analyst = sessions[0]!
  const me = (await analyst.call('GET', '/api/auth/me')).body as { memberships: Array<{ teamId: number }> }
  const teamId = me.memberships[0]!.teamId
  const stars = (await analyst.call('GET', `/api/teams/${teamId}/stars`)).body as Array<{ id: number; name: string }>
  const starIds = stars.map((x) => x.id)
  // the top periodogram peak of each star, then one model per writing session (a planet there)
  const peaks = new Map<number, number>()
  for (const starId of starIds) {
    const pg = await analyst.call('POST', `/api/stars/${starId}/periodograms`, { kind: 'rv' })
    const peak = (pg.body as { result?: { peaks?: Array<{ period: number }> } }).result?.peaks?.[0]
    if (pg.status === 201 && peak) peaks.set(starId, peak.period)
  }
  if (peaks.size === 0) throw new Error('no stars with data: seed the demo first (npm start seeds an empty database)')
  const models = new Map<Session, number>()
  const withPeaks = [...peaks]
  for (const [i, s] of sessions.filter((x) => x.writes).entries()) {
    const [starId, period] = withPeaks[i % withPeaks.length]!
    const m = await s.call('POST', `/api/stars/${starId}/models`, { name: `Load test ${i} ${Date.now()}`, spec: { planets: [{ period }], trend: 'none' } })
    if (m.status !== 201) throw new Error(`creating a model failed (${m.status}): ${JSON.stringify(m.body)}`)
    models.set(s, (m.body as { id: number }).id)
  }
  return { sessions, world: { teamId, starIds, peaks, models } }
}

async function user(s: Session, w: World, until: number): Promise<void> {
  // --reads-only: nobody runs periodograms or fits during the load (is the reads' tail theirs?)
  const actions = ACTIONS.filter((a) => !a.writes || (s.writes && !args['reads-only']))
  const total = actions.reduce((t, a) => t + a.weight, 0)
  // each user starts after a think time of its own, as people do: all 50 sending their first
  // request in the same millisecond made a burst no real team makes, and that burst alone
  // filled the 99th percentile of every read (the slowest-requests line below shows when)
  // (--burst keeps that burst, to see what the slowest of 50 simultaneous requests waits)
  if (!args.burst) await new Promise((res) => setTimeout(res, 300 + rand() * 1200))
  while (Date.now() < until) {
    let r = rand() * total
    const a = actions.find((x) => (r -= x.weight) < 0) ?? actions[0]!
    await a.run(s, w)
    await new Promise((res) => setTimeout(res, 300 + rand() * 1200)) // think time 0.3–1.5 s
  }
}

const READS = new Set(['list stars', 'star', 'measurements', 'models', 'periodograms', 'me'])
function report(before: number | null, after: number | null, settled: number | null): void {
  const samples = new Map<string, number[]>()
  for (const x of timings) { if (!samples.has(x.kind)) samples.set(x.kind, []); samples.get(x.kind)!.push(x.ms) }
  const rows = [...samples].map(([kind, xs]) => {
    const s = [...xs].sort((a, b) => a - b)
    return { kind, n: s.length, p50: quantile(s, 0.5), p95: quantile(s, 0.95), p99: quantile(s, 0.99), errors: errors.get(kind) ?? 0 }
  }).sort((a, b) => a.kind.localeCompare(b.kind))
  const f = (x: number) => (Number.isFinite(x) ? x.toFixed(0).padStart(7) : '      -')
  console.log(`\n${USERS} users, ${args.duration} s on ${BASE}; machine load average at the end ${loadavg().map((x) => x.toFixed(1)).join(' ')} on ${availableParallelism()} cores`)
  console.log('kind              n      p50 ms  p95 ms  p99 ms  errors  target p99')
  for (const r of rows) {
    const target = r.kind === 'health' ? 50 : READS.has(r.kind) ? 300 : 2000
    console.log(`${r.kind.padEnd(16)} ${String(r.n).padStart(5)} ${f(r.p50)} ${f(r.p95)} ${f(r.p99)} ${String(r.errors).padStart(7)}  ${String(target).padStart(6)} ${r.p99 <= target ? 'ok' : 'MISSED'}`)
  }
  // when the slowest 1 % of all requests started: one stall or spread over the run?
  const slowest = [...timings].sort((a, b) => b.ms - a.ms).slice(0, Math.max(1, Math.ceil(timings.length / 100)))
  const bySecond = new Map<number, number>()
  for (const x of slowest) bySecond.set(Math.floor(x.at / 1000), (bySecond.get(Math.floor(x.at / 1000)) ?? 0) + 1)
  console.log(`slowest 1 % (${slowest.length} requests, ≥ ${slowest.at(-1)?.ms.toFixed(0) ?? '-'} ms) started at second: `
    + [...bySecond].sort((a, b) => a[0] - b[0]).map(([sec, n]) => (n > 1 ? `${sec} (×${n})` : `${sec}`)).join(', '))
  const errs = [...errors.values()].reduce((a, b) => a + b, 0)
  console.log(`errors: ${errs}${errorExamples.length ? `\n  ${errorExamples.join('\n  ')}` : ''}`)
  if (before !== null) {
    const ratio = settled !== null ? settled / before : NaN
    console.log(`API RSS: before ${before.toFixed(0)} MB, right after ${after?.toFixed(0) ?? '?'} MB, ${args.settle} s later ${settled?.toFixed(0) ?? '?'} MB (${ratio.toFixed(2)} × before; target ≤ 1.2 ${ratio <= 1.2 ? 'ok' : 'MISSED'})`)
  } else {
    console.log('API RSS: pass --pid to read it from /proc')
  }
}

/** The API's own event-loop delay over its last minute (server/loop-delay.ts, in /api/health), or null. */
async function loopDelay(): Promise<{ p99Ms: number; maxMs: number; seconds: number } | null> {
  try {
    const body = await (await fetch(`${BASE}/api/health`)).json() as { eventLoop?: { p99Ms: number; maxMs: number; seconds: number } }
    return body.eventLoop ?? null
  } catch { return null }
}

// --- the API's database timing (server/db/timing.ts), as a difference over the load -------------
interface RouteTiming { n: number; queries: number; waitMs: number; queryMs: number; totalMs: number; waits: number[]; totals: number[]; inQueries?: number[] }
interface DbTiming { pool: { max: number; maxWaiting: number; maxUsed: number; connects?: number; connectMs?: number; maxConnectMs?: number }; outside: { queries: number; waitMs: number; queryMs: number }; routes: Record<string, RouteTiming> }
function readDbTiming(): DbTiming | null {
  if (!args['db-timing']) return null
  try { return JSON.parse(readFileSync(args['db-timing'], 'utf8')) as DbTiming } catch { return null }
}
function reportDbTiming(a: DbTiming | null, b: DbTiming | null): void {
  if (!args['db-timing']) return
  if (!b) { console.log(`database timing: ${args['db-timing']} unreadable (start the API with STARSWAY_DB_TIMING=${args['db-timing']})`); return }
  const f = (x: number) => x.toFixed(1).padStart(8)
  console.log(`\ndatabase side per route over the load (pool max ${b.pool.max}; most connections in use ${b.pool.maxUsed}, most queries waiting for one ${b.pool.maxWaiting}, since the API started, after its warm-up)`)
  console.log('route                                         n  queries/req  wait ms/req  p99 wait  query ms/req  total ms/req  p99 total   slowest 1 %: wait + queries + rest')
  for (const [k, r] of Object.entries(b.routes).sort()) {
    const o = a?.routes[k]
    const n = r.n - (o?.n ?? 0)
    if (n <= 0) continue
    const waits = r.waits.slice(o?.waits.length ?? 0).sort((x, y) => x - y)
    const from = o?.totals.length ?? 0
    const totals = r.totals.slice(from).sort((x, y) => x - y)
    // where the slowest 1 % of requests spent their time: pool wait, queries, the rest (API code, event loop)
    const slow = r.totals.slice(from).map((t, i) => ({ t, w: r.waits[from + i]!, q: r.inQueries?.[from + i] ?? NaN }))
      .sort((x, y) => y.t - x.t).slice(0, Math.max(1, Math.ceil(n / 100)))
    const mean = (f: (x: typeof slow[number]) => number) => slow.reduce((a, x) => a + f(x), 0) / slow.length
    const split = `${mean((x) => x.w).toFixed(0)} + ${mean((x) => x.q).toFixed(0)} + ${mean((x) => x.t - x.w - x.q).toFixed(0)} ms`
    console.log(`${k.slice(0, 42).padEnd(42)} ${String(n).padStart(5)} ${f((r.queries - (o?.queries ?? 0)) / n)}     ${f((r.waitMs - (o?.waitMs ?? 0)) / n)} ${f(quantile(waits, 0.99))}  ${f((r.queryMs - (o?.queryMs ?? 0)) / n)}      ${f((r.totalMs - (o?.totalMs ?? 0)) / n)}  ${f(quantile(totals, 0.99))}   ${split}`)
  }
  const nc = (b.pool.connects ?? 0) - (a?.pool.connects ?? 0)
  if (b.pool.connects !== undefined) console.log(`connections opened during the load: ${nc}${nc ? `, ${(((b.pool.connectMs ?? 0) - (a?.pool.connectMs ?? 0)) / nc).toFixed(0)} ms each on average (slowest since the start ${(b.pool.maxConnectMs ?? 0).toFixed(0)} ms)` : ''}`)
  const oq = b.outside.queries - (a?.outside.queries ?? 0)
  console.log(`outside requests (job workers, timers): ${oq} queries, ${(b.outside.queryMs - (a?.outside.queryMs ?? 0)).toFixed(0)} ms in queries`)
}

const { sessions, world } = await setUp()
if (args['db-timing']) await new Promise((r) => setTimeout(r, 2500)) // the API writes the file every 2 s
const timing0 = readDbTiming()
const before = rssMb(args.pid)
// this client's own event-loop delay: a busy client adds it to every latency it measures
const clientLoop = monitorEventLoopDelay({ resolution: 10 })
clientLoop.enable()
const clientCpu0 = process.cpuUsage()
const until = Date.now() + DURATION_MS
loadStart = performance.now()
console.log(`${sessions.length} sessions signed in; ${world.starIds.length} stars, ${world.models.size} models to fit; running ${args.duration} s…`)
await Promise.all(sessions.map((s) => user(s, world, until)))
clientLoop.disable()
const clientCpu = process.cpuUsage(clientCpu0)
const loop = await loopDelay()
const after = rssMb(args.pid)
if (args['db-timing']) await new Promise((r) => setTimeout(r, 2500))
const timing1 = readDbTiming()
if (args.pid) await new Promise((r) => setTimeout(r, SETTLE_MS))
report(before, after, rssMb(args.pid))
console.log(loop
  ? `API event-loop delay over the last ${loop.seconds} s of the load (worst 10-s window): p99 ${loop.p99Ms.toFixed(0)} ms, max ${loop.maxMs.toFixed(0)} ms`
  : 'API event-loop delay: not reported (/api/health has no eventLoop: an older server, or not started by server/index.ts)')
reportDbTiming(timing0, timing1)
console.log(`load client (this process): event-loop delay p99 ${(clientLoop.percentile(99) / 1e6).toFixed(0)} ms, max ${(clientLoop.max / 1e6).toFixed(0)} ms; `
  + `CPU ${((clientCpu.user + clientCpu.system) / 1e3 / DURATION_MS * 100).toFixed(0)} % of one core (its own delays are inside every latency above)`)
process.exit([...errors.values()].some((n) => n > 0) ? 1 : 0)

/**
 * Survey-triage row of the benchmark (issue 14): 100 synthetic stars of 200 points each (two in
 * three with a circular planet, seeded) stored by one survey upload, then the automatic search of
 * every star worked off the `triage` queue by the job workers as the server runs them (one process,
 * JOB_CONCURRENCY handlers, default 2 here = the cores of this machine), on a throwaway database of
 * the cluster named by BENCH_DATABASE_URL or TEST_DATABASE_URL (an admin URL; skipped with a note
 * when neither is set). Prints the wall time from queueing to the last star done, stars per minute
 * and the CPU time of the searches. Budget 120 s (the target).
 *   npx tsx scripts/bench-triage.ts [--json]; scripts/bench.ts imports benchTriage().
 */
import { QueryTypes } from 'sequelize'
import { createSequelize, createMigrator, initModels } from '../server/db/index.ts'
import { loadConfig } from '../server/config.ts'
import { startJobWorkers } from '../server/jobs/index.ts'
import { surveyUpload } from '../server/triage/upload.ts'
import { createRandom } from '../shared/math/random.ts'
import type { Services } from '../server/services.ts'
import type { BenchRow } from './bench-periodogram.ts'

const STARS = 100
const POINTS = 200
const BUDGET_MS = 120_000

function starFile(i: number): Buffer {
  const r = createRandom(9000 + i)
  const planet = i % 3 !== 2
  const P = 2 + 60 * r.next(), K = planet ? 5 + 20 * r.next() : 0, phase = 2 * Math.PI * r.next()
  const t = Array.from({ length: POINTS }, () => 2458000 + 800 * r.next()).sort((a, b) => a - b)
  const lines = [`# star: Bench ${String(i).padStart(3, '0')}`, '# starMass: 0.9 ± 0.05', '# bjd rv err']
  for (const x of t) lines.push(`${x.toFixed(5)} ${(K * Math.sin((2 * Math.PI * (x - 2458000)) / P + phase) + 2.5 * r.normal()).toFixed(3)} 2.5`)
  return Buffer.from(lines.join('\n') + '\n')
}

export async function benchTriage(): Promise<BenchRow[]> {
  const admin = process.env.BENCH_DATABASE_URL ?? process.env.TEST_DATABASE_URL
  const concurrency = Number(process.env.JOB_CONCURRENCY ?? 2)
  const name = `survey triage: ${STARS} stars × ${POINTS} points, automatic search on the queue (${concurrency} handlers), wall time`
  if (!admin) return [{ name, oursMs: NaN, referenceMs: BUDGET_MS, ratio: null, target: 'ratio ≤ 1 (≤ 2 min)', note: 'skipped: set BENCH_DATABASE_URL (or TEST_DATABASE_URL) to an admin URL of a throwaway cluster' }]
  const db = `starsway_bench_triage_${process.pid}`
  const adminSeq = createSequelize(admin, { pool: 1 })
  await adminSeq.query(`DROP DATABASE IF EXISTS ${db} WITH (FORCE)`)
  await adminSeq.query(`CREATE DATABASE ${db}`)
  const u = new URL(admin)
  u.pathname = `/${db}`
  const sequelize = createSequelize(u.toString(), { pool: 5 })
  let workers: Awaited<ReturnType<typeof startJobWorkers>> | undefined
  try {
    await createMigrator(sequelize).up()
    const models = initModels(sequelize)
    const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: u.toString() })
    const s = { config, sequelize, models, mailer: null as never } as Services
    const team = await models.Team.create({ name: 'Bench' })
    const user = await models.User.create({ email: 'bench@starsway.test', name: 'Bench', passwordHash: 'x' } as never)
    const files = Array.from({ length: STARS }, (_, i) => { const buffer = starFile(i); return { originalname: `bench-${i}.txt`, buffer, size: buffer.length } })
    const u0 = performance.now()
    const up = await surveyUpload(s, user, team.id, files, {})
    const uploadMs = performance.now() - u0
    const refused = up.files.filter((f) => f.status !== 'stored')
    if (refused.length) throw new Error(`bench upload refused ${refused.length} files: ${refused[0]!.message}`)
    const t0 = performance.now()
    workers = await startJobWorkers(s, { concurrency, pollingIntervalSeconds: 0.5, staleSeconds: 60 })
    for (;;) {
      const [row] = await sequelize.query<{ open: string; failed: string }>(
        `SELECT count(*) FILTER (WHERE state IN ('queued', 'running')) AS open, count(*) FILTER (WHERE state = 'failed') AS failed FROM triage_results`, { type: QueryTypes.SELECT })
      if (Number(row!.open) === 0) { if (Number(row!.failed)) throw new Error(`${row!.failed} triage searches failed`); break }
      await new Promise((r) => setTimeout(r, 200))
    }
    const ms = performance.now() - t0
    const found = await sequelize.query<{ name: string; planets: number }>(
      `SELECT st.name, (r.result->>'planets')::int AS planets FROM triage_results r JOIN stars st ON st.id = r.star_id`, { type: QueryTypes.SELECT })
    const noise = (n: string) => Number(n.replace(/\D/g, '')) % 3 === 2
    const hits = found.filter((f) => !noise(f.name) && f.planets > 0).length
    const falseHits = found.filter((f) => noise(f.name) && f.planets > 0).length
    const perMin = STARS / (ms / 60000)
    return [{
      name, oursMs: ms, referenceMs: BUDGET_MS, ratio: ms / BUDGET_MS, target: 'ratio ≤ 1 (≤ 2 min; reference column = the budget)',
      note: `${perMin.toFixed(1)} stars/min; upload of the ${STARS} files ${(uploadMs / 1000).toFixed(1)} s (not counted); a planet found on ${hits} of the ${found.filter((f) => !noise(f.name)).length} stars with one (K 5–25 m/s), on ${falseHits} of the ${found.filter((f) => noise(f.name)).length} noise-only stars`,
    }]
  } finally {
    await workers?.stop()
    await sequelize.close()
    await adminSeq.query(`DROP DATABASE IF EXISTS ${db} WITH (FORCE)`)
    await adminSeq.close()
  }
}

if (import.meta.url === `file://${process.argv[1]}`) {
  benchTriage().then((rows) => {
    if (process.argv.includes('--json')) { process.stdout.write(JSON.stringify({ rows }) + '\n'); return }
    for (const r of rows) console.log(`${r.name}\n  ours ${(r.oursMs / 1000).toFixed(1)} s, budget ${(r.referenceMs! / 1000).toFixed(0)} s\n  ${r.note}`)
  }).catch((e) => { console.error(e); process.exitCode = 1 })
    // one standalone run stayed alive after printing (a handle left by the stopped workers): end it here
    .finally(() => setTimeout(() => process.exit(process.exitCode ?? 0), 1000).unref())
}

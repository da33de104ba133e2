/**
 * Upload rows of the benchmark (issue 10 §6): a 100 000-row, two-instrument table committed
 * through the upload service as the web does it — decoding, detection-free parsing with the
 * confirmed mapping in a worker thread, then one `INSERT … SELECT unnest` per 50 000 rows — on
 * a throwaway database of the PostgreSQL cluster named by BENCH_DATABASE_URL or TEST_DATABASE_URL
 * (an admin URL; skipped with a note when neither is set). Budget 3 s (the target).
 */
import { createSequelize, createMigrator, initModels } from '../server/db/index.ts'
import { loadConfig } from '../server/config.ts'
import { ComputePool } from '../server/compute/pool.ts'
import { commit, preview } from '../server/uploads/service.ts'
import type { Services } from '../server/services.ts'
import type { BenchRow } from './bench-periodogram.ts'

const ROWS = 100_000

function table(seed: number): Buffer {
  const lines = ['bjd,rv,err,instrument']
  let t = 2455000 + seed
  for (let i = 0; i < ROWS; i++) {
    t += 0.01 + ((i * 7919) % 1000) / 100000
    lines.push(`${t.toFixed(6)},${(Math.sin(i) * 30).toFixed(3)},${(1 + (i % 7) / 10).toFixed(2)},${i % 3 ? 'Kestrel-N' : 'Kestrel-S'}`)
  }
  return Buffer.from(lines.join('\n') + '\n')
}

export async function benchUpload(): Promise<BenchRow[]> {
  const admin = process.env.BENCH_DATABASE_URL ?? process.env.TEST_DATABASE_URL
  const name = '100 000-row upload: commit (worker parse + INSERT … SELECT unnest), wall time'
  if (!admin) return [{ name, oursMs: NaN, referenceMs: 3000, ratio: null, target: 'ratio ≤ 1 (≤ 3 s)', note: 'skipped: set BENCH_DATABASE_URL (or TEST_DATABASE_URL) to an admin URL of a throwaway cluster' }]
  const db = `starsway_bench_${process.pid}`
  const adminSeq = createSequelize(admin, { pool: 1 })
  await adminSeq.query(`DROP DATABASE IF EXISTS ${db} WITH (FORCE)`)
  await adminSeq.query(`CREATE DATABASE ${db}`)
  const u = new URL(admin)
  u.pathname = `/${db}`
  const sequelize = createSequelize(u.toString(), { pool: 5 })
  const compute = new ComputePool({ size: 1 })
  try {
    await createMigrator(sequelize).up()
    const models = initModels(sequelize)
    const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: u.toString() }, { upload: { maxBytes: 20 * 1024 * 1024, maxRows: 200_000, maxFiles: 10 } })
    const s = { config, sequelize, models, mailer: null as never, compute } as Services
    const team = await models.Team.create({ name: 'Bench' })
    const user = await models.User.create({ email: 'bench@starsway.test', name: 'Bench', passwordHash: 'x' } as never)
    const times: number[] = []
    let parseNote = ''
    for (let run = 0; run < 3; run++) {
      const star = await models.Star.create({ teamId: team.id, name: `Bench ${run}`, massMsun: 1, massErrMsun: 0.1 } as never)
      const buffer = table(run)
      const file = { originalname: 'bench.csv', buffer, size: buffer.length }
      const pre = await preview(s, star, [file], {})
      const t0 = performance.now()
      const out = await commit(s, user, star, [file], { 'bench.csv': pre.files[0]!.mapping })
      times.push(performance.now() - t0)
      parseNote = `${out.measurementsCreated} rows in ${out.datasets.length} datasets`
    }
    const ms = Math.min(...times)
    return [{ name, oursMs: ms, referenceMs: 3000, ratio: ms / 3000, target: 'ratio ≤ 1 (≤ 3 s; reference column = the budget)', note: `${parseNote}; runs ${times.map((x) => x.toFixed(0)).join(', ')} ms` }]
  } finally {
    await compute.close()
    await sequelize.close()
    await adminSeq.query(`DROP DATABASE IF EXISTS ${db} WITH (FORCE)`)
    await adminSeq.close()
  }
}

if (import.meta.url === `file://${process.argv[1]}`) {
  benchUpload().then((rows) => { for (const r of rows) console.log(`${r.name}\n  ours ${r.oursMs?.toFixed(0)} ms, budget ${r.referenceMs} ms\n  ${r.note}`) })
    .catch((e) => { console.error(e); process.exitCode = 1 })
}

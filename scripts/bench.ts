/**
 * Benchmark of the numerical core (issue 3 §7): the periodogram rows (scripts/bench-periodogram.ts,
 * against astropy in the same run), then Kepler's equation, a one-planet fit from near the optimum
 * against scipy's least_squares (scripts/reference/fit_timing.py, same data, model and start, same
 * run), a one-planet fit from the data alone and a three-planet, two-instrument search.
 *
 *   npx tsx scripts/bench.ts [--json] [--skip-periodogram] [--skip-sampler] [--skip-gp] [--skip-limits] [--skip-upload]
 *
 * Times are best-of-repeats wall times on this machine; speed is never asserted in tests.
 */
import { spawnSync } from 'node:child_process'
import { mkdtempSync, writeFileSync, existsSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { createRandom } from '../shared/math/random.ts'
import { benchPeriodogram, type BenchRow } from './bench-periodogram.ts'
import { benchSampler, benchConverged, benchEnsembles } from './bench-sampler.ts'
import { benchGp } from './bench-gp.ts'
import { benchLimits } from './bench-limits.ts'
import { benchUpload } from './bench-upload.ts'
import { benchTime } from './bench-time.ts'
import { benchSearch } from './bench-search.ts'
import { benchTriage } from './bench-triage.ts'
import { solveKeplerArray, radialVelocity, fitKeplerians, searchPlanets, tpToTc, type RvData, type Keplerian } from '../shared/rv/index.ts'

const here = dirname(fileURLToPath(import.meta.url))
const PY = '/usr/bin/python3'

function best(repeats: number, f: () => void): number {
  let b = Infinity
  for (let r = 0; r < repeats; r++) {
    const t0 = performance.now()
    f()
    b = Math.min(b, performance.now() - t0)
  }
  return b
}

/** Nightly sampling over `baseline` days with seasonal gaps; Gaussian noise with jitter. */
function series(seed: number, n: number, baseline: number, planets: Keplerian[], insts: Array<{ offset: number; jitter: number }>): RvData {
  const rng = createRandom(seed)
  const times: number[] = []
  while (times.length < n) {
    const d = Math.floor(rng.next() * baseline)
    if (d % 365 > 250) continue
    times.push(2457000 + d + 0.1 * rng.normal())
  }
  times.sort((a, b) => a - b)
  const t = Float64Array.from(times)
  const y = radialVelocity(t, planets)
  const dy = new Float64Array(n), instrument = new Int32Array(n)
  for (let i = 0; i < n; i++) {
    const k = i % insts.length
    instrument[i] = k
    dy[i] = 1 + 2 * rng.next()
    y[i] += insts[k].offset + Math.sqrt(dy[i] ** 2 + insts[k].jitter ** 2) * rng.normal()
  }
  return { t, y, dy, instrument, instrumentNames: insts.map((_, k) => `inst${k + 1}`) }
}

function benchKepler(): BenchRow {
  const n = 1_000_000
  const M = new Float64Array(n), out = new Float64Array(n)
  for (let i = 0; i < n; i++) M[i] = ((i * 0.6180339887) % 1) * 2 * Math.PI - Math.PI
  const es = [0.05, 0.3, 0.6, 0.9, 0.99]
  for (const e of es) solveKeplerArray(M, e, out) // warm-up
  const ms = best(5, () => { for (const e of es) solveKeplerArray(M, e, out) }) / es.length
  const rate = n / ms / 1000 // million per second
  const budget = (n / 15e6) * 1000
  return {
    name: "Kepler's equation, 1e6 solves at 1e-12 (mean over e = 0.05…0.99)",
    oursMs: ms, referenceMs: budget, ratio: ms / budget,
    target: 'ratio ≤ 1 (≥ 15 million solves/s; reference column = the 15 M/s budget)',
    note: `${rate.toFixed(1)} million solves/s`,
  }
}

function benchFitNearOptimum(): BenchRow {
  const truth: Keplerian = { period: 37.3, K: 12, e: 0.35, omega: 1.2, tp: 2457010 }
  const data = series(101, 200, 900, [truth], [{ offset: 5, jitter: 0 }])
  const tc = tpToTc(truth.tp, truth.period, truth.e, truth.omega)
  // start: a few per cent off; the same start in both parameterisations (P, K, √e cos ω, √e sin ω, Tc, offset)
  const st = { period: 37.3 * 1.0005, K: 11, e: 0.3, omega: 1.1, tc: tc + 0.4, offset: 4 }
  const start = { period: st.period, K: st.K, e: st.e, omegaDeg: (st.omega * 180) / Math.PI, tc: st.tc }
  const opts = { planets: [start], jitter: [0] }
  for (let r = 0; r < 30; r++) fitKeplerians(data, opts) // warm the JIT, as in a running server
  const oursMs = best(15, () => fitKeplerians(data, opts))
  const ours = fitKeplerians(data, opts)
  let referenceMs: number | null = null
  let note = `ours χ² ${ours.stats.chi2.toFixed(4)}, ${ours.iterations} iterations, with covariance`
  const script = join(here, 'reference', 'fit_timing.py')
  if (existsSync(PY) && existsSync(script)) {
    const dir = mkdtempSync(join(tmpdir(), 'starsway-bench-'))
    const file = join(dir, 'fit.json')
    writeFileSync(file, JSON.stringify({
      t: Array.from(data.t), y: Array.from(data.y), dy: Array.from(data.dy),
      start: [st.period, st.K, Math.sqrt(st.e) * Math.cos(st.omega), Math.sqrt(st.e) * Math.sin(st.omega), st.tc, st.offset],
    }))
    const p = spawnSync(PY, [script, file], { encoding: 'utf8' })
    if (p.status === 0) {
      const r = JSON.parse(p.stdout)
      referenceMs = r.ms
      note += `; scipy ${r.versions.scipy} least_squares (trf) χ² ${r.chi2.toFixed(4)}, ${r.nfev} evaluations, no covariance`
    } else note += `; scipy reference failed: ${p.stderr.split('\n').slice(-2).join(' ')}`
  } else note += '; scipy reference not available'
  return {
    name: 'one-planet fit, 200 points, from near the optimum', oursMs, referenceMs,
    ratio: referenceMs ? oursMs / referenceMs : null, target: 'ratio ≤ 1 (no slower than scipy least_squares)', note,
  }
}

function benchFitFromData(): BenchRow {
  const data = series(102, 200, 900, [{ period: 23.7, K: 9, e: 0.2, omega: 0.7, tp: 2457005 }], [{ offset: -3, jitter: 2 }])
  const run = (): ReturnType<typeof searchPlanets> => searchPlanets(data, { planets: 1, trend: 'none' })
  for (let r = 0; r < 3; r++) run()
  const ms = best(5, run)
  const r = run()
  const p = r.fit.planets[0]
  return {
    name: 'one-planet fit from the data alone (periodogram → starts → fit → errors), 200 points',
    oursMs: ms, referenceMs: 100, ratio: ms / 100, target: 'ratio ≤ 1 (≤ 100 ms; reference column = the budget)',
    note: `P = ${p.period.toFixed(3)} ± ${p.uncertainty.period.toFixed(3)} d (injected 23.7), K = ${p.K.toFixed(2)} m/s (9)`,
  }
}

function benchThreePlanets(): BenchRow {
  const planets: Keplerian[] = [
    { period: 4.6, K: 11, e: 0.05, omega: 0.3, tp: 2457001 },
    { period: 41.5, K: 15, e: 0.2, omega: 2.2, tp: 2457020 },
    { period: 530, K: 25, e: 0.35, omega: 4.1, tp: 2457300 },
  ]
  const data = series(103, 500, 2000, planets, [{ offset: 12, jitter: 2 }, { offset: -30, jitter: 3 }])
  const run = (): ReturnType<typeof searchPlanets> => searchPlanets(data)
  const t0 = performance.now()
  const r = run()
  const first = performance.now() - t0
  const ms = Math.min(first, best(2, run))
  const found = [...r.fit.planets].sort((a, b) => a.period - b.period).map((p) => p.period.toFixed(2)).join(', ')
  return {
    name: 'three-planet, two-instrument search from the data alone (planets and trend by FAP/BIC), 500 points',
    oursMs: ms, referenceMs: 2000, ratio: ms / 2000, target: 'ratio ≤ 1 (≤ 2 s; reference column = the budget)',
    note: `found ${r.planets} planets: P = ${found} d (injected 4.6, 41.5, 530), trend ${r.trend}`,
  }
}

async function main(): Promise<void> {
  const json = process.argv.includes('--json')
  const rows: BenchRow[] = []
  if (!process.argv.includes('--skip-periodogram')) rows.push(...(await benchPeriodogram()))
  rows.push(benchKepler(), benchFitNearOptimum(), benchFitFromData(), benchThreePlanets())
  if (!process.argv.includes('--skip-search')) rows.push(...benchSearch()) // planet search at 200 and 2000 points, Keplerian periodogram vs numpy (scripts/bench-search.ts)
  if (!process.argv.includes('--skip-sampler')) rows.push(...(await benchConverged()), ...(await benchEnsembles()), ...(await benchSampler())) // sampler vs emcee, converged posterior, steps/s as the chain grows (scripts/bench-sampler.ts)
  if (!process.argv.includes('--skip-gp')) rows.push(...benchGp()) // GP noise models: O(N) scaling, dense vs scipy cho_factor (scripts/bench-gp.ts)
  if (!process.argv.includes('--skip-limits')) rows.push(...(await benchLimits())) // injection–recovery grid, 1 and 2 workers (scripts/bench-limits.ts)
  if (!process.argv.includes('--skip-upload')) rows.push(...(await benchUpload())) // 100 000-row upload commit on a throwaway database (scripts/bench-upload.ts)
  if (!process.argv.includes('--skip-triage')) rows.push(...(await benchTriage())) // 100 stars × 200 points searched off the triage queue (scripts/bench-triage.ts)
  if (!process.argv.includes('--skip-time')) rows.push(...benchTime()) // UTC → BJD_TDB of 100 000 times vs astropy (scripts/bench-time.ts)
  if (json) { process.stdout.write(JSON.stringify({ rows }) + '\n'); return }
  const f = (v: number | null | undefined): string => (v === null || v === undefined ? '—' : v >= 100 ? v.toFixed(0) : v.toPrecision(3))
  for (const r of rows) {
    const ok = r.ratio === null ? '?' : r.ratio <= (r.ratioMax ?? 1) ? 'meets' : 'MISSES'
    console.log(`${r.name}\n  ours ${f(r.oursMs)} ms, reference ${f(r.referenceMs)} ms, ratio ${f(r.ratio)} → ${ok} target: ${r.target}${r.note ? `\n  ${r.note}` : ''}`)
  }
}

main().catch((e) => { console.error(e); process.exitCode = 1 })

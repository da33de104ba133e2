/**
 * Sampler benchmark (issue 5): 32 walkers × 5 000 steps of the ensemble sampler on a one-planet,
 * 200-point model with a fitted jitter (7 parameters), ours against emcee with a numpy likelihood
 * (scripts/reference/sampler_emcee.py --timing) on the same data, start and machine, in the same
 * run. Both time the sampling loop only, as CPU time of the process (user + system; wall times in
 * the note): on a shared machine the wall time of either side depends on what else runs, the CPU
 * time much less. A second row times our whole samplePosterior (fit start, diagnostics, summaries,
 * M sin i and a), wall time. Run alone: `npx tsx scripts/bench-sampler.ts [--json]`;
 * scripts/bench.ts imports benchSampler().
 */
import { spawnSync } from 'node:child_process'
import { mkdtempSync, writeFileSync, existsSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { dirname, join } from 'node:path'
import { fileURLToPath, pathToFileURL } from 'node:url'
import { createRandom } from '../shared/math/random.ts'
import { radialVelocity, fitKeplerians, tpToTc, type RvData } from '../shared/rv/index.ts'
import { createLogPosterior, specFromFit, samplingScales } from '../shared/rv/posterior.ts'
import { runEnsemble } from '../shared/rv/sampler.ts'
import { samplePosterior } from '../shared/rv/mcmc.ts'

export interface SamplerBenchRow {
  name: string
  oursMs: number
  referenceMs: number | null
  ratio: number | null
  target: string
  note?: string
}

const here = dirname(fileURLToPath(import.meta.url))
const PY = '/usr/bin/python3'
const WALKERS = 32
const STEPS = 5000

function dataset(): RvData {
  const r = createRandom(5005)
  const n = 200
  const t = new Float64Array(n).map(() => 2458000 + 900 * r.next()).sort()
  const truth = { period: 37.3, K: 12, e: 0.35, omega: 1.2, tp: 2458010 }
  const y = radialVelocity(t, [truth])
  const dy = new Float64Array(n)
  for (let i = 0; i < n; i++) { dy[i] = 1 + 2 * r.next(); y[i] += 5 + Math.sqrt(dy[i] ** 2 + 3 ** 2) * r.normal() }
  return { t, y, dy, instrument: new Int32Array(n), instrumentNames: ['A'] }
}

export async function benchSampler(): Promise<SamplerBenchRow[]> {
  const data = dataset()
  const fit = fitKeplerians(data, { planets: [{ period: 37.3, K: 12, e: 0.35, omegaDeg: 68.75, tc: tpToTc(2458010, 37.3, 0.35, 1.2) }] })
  const post = createLogPosterior(data, specFromFit(fit))
  const scale = samplingScales(fit, post)
  const d = post.nDim
  const rng = createRandom(17)
  const start = new Float64Array(WALKERS * d)
  for (let w = 0; w < WALKERS; w++) for (let k = 0; k < d; k++) start[w * d + k] = post.centre[k] + 0.1 * scale[k] * rng.normal()
  // warm-up (JIT), then the timed run
  runEnsemble({ logProb: post.logProb, nDim: d, nWalkers: WALKERS, start, steps: 200, random: 1 })
  const t0 = performance.now(), c0 = process.cpuUsage()
  const run = runEnsemble({ logProb: post.logProb, nDim: d, nWalkers: WALKERS, start, steps: STEPS, random: 2 })
  const cpu = process.cpuUsage(c0)
  const oursWall = performance.now() - t0
  const oursMs = (cpu.user + cpu.system) / 1000
  const acc = run.acceptance.reduce((s, v) => s + v, 0) / WALKERS

  let referenceMs: number | null = null
  let note = `CPU ms; ours: ${(WALKERS * STEPS / oursMs * 1000).toFixed(0)} posterior evaluations per CPU second, wall ${oursWall.toFixed(0)} ms, acceptance ${acc.toFixed(3)}`
  const script = join(here, 'reference', 'sampler_emcee.py')
  if (existsSync(PY) && existsSync(script)) {
    const dir = mkdtempSync(join(tmpdir(), 'starsway-bench-sampler-'))
    const file = join(dir, 'data.json')
    writeFileSync(file, JSON.stringify({
      t: Array.from(data.t), y: Array.from(data.y), dy: Array.from(data.dy),
      start: Array.from(post.centre), scale: Array.from(scale), walkers: WALKERS, steps: STEPS, seed: 17,
    }))
    const p = spawnSync(PY, [script, '--timing', file], { encoding: 'utf8', maxBuffer: 1 << 20 })
    rmSync(dir, { recursive: true, force: true })
    if (p.status === 0) {
      const r = JSON.parse(p.stdout.trim().split('\n').pop() ?? '{}')
      referenceMs = r.cpuMs
      note += `; emcee ${r.versions.emcee} (numpy ${r.versions.numpy}, python ${r.versions.python}) wall ${Number(r.ms).toFixed(0)} ms, acceptance ${Number(r.acceptance).toFixed(3)}; ` +
        `speed-up ×${(r.cpuMs / oursMs).toFixed(2)} in CPU time, ×${(r.ms / oursWall).toFixed(2)} in wall time`
    } else note += `; emcee reference failed: ${(p.stderr || '').trim().split('\n').slice(-1).join(' ')}`
  } else note += '; emcee reference not available'

  const t1 = performance.now()
  const full = samplePosterior(data, fit, { walkers: WALKERS, steps: STEPS, seed: 3, mstar: { value: 1, err: 0.05 } })
  const fullMs = performance.now() - t1
  return [
    {
      name: `ensemble sampler (CPU time), ${WALKERS} walkers × ${STEPS} steps, one planet + offset + jitter (7 parameters), 200 points`,
      oursMs, referenceMs, ratio: referenceMs ? oursMs / (referenceMs / 4) : null,
      target: 'ratio ≤ 1, ratio = ours ÷ (emcee ÷ 4): at least 4× faster than emcee with a numpy likelihood, same data and start, same run',
      note,
    },
    {
      name: `samplePosterior end to end (run + τ + split-R̂ + summaries with M sin i and a), ${WALKERS} × ${STEPS}, same data`,
      oursMs: fullMs, referenceMs: null, ratio: null, target: 'informational (no target)',
      note: `converged ${full.diagnostics.converged}; max τ ${Math.max(...full.diagnostics.tau).toFixed(0)} steps; ${full.diagnostics.warnings.length} warnings`,
    },
  ]
}

async function main(): Promise<void> {
  const rows = await benchSampler()
  if (process.argv.includes('--json')) { process.stdout.write(JSON.stringify({ rows }) + '\n'); return }
  const f = (v: number | null): string => (v === null ? '—' : v >= 100 ? v.toFixed(0) : v.toPrecision(3))
  for (const r of rows) {
    const ok = r.ratio === null ? '' : r.ratio <= 1 ? ' → meets' : ' → MISSES'
    console.log(`${r.name}\n  ours ${f(r.oursMs)} ms, reference ${f(r.referenceMs)} ms, ratio ${f(r.ratio)}${ok} target: ${r.target}${r.note ? `\n  ${r.note}` : ''}`)
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) main().catch((e) => { console.error(e); process.exitCode = 1 })

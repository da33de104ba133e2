/**
 * Detection-limit benchmark (issue 14): a 30 periods × 30 masses × 10 phases injection grid
 * (9 000 recoveries, the search's highest-peak criterion) for a 200-point star, run by 1 and by 2
 * worker processes, each taking half of the chunks as queue workers do. Prints the wall times and
 * the scaling (time with 1 worker / time with 2); the maps must be equal bit for bit. Each worker
 * also reports its CPU time: on a shared machine the wall time depends on what else runs.
 * Run alone: `npx tsx scripts/bench-limits.ts [--json]`; scripts/bench.ts imports benchLimits().
 */
import { spawn } from 'node:child_process'
import { mkdtempSync, readFileSync, writeFileSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { createRandom } from '../shared/math/random.ts'
import { prepareLimits, runChunk, mergeChunks, chunkRanges, type LimitsProblem, type ChunkResult } from '../shared/limits/index.ts'

export interface LimitsBenchRow { name: string; oursMs: number; referenceMs: number | null; ratio: number | null; target: string; note?: string }

const self = fileURLToPath(import.meta.url)
const CHUNKS = 30

function problem(): LimitsProblem {
  const r = createRandom(1414)
  const n = 200
  const t = new Float64Array(n).map(() => 2458000 + 1200 * r.next()).sort()
  const dy = Float64Array.from({ length: n }, () => 1.5 + r.next())
  const residuals = Float64Array.from(dy, (s) => Math.hypot(s, 2) * r.normal())
  return { data: { t, residuals, dy: Float64Array.from(dy, (s) => Math.hypot(s, 2)) }, starMass: 0.95, seed: 7, grid: { periods: 30, masses: 30, phases: 10 } }
}

function toJson(p: LimitsProblem): string {
  return JSON.stringify({ ...p, data: { t: Array.from(p.data.t), residuals: Array.from(p.data.residuals), dy: Array.from(p.data.dy) } })
}

/** Worker mode: run every `stride`-th chunk starting at `first`, write the outcomes. */
function workerMain(file: string, first: number, stride: number, out: string): void {
  const j = JSON.parse(readFileSync(file, 'utf8'))
  const prep = prepareLimits({ ...j, data: { t: Float64Array.from(j.data.t), residuals: Float64Array.from(j.data.residuals), dy: Float64Array.from(j.data.dy) } })
  const ranges = chunkRanges(prep.grid.trials, CHUNKS)
  const t0 = performance.now(), c0 = process.cpuUsage()
  const res: Array<{ start: number; end: number; recovered: number[] }> = []
  for (let c = first; c < ranges.length; c += stride) {
    const r = runChunk(prep, ranges[c].start, ranges[c].end)
    res.push({ start: r.start, end: r.end, recovered: Array.from(r.recovered) })
  }
  const cpu = process.cpuUsage(c0)
  writeFileSync(out, JSON.stringify({ ms: performance.now() - t0, cpuMs: (cpu.user + cpu.system) / 1000, chunks: res }))
}

function runWorker(args: string[]): Promise<void> {
  return new Promise((resolve, reject) => {
    const p = spawn(process.execPath, ['--import', 'tsx', self, '--worker', ...args], { stdio: 'inherit' })
    p.on('exit', (code) => (code === 0 ? resolve() : reject(new Error(`bench worker exited with ${code}`))))
  })
}

async function withWorkers(dir: string, file: string, workers: number): Promise<{ wallMs: number; computeMs: number[]; cpuMs: number[]; recovered: number[] }> {
  const outs = Array.from({ length: workers }, (_, w) => join(dir, `out-${workers}-${w}.json`))
  const t0 = performance.now()
  await Promise.all(outs.map((o, w) => runWorker([file, String(w), String(workers), o])))
  const wallMs = performance.now() - t0
  const parts = outs.map((o) => JSON.parse(readFileSync(o, 'utf8')) as { ms: number; cpuMs: number; chunks: Array<{ start: number; end: number; recovered: number[] }> })
  const chunks: ChunkResult[] = parts.flatMap((p) => p.chunks.map((c) => ({ start: c.start, end: c.end, recovered: Uint8Array.from(c.recovered) })))
  const prep = prepareLimits(problem())
  return { wallMs, computeMs: parts.map((p) => p.ms), cpuMs: parts.map((p) => p.cpuMs), recovered: Array.from(mergeChunks(prep.grid, chunks).recovered) }
}

export async function benchLimits(): Promise<LimitsBenchRow[]> {
  const dir = mkdtempSync(join(tmpdir(), 'starsway-bench-limits-'))
  try {
    const file = join(dir, 'problem.json')
    writeFileSync(file, toJson(problem()))
    const one = await withWorkers(dir, file, 1)
    const two = await withWorkers(dir, file, 2)
    const same = one.recovered.every((v, i) => v === two.recovered[i])
    const f = (v: number): string => (v / 1000).toFixed(1)
    const scaling = one.wallMs / two.wallMs
    return [
      { name: 'detection limits: 30 × 30 × 10 injections (9 000 recoveries), 200 points, 1 worker process', oursMs: one.wallMs, referenceMs: null, ratio: null,
        target: 'reference row for the scaling', note: `compute ${f(one.computeMs[0])} s wall, ${f(one.cpuMs[0])} s CPU (+ process start-up)` },
      { name: 'detection limits: the same grid, 2 worker processes', oursMs: two.wallMs, referenceMs: 60000, ratio: two.wallMs / 60000,
        target: 'ratio ≤ 1 (≤ 60 s; reference column = the budget)',
        note: `scaling 1 → 2 workers: ×${scaling.toFixed(2)} faster (ideal 2); compute per worker ${two.computeMs.map(f).join(' s, ')} s wall, ${two.cpuMs.map(f).join(' s, ')} s CPU; maps equal: ${same}` },
    ]
  } finally { rmSync(dir, { recursive: true, force: true }) }
}

if (process.argv[2] === '--worker') {
  const [file, first, stride, out] = process.argv.slice(3)
  workerMain(file, Number(first), Number(stride), out)
} else if (process.argv[1] === self) {
  benchLimits().then((rows) => {
    if (process.argv.includes('--json')) { process.stdout.write(JSON.stringify({ rows }) + '\n'); return }
    for (const r of rows) console.log(`${r.name}\n  ours ${(r.oursMs / 1000).toFixed(1)} s${r.referenceMs ? `, budget ${(r.referenceMs / 1000).toFixed(0)} s` : ''} — ${r.target}${r.note ? `\n  ${r.note}` : ''}`)
  }).catch((e) => { console.error(e); process.exitCode = 1 })
}

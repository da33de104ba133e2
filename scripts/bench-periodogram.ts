/**
 * Periodogram benchmark (issue 3 §7): our direct and fast periodograms against astropy's
 * LombScargle timed in the same run by scripts/reference/periodogram_timing.py (when
 * /usr/bin/python3 has astropy). Run alone: `npx tsx scripts/bench-periodogram.ts [--json]`;
 * scripts/bench.ts imports benchPeriodogram().
 */
import { spawnSync } from 'node:child_process'
import { fileURLToPath, pathToFileURL } from 'node:url'
import { dirname, join } from 'node:path'
import { createRandom } from '../shared/math/random.ts'
import { periodogramDirect, periodogramFast, periodogram, findPeaks } from '../shared/rv/periodogram.ts'

export interface BenchRow {
  name: string
  oursMs: number
  referenceMs: number | null
  ratio: number | null
  target: string
  /** Largest ratio that meets the target (default 1). */
  ratioMax?: number
  note?: string
  /** For accuracy rows: max |fast − direct| / max(direct). */
  maxRelError?: number
}

const here = dirname(fileURLToPath(import.meta.url))
const PY = '/usr/bin/python3'

/** Same layout as the reference script: t uniform on [0, 1000) d, P = 7.3 d, K = 10 m/s, σ 1…3 m/s. */
function dataset(n: number, seed: number) {
  const r = createRandom(seed)
  const t = new Float64Array(n), y = new Float64Array(n), dy = new Float64Array(n)
  for (let i = 0; i < n; i++) t[i] = 1000 * r.next()
  t.sort()
  for (let i = 0; i < n; i++) { dy[i] = 1 + 2 * r.next(); y[i] = 10 * Math.sin(2 * Math.PI * t[i] / 7.3) + dy[i] * r.normal() }
  return { t, y, dy }
}

function bestMs(fn: () => void, repeats: number): number {
  let best = Infinity
  for (let i = 0; i < repeats; i++) {
    const t0 = performance.now()
    fn()
    best = Math.min(best, performance.now() - t0)
  }
  return best
}

interface Reference {
  cython_1000: number; fast_1000: number; fast_10000: number; fast_100000: number
  auto_1000?: number; auto_1000_err?: number; auto_1000_m?: number; versions: Record<string, string>
}

function runReference(autoGrid?: { f0: number; df: number; count: number }): { ref: Reference | null; note: string } {
  const probe = spawnSync(PY, ['-c', 'import astropy'], { encoding: 'utf8' })
  if (probe.status !== 0) return { ref: null, note: `${PY} has no astropy: reference not timed` }
  const script = join(here, 'reference', 'periodogram_timing.py')
  const extra = autoGrid ? ['--auto-grid', String(autoGrid.f0), String(autoGrid.df), String(autoGrid.count)] : []
  const res = spawnSync(PY, [script, ...extra], {
    encoding: 'utf8',
    env: { ...process.env, MALLOC_MMAP_THRESHOLD_: '4294967296', MALLOC_TRIM_THRESHOLD_: '4294967296', MALLOC_TOP_PAD_: '268435456' },
    maxBuffer: 1 << 20,
  })
  if (res.status !== 0) return { ref: null, note: `reference script failed: ${(res.stderr || '').trim().split('\n').pop()}` }
  try {
    const ref = JSON.parse(res.stdout.trim().split('\n').pop() ?? '') as Reference
    return { ref, note: `astropy ${ref.versions.astropy}, numpy ${ref.versions.numpy}` }
  } catch {
    return { ref: null, note: 'reference script printed no JSON' }
  }
}

export async function benchPeriodogram(): Promise<BenchRow[]> {
  const grid = (m: number) => ({ minPeriod: 1.1, maxPeriod: 1000, frequencies: m })
  const rows: BenchRow[] = []
  const d1 = dataset(1000, 1), d2 = dataset(10_000, 2), d3 = dataset(100_000, 3)
  const g5 = grid(100_000), g6 = grid(1_000_000)

  // warm up the JIT on a small problem
  const w = dataset(200, 9)
  for (let i = 0; i < 3; i++) { periodogramDirect(w.t, w.y, w.dy, grid(5000)); periodogramFast(w.t, w.y, w.dy, grid(5000)) }

  let direct = periodogramDirect(d1.t, d1.y, d1.dy, g5)
  const directMs = bestMs(() => { direct = periodogramDirect(d1.t, d1.y, d1.dy, g5) }, 3)
  let fast = periodogramFast(d1.t, d1.y, d1.dy, g5)
  const fast1Ms = bestMs(() => { fast = periodogramFast(d1.t, d1.y, d1.dy, g5) }, 9)
  let peak = 0, err = 0
  for (let k = 0; k < direct.power.length; k++) { peak = Math.max(peak, direct.power[k]); err = Math.max(err, Math.abs(fast.power[k] - direct.power[k])) }
  const rel = err / peak
  const fast2Ms = bestMs(() => { periodogramFast(d2.t, d2.y, d2.dy, g5) }, 7)
  const fast3Ms = bestMs(() => { periodogramFast(d3.t, d3.y, d3.dy, g6) }, 3)
  const small = dataset(200, 4)
  const peaksMs = bestMs(() => { const r = periodogram(small.t, small.y, small.dy); findPeaks(small.t, small.y, small.dy, r) }, 10)

  // the default call: periodogram() with its default grid (GRID_DEFAULTS) and method 'auto', N = 1000,
  // against astropy's default LombScargle(...).power(f) (method 'auto') on the same grid
  let autoRes = periodogram(d1.t, d1.y, d1.dy)
  const autoMs = bestMs(() => { autoRes = periodogram(d1.t, d1.y, d1.dy) }, 7)
  const autoGrid = autoRes.grid
  const exact = periodogramDirect(d1.t, d1.y, d1.dy) // the same default grid, exact sums
  let autoPeak = 0, autoErr = 0
  for (let k = 0; k < exact.power.length; k++) { autoPeak = Math.max(autoPeak, exact.power[k]); autoErr = Math.max(autoErr, Math.abs(autoRes.power[k] - exact.power[k])) }
  const { ref, note } = runReference({ f0: autoGrid.f0, df: autoGrid.df, count: autoGrid.count })
  const row = (name: string, oursMs: number, refMs: number | null, target: string, extra: Partial<BenchRow> = {}): BenchRow =>
    ({ name, oursMs, referenceMs: refMs, ratio: refMs === null ? null : oursMs / refMs, target, note, ...extra })
  rows.push(row('periodogram direct N=1000 M=100000 vs astropy cython / 10', directMs, ref ? ref.cython_1000 / 10 : null,
    'ratio ≤ 1 (≤ 1/10 of astropy cython; reference column = cython time / 10)',
    { note: ref ? `${note}; astropy cython itself ${ref.cython_1000.toFixed(1)} ms` : note }))
  rows.push(row('periodogram fast N=1000 M=100000 vs astropy fast', fast1Ms, ref?.fast_1000 ?? null, 'ratio ≤ 1 and max |fast − direct| ≤ 1e-4 of the peak',
    { maxRelError: rel, note: `${note}; max |fast − direct| / peak = ${rel.toExponential(2)}` }))
  rows.push(row('periodogram fast N=10000 M=100000 vs astropy fast', fast2Ms, ref?.fast_10000 ?? null, 'ratio ≤ 1'))
  rows.push(row('periodogram fast N=100000 M=1000000 vs astropy fast', fast3Ms, ref?.fast_100000 ?? null, 'ratio ≤ 1'))
  rows.push(row(`periodogram default call (method auto → ${autoRes.method}, default grid M = ${autoGrid.count}) N=1000 vs astropy default power()`, autoMs, ref?.auto_1000 ?? null,
    'ratio ≤ 1 and max |ours − exact| ≤ 1e-4 of the peak',
    { maxRelError: autoErr / autoPeak, note: `${note}; ours max |auto − direct| / peak = ${(autoErr / autoPeak).toExponential(2)}${ref?.auto_1000_err !== undefined ? `; astropy default vs its exact (cython) ${ref.auto_1000_err.toExponential(2)}` : ''}` }))
  rows.push(row('periodogram + findPeaks N=200, default grid (M ≈ 9000)', peaksMs, null, 'information only (the fit search calls both)'))
  return rows
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const rows = await benchPeriodogram()
  if (process.argv.includes('--json')) console.log(JSON.stringify(rows, null, 2))
  else {
    for (const r of rows) {
      const ref = r.referenceMs === null ? '—' : `${r.referenceMs.toFixed(1)} ms`
      const ratio = r.ratio === null ? '—' : r.ratio.toFixed(3)
      console.log(`${r.name.padEnd(58)} ours ${r.oursMs.toFixed(1).padStart(8)} ms  ref ${ref.padStart(10)}  ratio ${ratio.padStart(6)}  target ${r.target}${r.note ? `  (${r.note})` : ''}`)
    }
  }
}

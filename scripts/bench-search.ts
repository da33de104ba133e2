/**
 * Speed rows of the planet search (issue 9): the search from the data alone at 200 points and at
 * 2000 points from four instruments (the synthetic survey's cases, tests/shared/rv/planet-search/survey.ts),
 * and the Keplerian periodogram at N = 1000 over 0.5 d – 5× baseline against numpy's vectorised
 * linear least squares over the same (P, e, phase) cells (scripts/reference/search_kp_timing.py,
 * same data, same run, on a strided subset of the periods so the python side finishes).
 */
import { spawnSync } from 'node:child_process'
import { mkdtempSync, writeFileSync, existsSync } from 'node:fs'
import { tmpdir, loadavg } from 'node:os'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'
import type { BenchRow } from './bench-periodogram.ts'
import { searchPlanets, keplerianPeriodogram, KEPLERIAN_PERIODOGRAM_DEFAULTS } from '../shared/rv/index.ts'
import { SURVEY, makeCase } from '../tests/shared/rv/planet-search/survey.ts'

const here = dirname(fileURLToPath(import.meta.url))
const PY = '/usr/bin/python3'

function timeIt(repeats: number, f: () => void): number {
  let b = Infinity
  for (let r = 0; r < repeats; r++) { const t0 = performance.now(); f(); b = Math.min(b, performance.now() - t0) }
  return b
}

/** CPU time of this process (user + system, ms) spent in f: steadier than the wall clock on a shared machine. */
function cpuMs(f: () => void): number {
  const c0 = process.cpuUsage()
  f()
  const c = process.cpuUsage(c0)
  return (c.user + c.system) / 1000
}

export function benchSearch(): BenchRow[] {
  const rows: BenchRow[] = []
  // 200 points: the weak-third case's two instruments, first 200 points of its seed
  const small = makeCase({ ...SURVEY.find((c) => c.name === 'weak-third')!, n: 200 })
  let r = searchPlanets(small)
  const msSmall = timeIt(2, () => { r = searchPlanets(small) })
  const cpuSmall = cpuMs(() => { r = searchPlanets(small) })
  rows.push({
    name: 'search from the data alone, 200 points, 2 instruments (3 injected planets)', oursMs: msSmall, referenceMs: 1000, ratio: msSmall / 1000,
    target: 'ratio ≤ 1 (≤ 1 s; reference column = the budget)', note: `found ${r.planets}: ${r.fit.planets.map((p) => p.period.toFixed(2)).join(', ')} d; CPU time ${cpuSmall.toFixed(0)} ms, load average ${loadavg()[0].toFixed(1)}`,
  })
  const large = makeCase(SURVEY.find((c) => c.name === 'large')!)
  const t0 = performance.now()
  const cpuLarge = cpuMs(() => { r = searchPlanets(large) })
  const msLarge = performance.now() - t0
  rows.push({
    name: 'search from the data alone, 2000 points, 4 instruments (2 injected planets)', oursMs: msLarge, referenceMs: 5000, ratio: msLarge / 5000,
    target: 'ratio ≤ 1 (≤ 5 s; reference column = the budget)', note: `found ${r.planets}: ${r.fit.planets.map((p) => p.period.toFixed(2)).join(', ')} d; CPU time ${cpuLarge.toFixed(0)} ms, load average ${loadavg()[0].toFixed(1)}`,
  })
  // Keplerian periodogram, N = 1000
  const kpCase = makeCase({ ...SURVEY.find((c) => c.name === 'large')!, n: 1000, baseline: 3000 })
  const kp = keplerianPeriodogram(kpCase)
  const msKp = timeIt(2, () => keplerianPeriodogram(kpCase))
  let referenceMs: number | null = null
  let note = `${kp.frequency.length} periods, cells ${KEPLERIAN_PERIODOGRAM_DEFAULTS.cells.map((c) => `e ${c.e}×${c.phases}×${c.substeps} from ${c.minPeriod} d`).join('; ')}`
  const script = join(here, 'reference', 'search_kp_timing.py')
  if (existsSync(PY) && existsSync(script)) {
    const file = join(mkdtempSync(join(tmpdir(), 'starsway-kp-')), 'kp.json')
    writeFileSync(file, JSON.stringify({
      t: Array.from(kpCase.t), y: Array.from(kpCase.y), dy: Array.from(kpCase.dy), instrument: Array.from(kpCase.instrument), nInst: kpCase.instrumentNames.length,
      frequency: Array.from(kp.frequency), ours: Array.from(kp.dchi2).filter((_, i) => i % 20 === 0), cells: KEPLERIAN_PERIODOGRAM_DEFAULTS.cells, stride: 20,
    }))
    const p = spawnSync(PY, [script, file], { encoding: 'utf8' })
    if (p.status === 0) {
      const o = JSON.parse(p.stdout)
      referenceMs = o.ms * 20 // the python side ran every 20th period
      note += `; numpy ${o.numpy} on every 20th period (×20), max |Δχ²| vs ours ${o.maxDiff.toPrecision(2)} of peak ${o.peak.toPrecision(4)}`
    } else note += `; numpy reference failed: ${p.stderr.split('\n').slice(-2).join(' ')}`
  } else note += '; numpy reference not available'
  rows.push({
    name: 'Keplerian periodogram, N = 1000, 0.5 d – 5× baseline, offsets per instrument', oursMs: msKp, referenceMs,
    ratio: referenceMs ? msKp / referenceMs : null, target: 'ratio ≤ 1 (no slower than numpy vectorised linear least squares)', note,
  })
  return rows
}

/**
 * Benchmark row of the barycentric time conversion (issue 10): shared/time `toBjdTdb` of 100 000 UTC
 * times (one every 0.05 d over 14 years, one site, one star) against astropy's
 * `Time.tdb + light_travel_time(kind='barycentric')` on the same times in the same run
 * (scripts/reference/bjd_timing.py). Called by scripts/bench.ts.
 */
import { spawnSync } from 'node:child_process'
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { toBjdTdb } from '../shared/time/index.ts'
import type { BenchRow } from './bench-periodogram.ts'

const here = dirname(fileURLToPath(import.meta.url))
const PY = '/usr/bin/python3'

export function benchTime(): BenchRow[] {
  const n = 100000
  const jd = Float64Array.from({ length: n }, (_, i) => 2455000.5 + i * 0.05 + 0.013 * Math.sin(i))
  const site = { lonDeg: -70.73, latDeg: -29.26, heightM: 2400 }
  const target = { raDeg: 100, decDeg: -30 }
  let oursMs = Infinity
  let out: Float64Array = new Float64Array(0)
  for (let r = 0; r < 3; r++) {
    const t0 = performance.now()
    out = toBjdTdb(jd, 'utc', target, site)
    oursMs = Math.min(oursMs, performance.now() - t0)
  }
  let referenceMs: number | null = null
  let note = 'wall time: ours best of 3, astropy one run'
  if (existsSync(PY)) {
    const dir = mkdtempSync(join(tmpdir(), 'starsway-bjd-'))
    const file = join(dir, 'bjd.json')
    writeFileSync(file, JSON.stringify({ jd: Array.from(jd), ...target, ...site }))
    const p = spawnSync(PY, [join(here, 'reference', 'bjd_timing.py'), file], { encoding: 'utf8', maxBuffer: 1 << 24 })
    rmSync(dir, { recursive: true, force: true })
    if (p.status === 0) {
      const r = JSON.parse(p.stdout.trim().split('\n').pop() ?? '{}') as { ms: number; bjd: [number, number][]; versions: { astropy: string } }
      referenceMs = r.ms
      const worst = Math.max(...r.bjd.map(([d, f], i) => Math.abs((out[i]! - d - f) * 86400)))
      note += `; astropy ${r.versions.astropy}; max |ours − astropy| over the first 50 times ${(worst * 1000).toFixed(1)} ms`
    } else note += `; astropy reference failed: ${(p.stderr || '').trim().split('\n').slice(-1).join(' ')}`
  } else note += '; astropy reference not available'
  return [{
    name: 'UTC → BJD_TDB of 100 000 times (shared/time toBjdTdb)', oursMs, referenceMs, ratio: referenceMs ? oursMs / referenceMs : null,
    target: 'ours ≤ 1 s (a share of the 3-s budget of a 100 000-row upload); ratio against astropy reported', note,
  }]
}

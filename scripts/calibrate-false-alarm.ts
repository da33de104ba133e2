/**
 * Calibrates the search's false-alarm law (shared/rv/planet-search/significance.ts) on simulated
 * noise: seeded data sets without any signal in four sampling designs (few nightly points on a short
 * baseline; a long nightly baseline; two interleaved instruments sampled at random; two instruments
 * one after the other), the search's one-planet step on each (`searchPlanets(data, { planets: 1 })`:
 * the same global step, fit and jitter refit as in automatic mode), and its likelihood gain ΔlnL with
 * the number of independent frequencies M. For each candidate law (ν, trials factor) it prints the
 * fraction of noise sets at FAP ≤ α (should be α) and writes the rows and the chosen law to
 * fixtures/search/false-alarm-calibration.json, which the tests hold the constants to.
 *
 * Run: npx tsx scripts/calibrate-false-alarm.ts [sets per design, default 100]   (≈ 1–2 min at 100)
 */
import { writeFileSync } from 'node:fs'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { searchPlanets, independentFrequencies, keplerianFap, FALSE_ALARM_LAW } from '../shared/rv/index.ts'
import { makeCase, type SurveyCase } from '../tests/shared/rv/planet-search/survey.ts'

const root = join(dirname(fileURLToPath(import.meta.url)), '..')
export const CALIBRATION_FILE = join(root, 'fixtures', 'search', 'false-alarm-calibration.json')

type Design = Omit<SurveyCase, 'seed' | 'name' | 'what'> & { label: string }
/** Invented instruments; no planet, errors as quoted (plus each instrument's jitter). */
export const NOISE_DESIGNS: Design[] = [
  { label: '40 nightly points, 300 d, one instrument', n: 40, baseline: 300, sampling: 'nightly', instrumentLayout: 'interleaved', trend: 'none', instruments: [{ name: 'Heron', offset: 0, jitter: 2, err: [2, 3] }], planets: [] },
  { label: '80 nightly points, 1500 d, one instrument', n: 80, baseline: 1500, sampling: 'nightly', instrumentLayout: 'interleaved', trend: 'none', instruments: [{ name: 'Heron', offset: 0, jitter: 2, err: [2, 3] }], planets: [] },
  { label: '150 random points, 800 d, two interleaved instruments', n: 150, baseline: 800, sampling: 'random', instrumentLayout: 'interleaved', trend: 'none', instruments: [{ name: 'Heron', offset: 0, jitter: 0, err: [2, 3] }, { name: 'Lark', offset: 10, jitter: 3, err: [1, 2] }], planets: [] },
  { label: '60 nightly points, 3000 d, two instruments one after the other', n: 60, baseline: 3000, sampling: 'nightly', instrumentLayout: 'segments', trend: 'none', instruments: [{ name: 'Heron', offset: 0, jitter: 3, err: [3, 5] }, { name: 'Lark', offset: 20, jitter: 2, err: [2, 3] }], planets: [] },
]
export const seedOf = (design: number, k: number): number => 5000 + 1000 * design + k

export interface CalibrationRow { design: number; seed: number; dLnL: number; m: number }

/** Fraction of rows at FAP ≤ α under a law. */
export function fractionAtOrBelow(rows: CalibrationRow[], alpha: number, law: { dof: number; trialsFactor: number }): number {
  return rows.filter((r) => keplerianFap(r.dLnL, r.m, law) <= alpha).length / rows.length
}

function main(): void {
  const perDesign = Number(process.argv[2] ?? 100)
  const rows: CalibrationRow[] = []
  for (let d = 0; d < NOISE_DESIGNS.length; d++) {
    const { label: _label, ...design } = NOISE_DESIGNS[d]!
    for (let k = 0; k < perDesign; k++) {
      const data = makeCase({ ...design, seed: seedOf(d, k), name: 'noise', what: 'pure noise' })
      const r = searchPlanets(data, { planets: 1, trend: 'none' })
      const dLnL = r.steps[1]?.deltaLnL
      if (dLnL === undefined || dLnL === null) continue
      let tmin = Infinity, tmax = -Infinity
      for (const t of data.t) { tmin = Math.min(tmin, t); tmax = Math.max(tmax, t) }
      rows.push({ design: d, seed: seedOf(d, k), dLnL: Number(dLnL.toFixed(6)), m: Number(independentFrequencies(tmax - tmin, r.settings.minPeriod, r.settings.maxPeriod).toFixed(3)) })
    }
    console.error(`${NOISE_DESIGNS[d]!.label}: ${rows.filter((r) => r.design === d).length} sets`)
  }
  const alphas = [0.01, 0.03, 0.1, 0.3]
  console.log(`fraction of ${rows.length} noise sets at FAP ≤ α (should be α):`)
  console.log(`  law          ${alphas.map((a) => `α=${a}`.padStart(9)).join('')}   at 0.001`)
  for (const dof of [4, 6, 8]) {
    for (const trialsFactor of [0.5, 1, 2, 4, 8]) {
      const law = { dof, trialsFactor }
      const mark = dof === FALSE_ALARM_LAW.dof && trialsFactor === FALSE_ALARM_LAW.trialsFactor ? ' ← used' : ''
      console.log(`  ν ${dof}, ×${String(trialsFactor).padEnd(4)} ${alphas.map((a) => fractionAtOrBelow(rows, a, law).toFixed(4).padStart(9)).join('')}   ${fractionAtOrBelow(rows, 0.001, law).toFixed(4)}${mark}`)
    }
  }
  writeFileSync(CALIBRATION_FILE, JSON.stringify({
    what: 'the search\'s one-planet likelihood gain on simulated pure-noise data sets (invented instruments, seeded): see scripts/calibrate-false-alarm.ts',
    command: `npx tsx scripts/calibrate-false-alarm.ts ${perDesign}`,
    law: FALSE_ALARM_LAW,
    designs: NOISE_DESIGNS.map((d) => d.label),
    rows,
  }) + '\n')
  console.error(`wrote ${CALIBRATION_FILE}`)
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) main()

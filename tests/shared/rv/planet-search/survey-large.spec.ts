import { describe, it, expect } from 'vitest'
import { readFileSync } from 'node:fs'
import { searchPlanets, type RvData } from '../../../../shared/rv/index.ts'
import { SURVEY } from './survey.ts'

// 2000 points from four instruments (fixtures/search/survey-large.json) against the independent
// scipy 1.10.1 differential_evolution + least_squares fit (fixtures/search/reference.json).
// Its own file: it is the slowest case (speed is measured in scripts/bench.ts, never here).
const ref = JSON.parse(readFileSync(new URL('../../../../fixtures/search/reference.json', import.meta.url), 'utf8')) as { cases: Record<string, { lnL: number } | undefined> }
const d = JSON.parse(readFileSync(new URL('../../../../fixtures/search/survey-large.json', import.meta.url), 'utf8'))
const data: RvData = { t: Float64Array.from(d.t), y: Float64Array.from(d.y), dy: Float64Array.from(d.dy), instrument: Int32Array.from(d.instrument), instrumentNames: d.instrumentNames }
const truth = SURVEY.find((c) => c.name === 'large')!

describe('synthetic survey: 2000 points, four instruments', () => {
  it('finds both planets, the offsets and reaches the reference lnL within 2', () => {
    const r = searchPlanets(data)
    expect(r.planets).toBe(2)
    for (const p of truth.planets) {
      const got = r.fit.planets.find((q) => Math.abs(q.period - p.period) <= Math.max(3 * q.uncertainty.period, 0.01 * p.period))
      expect(got, `planet at ${p.period} d`).toBeDefined()
      expect(Math.abs(got!.K - p.K)).toBeLessThan(4 * got!.uncertainty.K)
    }
    // the independent reference (scipy differential_evolution + least_squares of the true structure)
    const rc = ref.cases.large
    expect(rc, 'independent reference for the large case in fixtures/search/reference.json').toBeDefined()
    expect(r.fit.stats.lnL).toBeGreaterThanOrEqual(rc!.lnL - 2)
  }, 300_000)
})

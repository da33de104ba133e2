import { it, expect } from 'vitest'
import { readFileSync } from 'node:fs'
import { searchPlanets, type RvData, type SearchResult } from '../../../../shared/rv/index.ts'
import { SURVEY, makeCase, type SurveyCase } from './survey.ts'

// The synthetic survey of issue 9 (tests/shared/rv/planet-search/survey.ts, seeded; data in
// fixtures/search/survey-*.json) against an independent fit of each case's true model by scipy
// 1.10.1 differential_evolution + least_squares (scripts/reference/search_reference.py →
// fixtures/search/reference.json; every class has its reference). The search, from the data alone,
// must pick the true number of planets and reach the reference optimum's lnL within 2.
interface RefCase { nPlanets: number; trend: string; lnL: number; planets: Array<{ period: number; K: number; e: number }>; alias?: { period: number; lnL: number } }
const ref = JSON.parse(readFileSync(new URL('../../../../fixtures/search/reference.json', import.meta.url), 'utf8')) as { provenance: string; cases: Record<string, RefCase> }

function loadData(name: string): RvData {
  const d = JSON.parse(readFileSync(new URL(`../../../../fixtures/search/survey-${name}.json`, import.meta.url), 'utf8'))
  return { t: Float64Array.from(d.t), y: Float64Array.from(d.y), dy: Float64Array.from(d.dy), instrument: Int32Array.from(d.instrument), instrumentNames: d.instrumentNames }
}

/** lnL of the search's fit with the reference's structure (its planets, its trend kind). */
function lnLOf(r: SearchResult, c: RefCase): number {
  if (r.trend === c.trend) return r.fit.stats.lnL
  const alt = r.alternatives.find((a) => a.trend === c.trend && a.planets === c.nPlanets)
  return alt ? alt.lnL : r.fit.stats.lnL
}



/** The fixtures are the generator's output (same seeds, same numbers). */
export function checkFixtures(): void {
  for (const c of SURVEY) {
    const a = makeCase(c), b = loadData(c.name)
    expect(Array.from(a.t)).toEqual(Array.from(b.t))
    expect(Array.from(a.y)).toEqual(Array.from(b.y))
  }
}

/** One test per named case (the spec files split the survey to stay short on a busy machine). */
export function describeSurvey(names: string[]): void {
  const cases: SurveyCase[] = SURVEY.filter((c) => names.includes(c.name))
  for (const c of cases) {
    it(`${c.name}: ${c.what}`, () => {
      const data = loadData(c.name)
      const rc: RefCase | undefined = ref.cases[c.name]
      expect(rc, `independent reference for ${c.name} in fixtures/search/reference.json`).toBeDefined()
      if (!rc) return
      expect(rc.nPlanets).toBe(c.planets.length)
      const r = searchPlanets(data)
      expect(r.planets).toBe(c.planets.length)
      expect(lnLOf(r, rc)).toBeGreaterThanOrEqual(rc.lnL - 2)
      // every true planet found near its period (within 3σ or 1 %), no alias in its place
      for (const p of c.planets) {
        const got = r.fit.planets.find((q) => Math.abs(q.period - p.period) <= Math.max(3 * q.uncertainty.period, 0.01 * p.period))
        expect(got, `planet at ${p.period} d among ${r.fit.planets.map((q) => q.period.toFixed(3)).join(', ')}`).toBeDefined()
      }
      if (c.planets.length === 0) expect(r.fit.planets).toHaveLength(0)
      if (c.trend !== 'none') expect(r.trend).toBe(c.trend)
      if (rc.alias) {
        // the independent fit says the alias is worse; the search reports the partner it beat
        expect(rc.alias.lnL).toBeLessThan(rc.lnL - 5)
        const s = r.signals[0]
        expect(s.runnerUpDeltaLnL).not.toBeNull()
        expect(s.runnerUpDeltaLnL!).toBeGreaterThan(5)
        expect(s.aliases.some((a) => Math.abs(a.period - rc.alias!.period) < 0.02 * rc.alias!.period)).toBe(true)
      }
    }, 300_000)
  }
}

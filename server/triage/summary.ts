// The automatic search of one star, as the triage worker thread runs it: the core's planet search
// (`searchPlanets` with SEARCH_DEFAULTS and GRID_DEFAULTS, the same function and defaults as the
// search route and the CLI), with the star's activity indicators when it has any, reduced to the
// figures of the team table (shared/api/survey.ts TriageSummary).
import { searchPlanets, type IndicatorColumn, type RvData, type SearchResult } from '../../shared/rv/index.ts'
import type { TriageSummary } from '../../shared/api/survey.ts'

export interface TriageInput {
  data: RvData
  /** Indicator columns, one value per row (NaN where missing); empty: no vetting. */
  indicators: Array<{ name: string; value: Float64Array }>
}

const fin = (v: number | null | undefined): number | null => (v !== null && v !== undefined && Number.isFinite(v) ? v : null)

/** The table's figures from a search result. */
export function summarise(data: RvData, r: SearchResult, indicatorNames: string[]): TriageSummary {
  const n = data.t.length
  let lo = Infinity, hi = -Infinity
  for (let i = 0; i < n; i++) { lo = Math.min(lo, data.t[i]!); hi = Math.max(hi, data.t[i]!) }
  const none = r.steps[0]
  const one = r.steps[1]
  const labelled = new Set(r.activity?.activity ?? [])
  return {
    points: n, instruments: data.instrumentNames.length, baseline: n ? hi - lo : 0,
    strongestPeriod: fin(none?.nextPeakPeriod), strongestFap: fin(none?.nextPeakFap),
    deltaBic: none && one ? fin(none.bic - one.bic) : null,
    keplerianFap: fin(one?.falseAlarm),
    candidates: r.fit.planets.length, planets: r.planets, activity: labelled.size > 0, indicators: indicatorNames,
    trend: r.trend,
    signals: r.fit.planets.map((p, j) => ({ period: p.period, K: p.K, e: p.e, activity: labelled.has(j) })),
    flags: r.flags.filter((f) => f.severity !== 'info').map((f) => f.message),
  }
}

/** Runs the search of one star (call it in a worker thread: it takes about a second at 200 points). */
export function triageSearch(inp: TriageInput): TriageSummary {
  const indicators: IndicatorColumn[] = inp.indicators.map((c) => ({ name: c.name, value: c.value }))
  const r = searchPlanets(inp.data, indicators.length ? { indicators } : {})
  return summarise(inp.data, r, indicators.map((c) => c.name))
}

/**
 * The search's judgement beside its chosen model — flags, alias partners, alternatives (without
 * their fits) and the settings used — as plain JSON, the same for the CLI's `--json` and the API.
 */
import type { SearchResult } from './planet-search/index.ts'
import type { TrendKind } from './orbit-fit-types.ts'

export interface SearchSummary {
  flags: Array<{ kind: string; severity: 'rejection' | 'warning' | 'info'; period: number | null; instrument: string | null; message: string }>
  signals: Array<{
    planet: number; period: number; runnerUpDeltaLnL: number | null
    aliases: Array<{ period: number; relation: string; lnL: number; converged: boolean }>
  }>
  alternatives: Array<{ description: string; planets: number; trend: TrendKind; bic: number; lnL: number }>
  /** Flagged candidates: kept by the BIC and false-alarm rules, not counted as planets (their doubts in `flags`). */
  candidates: Array<{ period: number; K: number; e: number; omegaDeg: number; deltaLnL: number; deltaBic: number; kinds: string[] }>
  settings: { minPeriod: number; maxPeriod: number; bicThreshold: number; maxPlanets: number; falseAlarm: number }
}

export function searchSummary(r: Pick<SearchResult, 'flags' | 'signals' | 'alternatives' | 'settings'> & Partial<Pick<SearchResult, 'candidates'>>): SearchSummary {
  const fin = (v: number | null | undefined): number | null => (v !== null && v !== undefined && Number.isFinite(v) ? v : null)
  return {
    flags: r.flags.map((f) => ({ kind: f.kind, severity: f.severity, period: f.period, instrument: f.instrument, message: f.message })),
    signals: r.signals.map((sg) => ({
      planet: sg.planet, period: sg.period, runnerUpDeltaLnL: fin(sg.runnerUpDeltaLnL),
      aliases: sg.aliases.filter((x) => Number.isFinite(x.lnL)).map((x) => ({ period: x.period, relation: x.relation, lnL: x.lnL, converged: x.converged })),
    })),
    alternatives: r.alternatives.filter((x) => Number.isFinite(x.bic) && Number.isFinite(x.lnL))
      .map((x) => ({ description: x.description, planets: x.planets, trend: x.trend, bic: x.bic, lnL: x.lnL })),
    candidates: (r.candidates ?? []).map((c) => ({ period: c.period, K: c.K, e: c.e, omegaDeg: c.omegaDeg, deltaLnL: c.deltaLnL, deltaBic: c.deltaBic, kinds: c.flags.map((f) => f.kind) })),
    settings: { minPeriod: r.settings.minPeriod, maxPeriod: r.settings.maxPeriod, bicThreshold: r.settings.bicThreshold, maxPlanets: r.settings.maxPlanets, falseAlarm: r.settings.falseAlarm },
  }
}

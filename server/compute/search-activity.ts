// The search when the star has activity indicators: the core's planet search with its indicators
// (every kept signal vetted, `activity-vetting.ts`); in automatic mode the signals labelled activity
// candidates are left out of the model, which is refitted with the planets alone, and reported with
// their evidence. Also the rotation period a GP starts from: the strongest significant indicator peak.
import {
  fitSpec, indicatorDiagnostics, searchPlanets, searchSummary, VETTING_DEFAULTS,
  type Correlation, type IndicatorColumn, type RvData, type SearchOptions, type SearchStep, type TrendKind,
} from '../../shared/rv/index.ts'
import type { ActivityReport } from '../../shared/api/analyses.ts'
import type { PlainFit } from './fit-noise.ts'

export interface ActivitySearchInput { data: RvData; options: SearchOptions; indicators: IndicatorColumn[] }
export interface ActivitySearchOutput {
  fit: PlainFit; planets: number; trend: TrendKind; steps: SearchStep[]
  report: ReturnType<typeof searchSummary> & { activity?: ActivityReport }
}

const num = (v: number | undefined | null): number | null => (v !== undefined && v !== null && Number.isFinite(v) ? v : null)
const corr = (c: Correlation | null) => ({ pearson: num(c?.pearson), pearsonP: num(c?.pearsonP), spearman: num(c?.spearman) })

export function activitySearchTask(inp: ActivitySearchInput): ActivitySearchOutput {
  const { data, options } = inp
  const r = searchPlanets(data, { ...options, indicators: inp.indicators.length ? inp.indicators : undefined })
  const summary = searchSummary(r)
  const { history: _h, ...full } = r.fit
  if (!r.activity) return { fit: full, planets: r.planets, trend: r.trend, steps: r.steps, report: summary }
  const v = r.activity
  const auto = (options.planets ?? 'auto') === 'auto'
  const labelled = auto ? new Set(v.activity) : new Set<number>()
  const candidates: ActivityReport['candidates'] = v.candidates.map((c, j) => {
    const p = full.planets[j]!
    return {
      signal: j, period: p.period, K: p.K, e: p.e, omegaDeg: p.omegaDeg, tc: p.tc, activity: c.activity,
      matches: c.matches.map((m) => ({
        indicator: m.indicator, kind: m.kind, relation: m.relation, indicatorPeriod: m.indicatorPeriod, fap: m.fap, ...corr(m.correlation),
      })),
      cautions: c.cautions, overruled: null,
    }
  })
  const activity: ActivityReport = {
    candidates,
    indicators: v.indicators.map((d) => ({ name: d.name, n: d.n, peaks: d.peaks.slice(0, 3).map((q) => ({ period: q.period, fap: q.fap })), ...corr(d.rv) })),
    cautions: v.cautions,
    settings: { peakFap: v.settings.peakFap, correlationP: v.settings.correlationP, minAbsR: v.settings.minAbsR },
  }
  if (!labelled.size) return { fit: full, planets: r.planets, trend: r.trend, steps: r.steps, report: { ...summary, activity } }
  // The model keeps the planets only: refit them from the search's values (the activity signals go to the residuals).
  const keep = full.planets.map((_, j) => j).filter((j) => !labelled.has(j))
  const specs = keep.map((j) => { const p = full.planets[j]!; return { period: p.period, K: p.K, e: p.e, omegaDeg: p.omegaDeg, tc: p.tc } })
  const { history: _h2, ...fit } = fitSpec(data, specs, { trend: r.trend }).fit
  const signals = summary.signals.filter((sg) => !labelled.has(sg.planet)).map((sg) => ({ ...sg, planet: keep.indexOf(sg.planet) }))
  const flags = [...summary.flags, ...candidates.filter((c) => labelled.has(c.signal)).map((c) => ({
    kind: 'activity', severity: 'rejection' as const, period: c.period, instrument: null,
    message: `The ${c.period.toPrecision(4)}-d signal is an activity candidate and is not counted as a planet: ${c.cautions[0] ?? 'it follows an activity indicator.'} Overrule it to count it as a planet, or model the activity with a GP.`,
  }))]
  return { fit, planets: keep.length, trend: r.trend, steps: r.steps, report: { ...summary, signals, flags, activity } }
}

export interface IndicatorPeakInput { data: RvData; indicators: IndicatorColumn[] }
export interface RotationGuess { period: number; fap: number; indicator: string; source: string }

/** The strongest significant (FAP below the vetting level) peak over all indicators, or null. */
export function rotationGuessTask(inp: IndicatorPeakInput): RotationGuess | null {
  let best: RotationGuess | null = null
  for (const col of inp.indicators) {
    let d
    try { d = indicatorDiagnostics(inp.data, col) } catch { continue }
    const top = d.peaks.find((q) => q.fap < VETTING_DEFAULTS.peakFap)
    if (top && (!best || top.fap < best.fap)) {
      const fap = top.fap < 1e-3 ? top.fap.toExponential(0) : top.fap.toPrecision(2)
      best = { period: top.period, fap: top.fap, indicator: col.name, source: `the '${col.name}' periodogram peak (FAP ${fap})` }
    }
  }
  return best
}

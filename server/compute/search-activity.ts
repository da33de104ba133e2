// The search when the star has activity indicators: the core's `searchWithActivity` (as the CLI runs
// it): the white-noise search vets every signal against the indicators (activity candidates are not
// counted as planets and are reported with their evidence and their orbit, for an overrule), then
// planets are searched on top of a GP tied to the rotation period; the noise model with the lower BIC
// makes the model. Also the rotation period a GP starts from: the strongest significant indicator peak.
import {
  indicatorDiagnostics, meanEpoch, searchSummary, searchWithActivity, VETTING_DEFAULTS,
  type Correlation, type IndicatorColumn, type RvData, type SearchOptions, type SearchStep, type TrendKind,
} from '../../shared/rv/index.ts'
import type { ActivityReport, FitNoise, GpNoiseSpec } from '../../shared/api/analyses.ts'
import { gpAsPlainFit, gpNoise, type PlainFit } from './fit-noise.ts'

export interface ActivitySearchInput { data: RvData; options: SearchOptions; indicators: IndicatorColumn[] }
export interface ActivitySearchOutput {
  fit: PlainFit; planets: number; trend: TrendKind; steps: SearchStep[]
  report: ReturnType<typeof searchSummary> & { activity?: ActivityReport }
  /** When planets + GP is preferred: the spec's noise model, the result's noise section and the activity per row. */
  noise?: GpNoiseSpec
  fitNoise?: FitNoise
  activityRows?: Float64Array
}

const num = (v: number | undefined | null): number | null => (v !== undefined && v !== null && Number.isFinite(v) ? v : null)
const corr = (c: Correlation | null) => ({ pearson: num(c?.pearson), pearsonP: num(c?.pearsonP), spearman: num(c?.spearman) })

export function activitySearchTask(inp: ActivitySearchInput): ActivitySearchOutput {
  const { data, options } = inp
  // One science path: the CLI's search for a table with indicator columns (`searchWithActivity`):
  // the white-noise search with its vetting first, then planets on top of a GP tied to the rotation period.
  const r = searchWithActivity(data, {
    indicators: inp.indicators, search: { trend: options.trend, falseAlarm: options.falseAlarm, bicThreshold: options.bicThreshold, maxPlanets: options.maxPlanets },
    minPeriod: options.minPeriod, maxPeriod: options.maxPeriod, ...(options.maxPlanets !== undefined ? { maxPlanets: options.maxPlanets } : {}),
  })
  const w = r.whiteSearch
  const summary = searchSummary(w)
  const { history: _h, ...full } = w.fit
  const span = full.planets.length ? Math.max(...data.t) - Math.min(...data.t) : 1
  const v = w.activity
  const candidates: ActivityReport['candidates'] = (v?.candidates ?? []).map((c, j) => {
    const p = full.planets[j]!
    return {
      signal: j, period: p.period, K: p.K, e: p.e, omegaDeg: p.omegaDeg, tc: p.tc, activity: c.activity,
      matches: c.matches.map((m) => ({
        indicator: m.indicator, kind: m.kind, relation: m.relation, indicatorPeriod: m.indicatorPeriod, fap: m.fap, ...corr(m.correlation),
      })),
      cautions: c.cautions, overruled: null,
    }
  })
  const extra = r.activity.filter((a) => a.source !== 'velocities').flatMap((a) => a.evidence)
  const activity: ActivityReport = {
    candidates,
    indicators: (v?.indicators ?? []).map((d) => ({ name: d.name, n: d.n, peaks: d.peaks.slice(0, 3).map((q) => ({ period: q.period, fap: q.fap })), ...corr(d.rv) })),
    cautions: [...new Set([...r.cautions, ...extra])],
    settings: { peakFap: v?.settings.peakFap ?? VETTING_DEFAULTS.peakFap, correlationP: v?.settings.correlationP ?? VETTING_DEFAULTS.correlationP, minAbsR: v?.settings.minAbsR ?? VETTING_DEFAULTS.minAbsR },
  }
  // the kept planets: signals of the white search whose period is one of the final planets'
  const finalPeriods = r.planets.map((p) => p.period)
  const near = (a: number, b: number) => Math.abs(1 / a - 1 / b) <= 1 / Math.max(span, 1)
  const signals = summary.signals.flatMap((sg) => { const k = finalPeriods.findIndex((p) => near(p, sg.period)); return k < 0 ? [] : [{ ...sg, planet: k }] })
  const labelled = candidates.filter((c) => c.activity)
  const flags = [...summary.flags, ...labelled.map((c) => ({
    kind: 'activity', severity: 'rejection' as const, period: c.period, instrument: null,
    message: `The ${c.period.toPrecision(4)}-d signal is an activity candidate and is not counted as a planet: ${c.cautions[0] ?? 'it follows an activity indicator.'} Overrule it to count it as a planet.`,
  }))]
  const noiseWords = r.preferred === 'gp'
    ? `Planets + GP preferred: BIC ${r.bic.gp?.toFixed(1)} against ${r.bic.white.toFixed(1)} with white noise and the same planets.`
    : r.bic.gp !== null ? `White noise kept: BIC ${r.bic.white.toFixed(1)} against ${r.bic.gp.toFixed(1)} with a GP.` : null
  if (noiseWords) activity.cautions.push(noiseWords)
  const report = { ...summary, signals, flags, activity }
  const epoch = meanEpoch(data.t)
  if (r.preferred === 'gp' && r.gpFit && r.rotation) {
    const g = r.gpFit
    const noise = { kind: 'gp' as const, kernel: g.noise.kernel.kind, period: { value: r.rotation.period, sigma: r.rotation.sigma, source: r.rotation.source } }
    return {
      fit: gpAsPlainFit(data, g, g.trend.epoch ?? epoch), planets: r.planets.length, trend: g.trend.kind, steps: w.steps, report,
      noise, fitNoise: gpNoise(data, noise, g, data.instrumentNames.map(() => null)), activityRows: g.activity,
    }
  }
  const { history: _h2, ...white } = r.whiteFit ?? w.fit
  return { fit: white, planets: r.planets.length, trend: w.trend, steps: w.steps, report }
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

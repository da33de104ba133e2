/**
 * The report's parameter and instrument tables from a frozen snapshot: one row per quantity, the
 * fitted value with its 1σ error, and the posterior median with its 16th–84th percentile interval
 * when the solution was sampled. Printed by the PDF, the LaTeX export and the report page alike.
 */
import type { ReportSnapshot } from '../api/reports.ts'
import { formatPlain, roundAsymmetric, roundByUncertainty } from './round.ts'

export interface ParameterRow {
  /** Stable name for comments: "b.K", "HARPS.jitter", "trend.slope". */
  key: string
  planet: string | null
  label: string
  /** Plain-text unit ('' for none). */
  unit: string
  /** LaTeX symbol and unit for the header of the pasted table. */
  texSymbol: string
  texUnit: string
  kind: 'fitted' | 'derived'
  value: number | null
  error: number | null
  /** Posterior median and interval when sampled. */
  median: number | null
  plus: number | null
  minus: number | null
}

const PLANET_QUANTITIES = [
  { q: 'period', post: 'P', label: 'Period P', unit: 'd', tex: '$P$', texUnit: 'd', kind: 'fitted' },
  { q: 'K', post: 'K', label: 'Semi-amplitude K', unit: 'm/s', tex: '$K$', texUnit: 'm\\,s$^{-1}$', kind: 'fitted' },
  { q: 'e', post: 'e', label: 'Eccentricity e', unit: '', tex: '$e$', texUnit: '', kind: 'fitted' },
  { q: 'omegaDeg', post: 'ω', label: 'Argument of periastron ω', unit: 'deg', tex: '$\\omega$', texUnit: 'deg', kind: 'fitted' },
  { q: 'tc', post: 'Tc', label: 'Time of conjunction Tc', unit: 'JD', tex: '$T_\\mathrm{c}$', texUnit: 'JD', kind: 'fitted' },
  { q: 'tp', post: 'Tp', label: 'Time of periastron Tp', unit: 'JD', tex: '$T_\\mathrm{p}$', texUnit: 'JD', kind: 'fitted' },
  { q: 'msiniMjup', post: 'M sin i', label: 'Minimum mass M sin i', unit: 'M_Jup', tex: '$M\\sin i$', texUnit: '$M_\\mathrm{J}$', kind: 'derived' },
  { q: 'msiniMearth', post: 'M sin i (Earth masses)', label: 'Minimum mass M sin i', unit: 'M_Earth', tex: '$M\\sin i$', texUnit: '$M_\\oplus$', kind: 'derived' },
  { q: 'aAu', post: 'a', label: 'Semi-major axis a', unit: 'au', tex: '$a$', texUnit: 'au', kind: 'derived' },
] as const

export function parameterRows(s: ReportSnapshot): ParameterRow[] {
  const post = new Map((s.sampling?.parameters ?? []).map((p) => [p.name, p]))
  const interval = (name: string) => {
    const p = post.get(name)
    return p ? { median: p.median, plus: p.hi - p.median, minus: p.median - p.lo } : { median: null, plus: null, minus: null }
  }
  const rows: ParameterRow[] = []
  for (const p of s.result.planets) {
    for (const d of PLANET_QUANTITIES) {
      const value = p[d.q]
      const error = d.kind === 'fitted' ? p.uncertainty[d.q as keyof typeof p.uncertainty] : p.derivedUncertainty[d.q as keyof typeof p.derivedUncertainty]
      rows.push({
        key: `${p.label}.${d.q}`, planet: p.label, label: d.label, unit: d.unit, texSymbol: d.tex, texUnit: d.texUnit, kind: d.kind,
        value, error, ...interval(`${d.post} ${p.label}`),
      })
    }
  }
  if (s.result.trend && s.result.trend.kind !== 'none') {
    const t = s.result.trend
    rows.push({ key: 'trend.slope', planet: null, label: 'Linear trend', unit: 'm/s/d', texSymbol: '$\\dot\\gamma$', texUnit: 'm\\,s$^{-1}$\\,d$^{-1}$', kind: 'fitted', value: t.slope, error: t.slopeErr, median: null, plus: null, minus: null })
    if (t.kind === 'quadratic') rows.push({ key: 'trend.curvature', planet: null, label: 'Quadratic trend', unit: 'm/s/d²', texSymbol: '$\\ddot\\gamma$', texUnit: 'm\\,s$^{-1}$\\,d$^{-2}$', kind: 'fitted', value: t.curvature, error: t.curvatureErr, median: null, plus: null, minus: null })
  }
  return rows
}

export interface InstrumentRow {
  name: string; n: number; offset: number | null; offsetErr: number | null; jitter: number | null; jitterErr: number | null; rms: number | null
  offsetPost: { median: number; plus: number; minus: number } | null; jitterPost: { median: number; plus: number; minus: number } | null
}

export function instrumentRows(s: ReportSnapshot): InstrumentRow[] {
  const post = new Map((s.sampling?.parameters ?? []).map((p) => [p.name, p]))
  const iv = (name: string) => { const p = post.get(name); return p ? { median: p.median, plus: p.hi - p.median, minus: p.median - p.lo } : null }
  return s.result.instruments.map((i) => ({ ...i, offsetPost: iv(`offset ${i.name}`), jitterPost: iv(`jitter ${i.name}`) }))
}

/** "12.34 ± 0.56" (plain text) for tables on screen and in the PDF. */
export function plainValue(value: number | null, error: number | null): string {
  if (value === null || !Number.isFinite(value)) return '—'
  if (error === 0) return `${formatPlain(value)} (fixed)`
  if (error === null || !(error > 0) || !Number.isFinite(error)) return formatPlain(value)
  const r = roundByUncertainty(value, error)
  return `${r.value} ± ${r.error}`
}

/** "12.3 +0.6 −0.5" (plain text). */
export function plainInterval(median: number | null, plus: number | null, minus: number | null): string {
  if (median === null || plus === null || minus === null || !(plus > 0) || !(minus > 0)) return '—'
  const r = roundAsymmetric(median, plus, minus)
  return `${r.value} +${r.plus} −${r.minus}`
}

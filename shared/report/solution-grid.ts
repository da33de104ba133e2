/**
 * The solution as a grid a reader scans down: one row per quantity, one column per planet, grouped
 * into "Orbit" (fitted), "Derived" (needs the stellar mass) and "Long-term drift". The same grid
 * is printed on the report page, in the PDF and in the LaTeX export, so the three never disagree.
 * Instruments get their own small grid (one row per instrument).
 */
import type { ReportSnapshot } from '../api/reports.ts'
import { parameterRows, type ParameterRow } from './table.ts'
import { snapshotTimeSystem } from './time-label.ts'

export interface GridCell {
  /** Stable key for comments and approvals ("b.K"). */
  key: string
  value: number | null
  error: number | null
  median: number | null
  plus: number | null
  minus: number | null
}

export interface GridRow {
  id: string
  /** Words first, the symbol after: "Semi-amplitude K". */
  label: string
  /** Plain-text unit ("d", "m/s", "BJD_TDB − 2 450 000"); '' for none. */
  unit: string
  /** LaTeX name with its symbol, e.g. "Semi-amplitude $K$". */
  texLabel: string
  /** LaTeX unit, e.g. "m\\,s$^{-1}$". */
  texUnit: string
  /** Subtracted from every value before printing (times shown against a reduced epoch). */
  shift: number
  /** Multiplies every value and error before printing (drifts per day shown per year). */
  scale: number
  /** A time row (the unit is the time system; the reduction is stated once in a note). */
  isTime: boolean
  /** One cell per column; null where the quantity does not apply (a drift row has one cell). */
  cells: Array<GridCell | null>
}

export interface GridSection {
  title: string
  rows: GridRow[]
  /** A sentence printed under the section (the noise model's priors). */
  note?: string
}

export interface SolutionGrid {
  /** Column headings: the planets' labels. */
  columns: string[]
  sections: GridSection[]
  /** The time system of Tc and Tp, e.g. "BJD_TDB − 2 450 000", and its LaTeX. */
  timeUnit: string
  timeUnitTex: string
  sampled: boolean
}

/** Julian year in days (IAU). */
const YEAR = 365.25

const ORBIT = ['period', 'K', 'e', 'omegaDeg', 'tc', 'tp'] as const
const DERIVED = ['msiniMjup', 'msiniMearth', 'aAu'] as const

const TEX: Record<string, { label: string; unit: string }> = {
  period: { label: 'Period $P$', unit: 'd' },
  K: { label: 'Semi-amplitude $K$', unit: 'm\\,s$^{-1}$' },
  e: { label: 'Eccentricity $e$', unit: '' },
  omegaDeg: { label: 'Periastron argument $\\omega_\\star$', unit: 'deg' },
  tc: { label: 'Conjunction $T_\\mathrm{c}$', unit: '' },
  tp: { label: 'Periastron $T_\\mathrm{p}$', unit: '' },
  msiniMjup: { label: 'Minimum mass $M_\\mathrm{p}\\sin i$', unit: '$M_\\mathrm{J}$' },
  msiniMearth: { label: 'Minimum mass $M_\\mathrm{p}\\sin i$', unit: '$M_\\oplus$' },
  aAu: { label: 'Semi-major axis $a$', unit: 'au' },
  slope: { label: 'Linear drift', unit: 'm\\,s$^{-1}$\\,yr$^{-1}$' },
  curvature: { label: 'Quadratic drift', unit: 'm\\,s$^{-1}$\\,yr$^{-2}$' },
}

const LABEL: Record<string, string> = {
  period: 'Period P', K: 'Semi-amplitude K', e: 'Eccentricity e', omegaDeg: 'Periastron argument ω★', tc: 'Conjunction Tc', tp: 'Periastron Tp',
  msiniMjup: 'Minimum mass Mp sin i', msiniMearth: 'Minimum mass Mp sin i', aAu: 'Semi-major axis a', slope: 'Linear drift', curvature: 'Quadratic drift',
}
const UNIT: Record<string, string> = {
  period: 'd', K: 'm/s', e: '', omegaDeg: 'deg', msiniMjup: 'M_J', msiniMearth: 'M⊕', aAu: 'au', slope: 'm/s/yr', curvature: 'm/s/yr²',
}

function cellOf(r: ParameterRow | undefined): GridCell | null {
  if (!r) return null
  return { key: r.key, value: r.value, error: r.error, median: r.median, plus: r.plus, minus: r.minus }
}

/** Every parameter a reviewer can comment on, keyed as stored ("b.K", "HARPS.jitter") and named in words. */
export function parameterChoices(s: ReportSnapshot): Array<{ value: string; title: string }> {
  const rows = parameterRows(s)
  const out = rows.map((r) => {
    const q = r.key.slice(r.key.indexOf('.') + 1)
    const words = r.planet ? `Planet ${r.planet}: ${LABEL[q] ?? r.label}` : (r.key === 'trend.slope' ? LABEL.slope! : LABEL.curvature!)
    return { value: r.key, title: `${words}${q === 'msiniMearth' ? ' (Earth masses)' : q === 'msiniMjup' ? ' (Jupiter masses)' : ''}` }
  })
  for (const i of s.result.instruments) {
    out.push({ value: `${i.name}.offset`, title: `${i.name}: zero point` }, { value: `${i.name}.jitter`, title: `${i.name}: jitter` })
  }
  return out
}

/** The words for a stored parameter key (the key itself when unknown). */
export function parameterTitle(s: ReportSnapshot | null, key: string): string {
  return (s && parameterChoices(s).find((c) => c.value === key)?.title) ?? key
}

/** The grid of a frozen snapshot. */
export function solutionGrid(s: ReportSnapshot): SolutionGrid {
  const rows = parameterRows(s)
  const byKey = new Map(rows.map((r) => [r.key, r]))
  const planets = s.result.planets.map((p) => p.label)
  const time = snapshotTimeSystem(s)
  const row = (q: string): GridRow => {
    const isTime = q === 'tc' || q === 'tp'
    return {
      id: q, label: LABEL[q]!, unit: isTime ? time.label : UNIT[q]!,
      texLabel: TEX[q]!.label, texUnit: isTime ? time.texScale : TEX[q]!.unit, shift: isTime ? time.offset : 0, scale: 1, isTime,
      cells: planets.map((p) => cellOf(byKey.get(`${p}.${q}`))),
    }
  }
  const sections: GridSection[] = [
    { title: 'Orbit', rows: ORBIT.map(row) },
    { title: 'Derived', rows: DERIVED.map(row) },
  ]
  const drift = rows.filter((r) => r.planet === null)
  if (drift.length) {
    sections.push({
      title: 'Long-term drift',
      rows: drift.map((r) => {
        const q = r.key === 'trend.slope' ? 'slope' : 'curvature'
        // per year (and per year squared): readable numbers where per day gives 1e-6 (common practice)
        const scale = q === 'slope' ? YEAR : YEAR * YEAR
        const c = cellOf(r)
        return {
          id: q, label: LABEL[q]!, unit: UNIT[q]!, texLabel: TEX[q]!.label, texUnit: TEX[q]!.unit, shift: 0, scale: 1, isTime: false,
          cells: [c && { ...c, value: c.value === null ? null : c.value * scale, error: c.error === null ? null : c.error * scale }],
        }
      }),
    })
  }
  const noise = noiseSection(s)
  if (noise) sections.push(noise)
  return { columns: planets, sections, timeUnit: time.label, timeUnitTex: time.tex, sampled: !!s.sampling }
}

const TEX_SYMBOL: Record<string, string> = { P_rot: '$P_\\mathrm{rot}$', 'τ_d': '$\\tau_\\mathrm{d}$', 'λ': '$\\lambda$', f: '$f$', 'Γ': '$\\Gamma$', h: '$h$' }
const texUnitOf = (u: string): string => (u === 'm/s' ? 'm\\,s$^{-1}$' : u)
const texEscape = (t: string): string => t.replace(/[\\{}$&#^_%~]/g, (c) => `\\${c}`)

/**
 * The GP noise model as one more section (one cell per row: the hyperparameters are the star's, not a
 * planet's), values from the fit (maximum a posteriori with Laplace errors); its priors as the note.
 */
function noiseSection(s: ReportSnapshot): GridSection | null {
  const n = s.result.noise
  if (!n || n.kind !== 'gp') return null
  return {
    title: `Noise model (GP, ${n.kernel} kernel)`,
    note: `GP priors: ${n.priors.join('; ')}.`,
    rows: n.hyperparameters.map((h) => {
      const texSym = TEX_SYMBOL[h.symbol] ?? `$h_\\mathrm{${texEscape(h.symbol.replace(/^h_/, ''))}}$`
      const words = h.name.charAt(0).toUpperCase() + h.name.slice(1)
      return {
        id: `noise.${h.symbol}`, label: `${words} ${h.symbol}`, unit: h.unit, texLabel: `${texEscape(words)} ${texSym}`, texUnit: texUnitOf(h.unit),
        shift: 0, scale: 1, isTime: false,
        cells: [{ key: `noise.${h.symbol}`, value: h.value, error: h.fixed ? 0 : h.error, median: null, plus: null, minus: null }],
      }
    }),
  }
}

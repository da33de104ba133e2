// Plain-text tables and number formatting of the command line (JSON keeps full precision).
import { roundByUncertainty, atPlace, errorPlace } from '../../shared/report/round.ts'

export interface CliIo { out: (s: string) => void; err: (s: string) => void }

export function fmt(v: number): string {
  if (v === 0) return '0'
  const a = Math.abs(v)
  if (a >= 1e6) return v.toFixed(5)
  if (a >= 1e-3 && a < 1e6) return Number(v.toPrecision(7)).toString()
  return v.toExponential(3)
}

export function table(rows: Array<Array<string | number | null>>, head: string[]): string {
  const cells = [head, ...rows.map((r) => r.map((c) => (c === null || (typeof c === 'number' && !Number.isFinite(c)) ? '—' : typeof c === 'number' ? fmt(c) : c)))]
  const widths = head.map((_, j) => Math.max(...cells.map((r) => String(r[j]).length)))
  return cells.map((r) => r.map((c, j) => String(c).padStart(widths[j])).join('  ')).join('\n')
}

export function finiteOrNull(v: number | undefined | null): number | null {
  return v === undefined || v === null || !Number.isFinite(v) ? null : v
}

/** Units of the JSON fields, as strings astropy's `u.Unit` parses ('' = dimensionless). */
export const UNITS = Object.freeze({
  time: 'd', period: 'd', frequency: '1 / d', baselineDays: 'd', power: '', fap: '',
  K: 'm / s', e: '', omegaDeg: 'deg', tp: 'd', tc: 'd', msiniMjup: 'jupiterMass', msiniMearth: 'earthMass', aAu: 'AU',
  offset: 'm / s', jitter: 'm / s', rms: 'm / s', slope: 'm / (s d)', curvature: 'm / (s d2)', epoch: 'd',
  starMass: 'solMass', timingMs: 'ms',
})

/** The caution printed where a peak or a search result is read. */
export const PEAK_CAUTION = 'A significant peak is not yet a planet: stellar activity, rotation and the sampling can all make one.'

/** `value ± error` rounded by the uncertainty (shared/report/round.ts, PDG rule); 3 significant digits when there is no usable error. */
export function withError(v: number | null, e: number | null | undefined): string {
  if (v === null || !Number.isFinite(v)) return '—'
  if (e === null || e === undefined || !(e > 0) || !Number.isFinite(e)) return Number(v.toPrecision(3)).toString()
  const r = roundByUncertainty(v, e)
  return `${r.value} ± ${r.error}`
}

/** The instrument table: offset and jitter with their errors, rms at the offset error's decimal place. */
export function instrumentTable(ins: ReadonlyArray<{ name: string; n: number; offset: number; offsetErr: number; jitter: number; jitterErr: number; rms: number }>): string {
  const rmsText = (i: (typeof ins)[number]): string => {
    if (!Number.isFinite(i.rms)) return '—'
    const e = [i.offsetErr, i.jitterErr].find((x) => x > 0 && Number.isFinite(x))
    return e === undefined ? Number(i.rms.toPrecision(3)).toString() : atPlace(i.rms, errorPlace(e).place)
  }
  return table(ins.map((i) => [i.name, i.n, withError(i.offset, i.offsetErr), withError(i.jitter, i.jitterErr), rmsText(i)]),
    ['instrument', 'n', 'offset [m/s]', 'jitter [m/s]', 'rms [m/s]'])
}

/**
 * The unit of epochs (Tp, Tc) in a table read with this time format: times are stored as full Julian
 * dates, and only a BJD column names its time scale; "days" keeps the table's own zero.
 */
export function epochUnit(timeFormat: string): string {
  if (timeFormat === 'bjd') return 'BJD'
  if (timeFormat === 'days') return 'd, table zero'
  return 'JD, scale unstated'
}

/**
 * The data of a frozen report as one table (one row per measurement of the fitted instruments:
 * the value, the model velocity with offset and drift, the residual, the instrument, the exclusion
 * flag and reason), and its two serialisations:
 *   - CSV with a single header row whose names carry the unit and the time system
 *     (`bjd_tdb_d`, `rv_m_s`): `pandas.read_csv` and `astropy.io.ascii.read` take it as it is;
 *   - ECSV 1.0 (the YAML-headed format astropy writes and reads with units and metadata:
 *     `astropy.table.Table.read(path, format='ascii.ecsv')`).
 * Text cells that a spreadsheet would run as a formula (=, +, −, @, tab, CR first) are
 * neutralised with a leading apostrophe (common practice against CSV formula injection).
 */
import { stringify } from 'yaml'
import type { ReportSnapshot } from '../api/reports.ts'
import { modelVelocity } from './curve.ts'
import { snapshotTimeSystem } from './time-label.ts'

type Value = string | number | boolean | null

export interface DataColumn {
  name: string
  /** Astropy-parsable unit string ('d', 'm / s'); absent for text, counts and flags. */
  unit?: string
  datatype: 'int64' | 'float64' | 'string' | 'bool'
  description: string
}

export interface DataTable { columns: DataColumn[]; rows: Value[][]; meta: Record<string, string | number> }

/** A text cell that starts like a formula gets a leading apostrophe. */
export function neutraliseFormula(text: string): string {
  return /^[=+\-@\t\r]/.test(text) ? `'${text}` : text
}

/** The report's measurements with model and residual (excluded points get the model evaluated at their time). */
export function reportDataTable(s: ReportSnapshot): DataTable {
  const ts = snapshotTimeSystem(s)
  const reasons = new Map(s.data.exclusions.map((x) => [x.id, x.reason]))
  const missing = s.data.points.filter((p) => p.model === null)
  const computed = new Map<number, number>()
  if (missing.length) {
    const v = modelVelocity(s.result, missing.map((p) => p.time), missing.map((p) => p.instrument))
    missing.forEach((p, i) => computed.set(p.id, v[i]!))
  }
  const timeName = ts.column
  const columns: DataColumn[] = [
    { name: 'measurement_id', datatype: 'int64', description: 'Starsway measurement id' },
    { name: 'instrument', datatype: 'string', description: 'instrument (each has its own zero point and jitter)' },
    { name: `${timeName}_d`, unit: 'd', datatype: 'float64', description: `time of the measurement, ${ts.scale} (full Julian date)` },
    { name: 'rv_m_s', unit: 'm / s', datatype: 'float64', description: 'measured radial velocity' },
    { name: 'error_m_s', unit: 'm / s', datatype: 'float64', description: 'quoted 1-sigma error (without jitter)' },
    { name: 'model_m_s', unit: 'm / s', datatype: 'float64', description: 'model velocity: instrument zero point + drift + Keplerians' },
    { name: 'residual_m_s', unit: 'm / s', datatype: 'float64', description: 'rv minus model' },
    { name: 'excluded', datatype: 'bool', description: 'excluded from the fit' },
    { name: 'exclusion_reason', datatype: 'string', description: 'why the point was excluded' },
  ]
  const rows: Value[][] = s.data.points.map((p) => {
    const model = p.model ?? computed.get(p.id) ?? null
    const residual = p.residual ?? (model !== null ? p.rv - model : null)
    return [p.id, neutraliseFormula(p.instrument), p.time, p.rv, p.error, model, residual, !p.included, reasons.has(p.id) ? neutraliseFormula(reasons.get(p.id) ?? '') : null]
  })
  return {
    columns, rows,
    meta: {
      title: s.title, star: s.star.name, model: `${s.model.name} (version ${s.model.version})`, frozen: s.frozenAt,
      data_sha256: s.data.hash, time_scale: ts.scale, product: `Starsway ${s.product.version}`,
    },
  }
}

function csvCell(x: Value): string {
  if (x === null) return ''
  // True/False: what pandas and astropy both read as booleans
  const s = typeof x === 'number' ? (Number.isFinite(x) ? String(x) : '') : typeof x === 'boolean' ? (x ? 'True' : 'False') : x
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s
}

/** CSV: one header row, then the data; no comment lines. */
export function toCsv(t: DataTable): string {
  return [t.columns.map((c) => c.name).join(','), ...t.rows.map((r) => r.map(csvCell).join(','))].join('\n') + '\n'
}

/** ECSV 1.0 with comma delimiter: a `# `-prefixed YAML header (datatype, unit, description per column; meta), then CSV. */
export function toEcsv(t: DataTable): string {
  const header = {
    delimiter: ',',
    datatype: t.columns.map((c) => ({ name: c.name, ...(c.unit ? { unit: c.unit } : {}), datatype: c.datatype, description: c.description })),
    meta: t.meta,
    schema: 'astropy-2.0',
  }
  const yaml = stringify(header, { lineWidth: 0 }).trimEnd().split('\n').map((l) => `# ${l}`)
  return ['# %ECSV 1.0', '# ---', ...yaml, toCsv(t).trimEnd()].join('\n') + '\n'
}

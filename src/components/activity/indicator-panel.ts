/**
 * Pure logic of the indicator panel: which indicators the measurements carry, their rows, the
 * velocity–indicator correlations (shared/rv `correlate`, both series centred per instrument as the
 * shared diagnostics do) and the two chart options (indicator against time; velocity against indicator).
 */
import type {
  CustomSeriesRenderItemAPI, CustomSeriesRenderItemParams, CustomSeriesRenderItemReturn, EChartsOption,
} from 'echarts'
import type { Measurement } from '@/api/types.ts'
import { correlate, type Correlation } from '@shared/rv/correlation.ts'
import { instrumentStyles } from '@shared/report/palette.ts'
import { escapeHtml, timeAxisLabel, timeOffset } from '@/components/data/velocity-chart-option.ts'

/** Suffix of an indicator's error column (ingest keeps 'fwhm_err' beside 'fwhm'). */
const ERR = '_err'

/** Indicator names in the included measurements (error columns left out), sorted. */
export function indicatorNames(measurements: Measurement[]): string[] {
  const names = new Set<string>()
  for (const m of measurements) {
    if (m.excluded) continue
    for (const k of Object.keys(m.indicators)) if (!k.endsWith(ERR)) names.add(k)
  }
  return [...names].sort()
}

export interface IndicatorRow {
  id: number
  instrument: string
  time: number
  rv: number
  error: number
  value: number
  /** The indicator's 1σ error where the upload had one. */
  valueErr: number | null
  /** rv minus its instrument's mean (m/s), for the scatter. */
  rvCentred: number
  /** value minus its instrument's mean. */
  valueCentred: number
}

/** Included rows with a value of `name`, each centred on its instrument's (unweighted) mean. */
export function indicatorRows(measurements: Measurement[], name: string): IndicatorRow[] {
  const rows = measurements.filter((m) => !m.excluded && Number.isFinite(m.indicators[name]))
  const sums = new Map<string, { n: number; rv: number; v: number }>()
  for (const m of rows) {
    const s = sums.get(m.instrument) ?? { n: 0, rv: 0, v: 0 }
    s.n++; s.rv += m.rv; s.v += m.indicators[name]!
    sums.set(m.instrument, s)
  }
  return rows.map((m) => {
    const s = sums.get(m.instrument)!
    const e = m.indicators[name + ERR]
    return {
      id: m.id, instrument: m.instrument, time: m.time, rv: m.rv, error: m.error, value: m.indicators[name]!,
      valueErr: Number.isFinite(e) && e! > 0 ? e! : null,
      rvCentred: m.rv - s.rv / s.n, valueCentred: m.indicators[name]! - s.v / s.n,
    }
  })
}

export interface CorrelationLine { label: string; correlation: Correlation }

/** All instruments together (centred each), then each instrument alone. */
export function indicatorCorrelations(rows: IndicatorRow[]): CorrelationLine[] {
  const lines: CorrelationLine[] = [{ label: 'all instruments (each centred)', correlation: correlate(rows.map((r) => r.rvCentred), rows.map((r) => r.valueCentred)) }]
  const instruments = [...new Set(rows.map((r) => r.instrument))]
  if (instruments.length > 1) {
    for (const ins of instruments) {
      const sub = rows.filter((r) => r.instrument === ins)
      lines.push({ label: ins, correlation: correlate(sub.map((r) => r.rv), sub.map((r) => r.value)) })
    }
  }
  return lines
}

/** r and p as the panel prints them ("—" where not measurable). */
export function formatCoefficient(v: number): string {
  return Number.isFinite(v) ? v.toFixed(2) : '—'
}
export function formatP(p: number): string {
  if (!Number.isFinite(p)) return '—'
  return p < 1e-3 ? p.toExponential(1) : p.toPrecision(2)
}

/** A correlation worth a caution: p < 1e-3 and |r| ≥ 0.3 (the shared vetting defaults). */
export function isStrong(c: Correlation): boolean {
  return Number.isFinite(c.pearson) && c.pearsonP < 1e-3 && Math.abs(c.pearson) >= 0.3
}

/** [x, y, xErr, yErr, id] */
type Point = [number, number, number, number, number]

function errorBars(name: string, color: string, data: Point[]) {
  return {
    type: 'custom' as const, name, data, z: 2, clip: true, silent: true, itemStyle: { color }, encode: { x: 0, y: 1 },
    renderItem: (_p: CustomSeriesRenderItemParams, api: CustomSeriesRenderItemAPI): CustomSeriesRenderItemReturn => {
      const x = Number(api.value(0)), y = Number(api.value(1)), ex = Number(api.value(2)), ey = Number(api.value(3))
      const style = { stroke: color, lineWidth: 1 }
      const children = []
      if (ey > 0) {
        const a = api.coord([x, y + ey]), b = api.coord([x, y - ey])
        children.push({ type: 'line' as const, shape: { x1: a[0], y1: a[1], x2: b[0], y2: b[1] }, style })
      }
      if (ex > 0) {
        const a = api.coord([x - ex, y]), b = api.coord([x + ex, y])
        children.push({ type: 'line' as const, shape: { x1: a[0], y1: a[1], x2: b[0], y2: b[1] }, style })
      }
      return { type: 'group', children }
    },
  }
}

function scatterSeries(rows: IndicatorRow[], point: (r: IndicatorRow) => Point): EChartsOption['series'] {
  const styles = instrumentStyles(rows.map((r) => r.instrument))
  const series: unknown[] = []
  for (const [name, style] of styles) {
    const data = rows.filter((r) => r.instrument === name).map(point)
    series.push({ type: 'scatter', name, data, symbol: style.symbol, symbolSize: 7, z: 3, itemStyle: { color: style.color }, encode: { x: 0, y: 1 } })
    series.push(errorBars(name, style.color, data))
  }
  return series as EChartsOption['series']
}

const base = (legend: string[]): EChartsOption => ({
  animation: false,
  textStyle: { fontFamily: 'Roboto, sans-serif' },
  grid: { left: 72, right: 24, top: 40, bottom: 56 },
  legend: { top: 6, left: 'center', data: legend },
  toolbox: { right: 16, top: 4, feature: { saveAsImage: { type: 'png', title: 'Save PNG', pixelRatio: 2 } } },
})

/**
 * The indicator against time, one colour and symbol per instrument, with its error bars where the
 * upload had errors. `unit` names the indicator's unit ("as uploaded" when unknown).
 */
export function buildIndicatorTimeChart(rows: IndicatorRow[], name: string, timeScale: string, unit = 'as uploaded'): EChartsOption {
  const offset = timeOffset(rows.map((r) => r.time))
  const legend = [...instrumentStyles(rows.map((r) => r.instrument)).keys()]
  return {
    ...base(legend),
    tooltip: {
      trigger: 'item',
      formatter: (p: unknown) => {
        const d = (p as { data?: Point }).data
        const r = d ? rows.find((x) => x.id === d[4]) : undefined
        return r ? `<b>${escapeHtml(r.instrument)}</b><br>${timeScale} ${r.time.toFixed(5)}<br>${escapeHtml(name)} ${r.value}${r.valueErr ? ` ± ${r.valueErr}` : ''}` : ''
      },
    },
    xAxis: { type: 'value', scale: true, name: timeAxisLabel(timeScale, offset), nameLocation: 'middle', nameGap: 28 },
    yAxis: { type: 'value', scale: true, name: `${name} [${unit}]`, nameLocation: 'middle', nameGap: 52 },
    series: scatterSeries(rows, (r) => [r.time - offset, r.value, 0, r.valueErr ?? 0, r.id]),
  }
}

/** Velocity (minus its instrument's mean) against the indicator (minus its instrument's mean), error bars both ways. */
export function buildIndicatorScatterChart(rows: IndicatorRow[], name: string, unit = 'as uploaded'): EChartsOption {
  const legend = [...instrumentStyles(rows.map((r) => r.instrument)).keys()]
  return {
    ...base(legend),
    tooltip: {
      trigger: 'item',
      formatter: (p: unknown) => {
        const d = (p as { data?: Point }).data
        const r = d ? rows.find((x) => x.id === d[4]) : undefined
        return r ? `<b>${escapeHtml(r.instrument)}</b><br>RV ${r.rv.toFixed(2)} ± ${r.error.toFixed(2)} m/s<br>${escapeHtml(name)} ${r.value}${r.valueErr ? ` ± ${r.valueErr}` : ''}` : ''
      },
    },
    xAxis: { type: 'value', scale: true, name: `${name} − instrument mean [${unit}]`, nameLocation: 'middle', nameGap: 28 },
    yAxis: { type: 'value', scale: true, name: 'RV − instrument mean [m/s]', nameLocation: 'middle', nameGap: 52 },
    series: scatterSeries(rows, (r) => [r.valueCentred, r.rvCentred, r.valueErr ?? 0, r.error, r.id]),
  }
}

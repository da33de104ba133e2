// ECharts options for a fitted model: velocities with the model over time and residuals beneath
// (one shared time axis), a phase-folded curve per planet with the other signals removed, and a
// histogram of the residuals. Error bars on every point; the instrument styles of the star page.
import type { EChartsOption } from 'echarts'
import type { FitResultJson } from '@shared/api/analyses.ts'
import type { Measurement } from '@/api/types.ts'
import type { CurvesOutput } from '@/workers/model-curves.ts'
import { errorBarSeries, escapeHtml, instrumentStyles, timeAxisLabel, timeOffset } from '@/components/data/velocity-chart-option.ts'
import { formatPeriod } from './periodogram-option.ts'

type Series = NonNullable<EChartsOption['series']> & unknown[]
type Point = [number, number, number, number]

const MODEL_COLOR = '#222222'
const grid = { left: 72, right: 24 }
const split = { lineStyle: { color: '#eceff1' } }
/** Axes drawn at the grid's edge, not through zero. */
const edge = { onZero: false }

const toolbox = (name: string) => ({
  right: 16, top: 0,
  feature: {
    dataZoom: { yAxisIndex: 'none' as const, title: { zoom: 'Zoom to box', back: 'Undo zoom' } },
    restore: { title: 'Reset view' },
    saveAsImage: { type: 'png' as const, title: 'Save PNG', name, pixelRatio: 2 },
  },
})

export interface PlotPoint { m: Measurement; residual: number; model: number }

/** The measurements the fit used, with their residuals (in time order). */
export function fittedPoints(measurements: Measurement[], result: FitResultJson): PlotPoint[] {
  const byId = new Map(measurements.map((m) => [m.id, m]))
  const out: PlotPoint[] = []
  for (const r of result.residuals) {
    const m = byId.get(r.measurementId)
    if (m) out.push({ m, residual: r.residual, model: r.model })
  }
  return out.sort((a, b) => a.m.time - b.m.time)
}

function scatter(name: string, data: Point[], style: { color: string; symbol: string }, axis: number): Series[number] {
  return {
    type: 'scatter', name, data, symbol: style.symbol, symbolSize: 7, z: 3, xAxisIndex: axis, yAxisIndex: axis,
    itemStyle: { color: style.color, borderColor: '#ffffff', borderWidth: 0.5 }, encode: { x: 0, y: 1 },
  }
}

function bars(name: string, data: Point[], color: string, axis: number): Series[number] {
  return { ...errorBarSeries(name, color, data, 2), xAxisIndex: axis, yAxisIndex: axis } as Series[number]
}

function tooltip(points: Map<number, PlotPoint>, timeScale: string) {
  return {
    trigger: 'item' as const,
    formatter: (p: unknown) => {
      const params = p as { data?: Point; seriesName?: string }
      const point = params.data ? points.get(params.data[3]) : undefined
      if (!point) return escapeHtml(params.seriesName ?? '')
      return [
        `<b>${escapeHtml(point.m.instrument)}</b>`,
        `${timeScale} ${point.m.time.toFixed(5)}`,
        `RV ${point.m.rv.toFixed(2)} ± ${point.m.error.toFixed(2)} m/s`,
        `residual ${point.residual.toFixed(2)} m/s`,
      ].join('<br>')
    },
  }
}

/** Velocities (each instrument's offset removed) with the model, and the residuals beneath. */
export function buildTimeChart(points: PlotPoint[], result: FitResultJson, curves: CurvesOutput | null, timeScale: string): EChartsOption {
  const offset = timeOffset(points.map((p) => p.m.time))
  const styles = instrumentStyles(points.map((p) => p.m.instrument))
  const offsets = new Map(result.instruments.map((i) => [i.name, i.offset]))
  const lookup = new Map(points.map((p) => [p.m.id, p]))
  const series: Series = []
  for (const [name, style] of styles) {
    const mine = points.filter((p) => p.m.instrument === name)
    const top: Point[] = mine.map((p) => [p.m.time - offset, p.m.rv - (offsets.get(name) ?? 0), p.m.error, p.m.id])
    const bottom: Point[] = mine.map((p) => [p.m.time - offset, p.residual, p.m.error, p.m.id])
    series.push(scatter(name, top, style, 0), bars(name, top, style.color, 0), scatter(name, bottom, style, 1), bars(name, bottom, style.color, 1))
  }
  if (curves) {
    series.push({
      type: 'line', name: 'Model', data: curves.timeCurve.map(([t, v]) => [t - offset, v]), showSymbol: false,
      xAxisIndex: 0, yAxisIndex: 0, z: 4, silent: true, lineStyle: { color: MODEL_COLOR, width: 1.2 }, itemStyle: { color: MODEL_COLOR },
    })
  }
  const gp = curves?.gp ?? null
  if (gp) series.push(...gpSeries(gp, curves!, offset))
  series.push({
    type: 'line', name: 'zero', data: [], xAxisIndex: 1, yAxisIndex: 1, silent: true,
    markLine: { silent: true, symbol: 'none', label: { show: false }, lineStyle: { color: '#777', type: 'dashed' }, data: [{ yAxis: 0 }] },
  })
  const axisName = timeAxisLabel(timeScale, offset)
  return {
    animation: false,
    textStyle: { fontFamily: 'Roboto, sans-serif' },
    legend: { top: 6, left: 'center', data: [...styles.keys(), ...(curves ? ['Model'] : []), ...(gp ? [GP_MODEL, GP_NAME, GP_BAND] : [])] },
    grid: [{ ...grid, top: 44, height: '50%' }, { ...grid, bottom: 76, height: '20%' }],
    tooltip: tooltip(lookup, timeScale),
    axisPointer: { link: [{ xAxisIndex: 'all' }] },
    toolbox: toolbox('model-over-time'),
    dataZoom: [
      { type: 'inside', xAxisIndex: [0, 1], filterMode: 'none' },
      { type: 'slider', xAxisIndex: [0, 1], filterMode: 'none', bottom: 8, height: 18 },
    ],
    xAxis: [
      { type: 'value', gridIndex: 0, scale: true, splitLine: split, axisLine: edge, axisLabel: { show: false } },
      { type: 'value', gridIndex: 1, scale: true, splitLine: split, axisLine: edge, name: axisName, nameLocation: 'middle', nameGap: 26 },
    ],
    yAxis: [
      { type: 'value', gridIndex: 0, scale: true, name: 'RV − offset [m/s]', nameLocation: 'middle', nameGap: 50, splitLine: split, axisLine: edge },
      { type: 'value', gridIndex: 1, scale: true, name: gp ? 'Residual (with activity) [m/s]' : 'Residual [m/s]', nameLocation: 'middle', nameGap: 50, splitLine: split, axisLine: edge, splitNumber: 3 },
    ],
    series,
  }
}

const GP_COLOR = '#D55E00'
const GP_NAME = 'GP activity'
const GP_BAND = 'GP ±1σ'
const GP_MODEL = 'Model + GP'

/**
 * A GP noise model's activity curve: over the residuals (mean, and its ±1σ band as two faint lines),
 * and the planets + trend + activity over the velocities.
 */
function gpSeries(gp: NonNullable<CurvesOutput['gp']>, curves: CurvesOutput, offset: number): Series {
  const bound = (sign: 1 | -1) => gp.curve.map(([t, m, sd]) => [t - offset, m === null || sd === null ? null : m + sign * sd])
  const both = curves.timeCurve.map(([t, v], i) => {
    const g = gp.curve[i]?.[1]
    return [t - offset, v === null || g === null || g === undefined ? null : v + g]
  })
  const line = (name: string, data: unknown[], axis: number, extra: object = {}) => ({
    type: 'line' as const, name, data, showSymbol: false, xAxisIndex: axis, yAxisIndex: axis, silent: true, connectNulls: false,
    lineStyle: { color: GP_COLOR, width: 1.2 }, itemStyle: { color: GP_COLOR }, ...extra,
  })
  return [
    line(GP_MODEL, both, 0, { z: 4, lineStyle: { color: GP_COLOR, width: 1, type: 'dashed' } }),
    line(GP_BAND, bound(1), 1, { z: 1, lineStyle: { color: GP_COLOR, width: 0.8, opacity: 0.45 } }),
    line(GP_BAND, bound(-1), 1, { z: 1, lineStyle: { color: GP_COLOR, width: 0.8, opacity: 0.45 } }),
    line(GP_NAME, gp.curve.map(([t, m]) => [t - offset, m]), 1, { z: 4 }),
  ] as Series
}

/** One planet's signal against orbital phase, the other planets, the trend and offsets removed. */
export function buildFoldedChart(
  planetIndex: number, label: string, points: PlotPoint[], result: FitResultJson, curves: CurvesOutput, timeScale: string,
): EChartsOption {
  const folded = curves.folded[planetIndex]!
  const planet = result.planets[planetIndex]!
  const styles = instrumentStyles(points.map((p) => p.m.instrument))
  const lookup = new Map(points.map((p) => [p.m.id, p]))
  const series: Series = []
  for (const [name, style] of styles) {
    const data: Point[] = []
    folded.points.forEach((q, i) => { if (folded.instruments[i] === name) data.push(q) })
    series.push(scatter(name, data, style, 0), bars(name, data, style.color, 0))
  }
  series.push({
    type: 'line', name: 'Model', data: folded.curve, showSymbol: false, z: 4, silent: true,
    lineStyle: { color: MODEL_COLOR, width: 1.5 }, itemStyle: { color: MODEL_COLOR },
  })
  return {
    animation: false,
    textStyle: { fontFamily: 'Roboto, sans-serif' },
    title: { text: `Planet ${label}: P = ${formatPeriod(planet.period)} d, K = ${planet.K.toFixed(2)} m/s`, left: 72, top: 4, textStyle: { fontSize: 13, fontWeight: 500 } },
    legend: { top: 26, left: 'center', data: [...styles.keys(), 'Model'] },
    grid: { ...grid, top: 64, bottom: 56 },
    tooltip: tooltip(lookup, timeScale),
    toolbox: toolbox(`phase-folded-${label}`),
    dataZoom: [{ type: 'inside', xAxisIndex: 0, filterMode: 'none' }],
    xAxis: { type: 'value', min: -0.5, max: 0.5, name: 'Orbital phase from Tc [cycles]', nameLocation: 'middle', nameGap: 26, splitLine: split, axisLine: edge },
    yAxis: { type: 'value', scale: true, name: curves.gp ? 'RV of this planet, GP activity removed [m/s]' : 'RV of this planet [m/s]', nameLocation: 'middle', nameGap: 50, splitLine: split, axisLine: edge },
    series,
  }
}

/** Counts of residuals in equal bins (Freedman–Diaconis width, common practice; at least 5 bins). */
export function histogram(values: number[]): Array<{ from: number; to: number; count: number }> {
  if (values.length === 0) return []
  const sorted = [...values].sort((a, b) => a - b)
  const q = (f: number) => sorted[Math.min(sorted.length - 1, Math.floor(f * (sorted.length - 1)))]!
  const iqr = q(0.75) - q(0.25)
  const lo = sorted[0]!
  const hi = sorted[sorted.length - 1]!
  const width0 = iqr > 0 ? 2 * iqr / Math.cbrt(sorted.length) : (hi - lo) / 5 || 1
  const n = Math.max(5, Math.min(60, Math.ceil((hi - lo) / width0)))
  const width = (hi - lo) / n || 1
  const bins = Array.from({ length: n }, (_, i) => ({ from: lo + i * width, to: lo + (i + 1) * width, count: 0 }))
  for (const v of sorted) bins[Math.min(n - 1, Math.floor((v - lo) / width))]!.count++
  return bins
}

/** Histogram of the residuals (drawn as bars of a custom series). */
export function buildHistogramChart(points: PlotPoint[]): EChartsOption {
  const bins = histogram(points.map((p) => p.residual))
  return {
    animation: false,
    textStyle: { fontFamily: 'Roboto, sans-serif' },
    title: { text: 'Residuals', left: 72, top: 4, textStyle: { fontSize: 13, fontWeight: 500 } },
    grid: { ...grid, top: 40, bottom: 56 },
    tooltip: { trigger: 'item', formatter: (p: unknown) => { const v = (p as { value: number[] }).value; return `${v[0]!.toFixed(1)} … ${v[1]!.toFixed(1)} m/s: ${v[2]}` } },
    toolbox: toolbox('residual-histogram'),
    xAxis: { type: 'value', scale: true, name: 'Residual [m/s]', nameLocation: 'middle', nameGap: 26, splitLine: split, axisLine: edge },
    yAxis: { type: 'value', name: 'Points', nameLocation: 'middle', nameGap: 40, minInterval: 1, splitLine: split, axisLine: edge },
    series: [{
      type: 'custom', name: 'Residuals', data: bins.map((b) => [b.from, b.to, b.count]), encode: { x: [0, 1], y: 2 },
      renderItem: (_params, api) => {
        const a = api.coord([Number(api.value(0)), Number(api.value(2))])
        const b = api.coord([Number(api.value(1)), 0])
        return { type: 'rect', shape: { x: a[0]!, y: a[1]!, width: b[0]! - a[0]! - 1, height: b[1]! - a[1]! }, style: { fill: '#56B4E9', stroke: '#0072B2' } }
      },
    }],
  }
}

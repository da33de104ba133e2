// ECharts options of a posterior sample: trace plots (value against step, one thin line per
// walker), a corner plot (an N × N matrix of small grids: pairwise scatter below the diagonal,
// marginal histograms on it), posterior histograms of M sin i and a, and the velocities with the
// band of posterior model curves.
import type { CustomSeriesRenderItemAPI, CustomSeriesRenderItemParams, EChartsOption } from 'echarts'
import type { FitResultJson } from '@shared/api/analyses.ts'
import type { SamplingResult } from '@shared/api/sampling.ts'
import { histogram, type PlotPoint } from '@/components/analysis/model-plots-option.ts'
import { errorBarSeries, instrumentStyles, timeAxisLabel, timeOffset } from '@/components/data/velocity-chart-option.ts'
import type { BandOutput } from '@/workers/posterior-band.ts'
import { axisName } from './sampling-format.ts'

type Sample = SamplingResult['sample']
type Series = NonNullable<EChartsOption['series']> & unknown[]
type Axis = Record<string, unknown>

const split = { lineStyle: { color: '#eceff1' } }
const edge = { onZero: false }
const font = { fontFamily: 'Roboto, sans-serif' }
const WALKER_COLOR = '#0072B2'
const SCATTER_COLOR = '#0072B2'
const HIST_FILL = '#56B4E9'
const HIST_STROKE = '#0072B2'
const BAND_COLOR = '#E69F00'

const toolbox = (name: string) => ({
  right: 16, top: 0,
  feature: { saveAsImage: { type: 'png' as const, title: 'Save PNG', name, pixelRatio: 2 } },
})

function column(sample: Sample, name: string): Array<number | null> {
  const j = sample.names.indexOf(name)
  return j >= 0 ? sample.columns[j]! : []
}
const unitOf = (sample: Sample, name: string) => sample.units[sample.names.indexOf(name)] ?? ''

/** Rounded axis labels that stay short on small grids. */
function shortLabel(value: number): string {
  if (value === 0) return '0'
  const a = Math.abs(value)
  if (a >= 1e5 || a < 1e-3) return value.toExponential(1)
  return String(Number(value.toPrecision(4)))
}

function histogramSeries(values: number[], x: number, y: number, name: string): Series[number] {
  const bins = histogram(values)
  return {
    type: 'custom', name, xAxisIndex: x, yAxisIndex: y, silent: true,
    data: bins.map((b) => [b.from, b.to, b.count]), encode: { x: [0, 1], y: 2 },
    renderItem: (_params: CustomSeriesRenderItemParams, api: CustomSeriesRenderItemAPI) => {
      const a = api.coord([Number(api.value(0)), Number(api.value(2))])
      const b = api.coord([Number(api.value(1)), 0])
      return { type: 'rect', shape: { x: a[0]!, y: a[1]!, width: Math.max(0.5, b[0]! - a[0]! - 0.5), height: b[1]! - a[1]! }, style: { fill: HIST_FILL, stroke: HIST_STROKE, lineWidth: 0.5 } }
    },
  } as Series[number]
}

const finite = (v: Array<number | null>) => v.filter((x): x is number => x !== null && Number.isFinite(x))

/** Value against step for each chosen parameter (stacked grids, shared step axis), a thin line per walker. */
export function buildTraceOption(sample: Sample, names: string[]): EChartsOption {
  const n = Math.max(1, names.length)
  const top = 30, gap = 18, height = 140
  const walkers = [...new Set(sample.walker)].sort((a, b) => a - b)
  const series: Series = []
  names.forEach((name, g) => {
    const values = column(sample, name)
    const byWalker = new Map<number, Array<[number, number]>>(walkers.map((w) => [w, []]))
    sample.walker.forEach((w, i) => { const v = values[i]; if (v !== null && v !== undefined) byWalker.get(w)!.push([sample.step[i]!, v]) })
    for (const [w, data] of byWalker) {
      data.sort((a, b) => a[0] - b[0])
      series.push({
        type: 'line', name: `walker ${w}`, data, xAxisIndex: g, yAxisIndex: g, showSymbol: false, silent: true,
        lineStyle: { width: 0.6, color: WALKER_COLOR, opacity: 0.35 }, itemStyle: { color: WALKER_COLOR }, animation: false,
      })
    }
  })
  return {
    animation: false,
    textStyle: font,
    toolbox: toolbox('trace-plots'),
    grid: names.map((_, g) => ({ left: 80, right: 24, top: top + g * (height + gap), height })),
    xAxis: names.map((_, g) => ({
      type: 'value', gridIndex: g, scale: true, splitLine: split, axisLine: edge,
      axisLabel: { show: g === n - 1 }, ...(g === n - 1 ? { name: 'Step', nameLocation: 'middle', nameGap: 26 } : {}),
    })),
    yAxis: names.map((name, g) => ({
      type: 'value', gridIndex: g, scale: true, splitLine: split, axisLine: edge, splitNumber: 3,
      name: axisName(name, unitOf(sample, name)), nameLocation: 'middle', nameGap: 62, axisLabel: { formatter: shortLabel },
    })),
    series,
  } as EChartsOption
}

/** Pixel height the trace option needs. */
export function traceHeight(count: number): number {
  return 30 + 50 + Math.max(1, count) * 158
}

/**
 * Corner plot of the chosen parameters: an N × N matrix of small grids; below the diagonal each
 * pair as a scatter of the draws, on the diagonal each parameter's histogram; axis names with units
 * on the bottom row and the left column.
 */
export function buildCornerOption(sample: Sample, names: string[], size = 640): EChartsOption {
  const n = names.length
  const left = 78, top = 12, right = 12
  const cell = (size - left - right) / Math.max(1, n)
  const inner = cell - 8
  const grids: Axis[] = [], xAxis: Axis[] = [], yAxis: Axis[] = []
  const series: Series = []
  const cols = names.map((name) => column(sample, name))
  // One range per parameter, shared by its column, its row and its histogram, so the grids line up.
  const ranges = cols.map((c) => {
    const v = finite(c)
    const lo = Math.min(...v), hi = Math.max(...v)
    const pad = (hi - lo) * 0.04 || Math.abs(lo) * 0.01 || 1
    return v.length ? { min: lo - pad, max: hi + pad } : {}
  })
  const ends = { showMinLabel: false, showMaxLabel: false }
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      const g = grids.length
      grids.push({ left: left + j * cell, top: top + i * cell, width: inner, height: inner })
      const xName = names[j]!
      const bottomRow = i === n - 1
      xAxis.push({
        type: 'value', gridIndex: g, ...ranges[j], splitLine: { show: false }, axisLine: edge, splitNumber: 3,
        axisLabel: { show: bottomRow, formatter: shortLabel, fontSize: 10, hideOverlap: true, rotate: n > 3 ? 30 : 0, ...ends },
        ...(bottomRow ? { name: axisName(xName, unitOf(sample, xName)), nameLocation: 'middle', nameGap: n > 3 ? 40 : 28, nameTextStyle: { fontSize: 11 } } : {}),
      })
      if (i === j) {
        yAxis.push({ type: 'value', gridIndex: g, show: false, min: 0 })
        series.push(histogramSeries(finite(cols[i]!), g, g, `${names[i]} histogram`))
      } else {
        const yName = names[i]!
        const leftCol = j === 0
        yAxis.push({
          type: 'value', gridIndex: g, ...ranges[i], splitLine: { show: false }, axisLine: edge, splitNumber: 3,
          axisLabel: { show: leftCol, formatter: shortLabel, fontSize: 10, hideOverlap: true, ...ends },
          ...(leftCol ? { name: axisName(yName, unitOf(sample, yName)), nameLocation: 'middle', nameGap: 56, nameTextStyle: { fontSize: 11 } } : {}),
        })
        const xs = cols[j]!, ys = cols[i]!
        const data: Array<[number, number]> = []
        for (let r = 0; r < xs.length; r++) { const x = xs[r], y = ys[r]; if (x !== null && y !== null && x !== undefined && y !== undefined) data.push([x, y]) }
        series.push({
          type: 'scatter', name: `${yName} vs ${xName}`, data, xAxisIndex: g, yAxisIndex: g, symbolSize: 2, silent: true, large: true,
          itemStyle: { color: SCATTER_COLOR, opacity: 0.35 },
        })
      }
    }
  }
  return { animation: false, textStyle: font, toolbox: toolbox('corner-plot'), grid: grids, xAxis, yAxis, series } as EChartsOption
}

/** Posterior histograms of M sin i and a of one planet, side by side, with the median and 16/84 % marked. */
export function buildMassOption(sample: Sample, label: string): EChartsOption | null {
  const names = [`M sin i ${label}`, `a ${label}`].filter((n) => sample.names.includes(n))
  if (names.length === 0) return null
  const series: Series = []
  names.forEach((name, g) => {
    const values = finite(column(sample, name))
    const sorted = [...values].sort((a, b) => a - b)
    const q = (f: number) => sorted[Math.min(sorted.length - 1, Math.max(0, Math.round(f * (sorted.length - 1))))]
    const h = histogramSeries(values, g, g, name) as Record<string, unknown>
    h.markLine = {
      silent: true, symbol: 'none', label: { show: false },
      data: [
        { xAxis: q(0.5), lineStyle: { color: '#222', type: 'solid' } },
        { xAxis: q(0.16), lineStyle: { color: '#222', type: 'dashed' } },
        { xAxis: q(0.84), lineStyle: { color: '#222', type: 'dashed' } },
      ],
    }
    series.push(h as Series[number])
  })
  return {
    animation: false, textStyle: font,
    title: { text: `Planet ${label}: posterior of M sin i and a (median solid, 16 % and 84 % dashed)`, left: 16, top: 2, textStyle: { fontSize: 13, fontWeight: 500 } },
    toolbox: toolbox(`posterior-mass-${label}`),
    grid: names.map((_, g) => ({ left: g === 0 ? '8%' : '56%', width: '38%', top: 44, bottom: 52 })),
    xAxis: names.map((name, g) => ({ type: 'value', gridIndex: g, scale: true, splitLine: split, axisLine: edge, name: axisName(name, unitOf(sample, name)), nameLocation: 'middle', nameGap: 28, axisLabel: { formatter: shortLabel } })),
    yAxis: names.map((_, g) => ({ type: 'value', gridIndex: g, min: 0, name: 'Draws', nameLocation: 'middle', nameGap: 40, splitLine: split, axisLine: edge })),
    series,
  } as EChartsOption
}

/** The velocities (offsets of the fit removed) with the median posterior curve and its 16–84 % band. */
export function buildBandOption(points: PlotPoint[], result: FitResultJson, band: BandOutput, timeScale: string): EChartsOption {
  const offset = timeOffset(points.map((p) => p.m.time))
  const styles = instrumentStyles(points.map((p) => p.m.instrument))
  const offsets = new Map(result.instruments.map((i) => [i.name, i.offset]))
  const series: Series = []
  const upper = band.time.map((t, i): [number, number] => [t - offset, band.hi[i]!])
  const lower = band.time.map((t, i): [number, number] => [t - offset, band.lo[i]!])
  series.push({
    type: 'custom', name: '16–84 % of posterior curves', data: [[upper[0]?.[0] ?? 0, upper[0]?.[1] ?? 0]], z: 1, silent: true,
    itemStyle: { color: BAND_COLOR }, encode: { x: 0, y: 1 },
    renderItem: (params: CustomSeriesRenderItemParams, api: CustomSeriesRenderItemAPI) => {
      const pts = [...upper, ...lower.slice().reverse()].map((p) => api.coord(p) as number[])
      const c = params.coordSys as unknown as { x: number; y: number; width: number; height: number }
      return {
        type: 'polygon', shape: { points: pts }, style: { fill: BAND_COLOR, opacity: 0.35 },
        clipPath: { type: 'rect', shape: { x: c.x, y: c.y, width: c.width, height: c.height } },
      }
    },
  } as Series[number])
  series.push({
    type: 'line', name: 'Posterior median', data: band.time.map((t, i) => [t - offset, band.median[i]!]), showSymbol: false, z: 4, silent: true,
    lineStyle: { color: '#222222', width: 1.2 }, itemStyle: { color: '#222222' },
  })
  for (const [name, style] of styles) {
    const data = points.filter((p) => p.m.instrument === name).map((p): [number, number, number, number] => [p.m.time - offset, p.m.rv - (offsets.get(name) ?? 0), p.m.error, p.m.id])
    series.push(
      { type: 'scatter', name, data, symbol: style.symbol, symbolSize: 6, z: 3, itemStyle: { color: style.color, borderColor: '#fff', borderWidth: 0.5 }, encode: { x: 0, y: 1 } },
      errorBarSeries(name, style.color, data, 2) as Series[number],
    )
  }
  return {
    animation: false, textStyle: font,
    legend: { top: 6, left: 'center', data: [...styles.keys(), 'Posterior median', '16–84 % of posterior curves'] },
    toolbox: { right: 16, top: 0, feature: { dataZoom: { yAxisIndex: 'none' as const, title: { zoom: 'Zoom to box', back: 'Undo zoom' } }, restore: { title: 'Reset view' }, saveAsImage: { type: 'png' as const, title: 'Save PNG', name: 'posterior-band', pixelRatio: 2 } } },
    grid: { left: 72, right: 24, top: 44, bottom: 70 },
    tooltip: { trigger: 'item' },
    dataZoom: [{ type: 'inside', xAxisIndex: 0, filterMode: 'none' }, { type: 'slider', xAxisIndex: 0, filterMode: 'none', bottom: 8, height: 18 }],
    xAxis: { type: 'value', scale: true, splitLine: split, axisLine: edge, name: timeAxisLabel(timeScale, offset), nameLocation: 'middle', nameGap: 26 },
    yAxis: { type: 'value', scale: true, splitLine: split, axisLine: edge, name: 'RV − offset [m/s]', nameLocation: 'middle', nameGap: 50 },
    series,
  }
}

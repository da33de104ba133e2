import type {
  CustomSeriesRenderItemAPI, CustomSeriesRenderItemParams, CustomSeriesRenderItemReturn, EChartsOption,
} from 'echarts'
import type { Measurement } from '@/api/types.ts'

import { INSTRUMENT_COLORS, INSTRUMENT_SYMBOLS, EXCLUDED_COLOR, EXCLUDED_NAME, instrumentStyles, type InstrumentStyle } from '@shared/report/palette.ts'
import { displayOffset } from '@shared/time/labels.ts'

export { INSTRUMENT_COLORS, INSTRUMENT_SYMBOLS, EXCLUDED_COLOR, EXCLUDED_NAME, instrumentStyles, type InstrumentStyle }

/**
 * The round offset subtracted from full Julian dates so axis labels stay short: the one home of the
 * reduced display epoch, shared/time `displayOffset` (whole multiples of 10 000 d), the same for
 * every chart, table and export.
 */
export function timeOffset(times: ArrayLike<number>): number {
  return displayOffset(times)
}

/** "2 450 000" with thin spaces between thousands. */
export function formatOffset(offset: number): string {
  return String(offset).replace(/\B(?=(\d{3})+(?!\d))/g, '\u2009')
}

export function timeAxisLabel(scale: string, offset: number): string {
  return offset === 0 ? `${scale} [d]` : `${scale} − ${formatOffset(offset)} [d]`
}

/** One chart point: [reduced time, rv, error, measurement id]. */
type Point = [number, number, number, number]

export interface VelocityChartInput {
  measurements: Measurement[]
  /** Time system of the stored dates, e.g. "BJD_TDB" or "JD_UTC" (shared/time `timeSystemLabel`). */
  timeScale: string
  showExcluded: boolean
  /** Title of the velocity axis (default "RV [m/s]"; the offset-corrected view says what was removed). */
  yName?: string
}

export interface VelocityChartModel {
  option: EChartsOption
  offset: number
  /** Points drawn per series name (instrument, or "Excluded"). */
  counts: Record<string, number>
  included: number
  excluded: number
}

export function errorBarSeries(name: string, color: string, data: Point[], z: number) {
  return {
    type: 'custom' as const,
    name,
    data,
    z,
    clip: true,
    silent: true,
    itemStyle: { color },
    encode: { x: 0, y: 1 },
    renderItem: (_params: CustomSeriesRenderItemParams, api: CustomSeriesRenderItemAPI): CustomSeriesRenderItemReturn => {
      const x = Number(api.value(0))
      const y = Number(api.value(1))
      const e = Number(api.value(2))
      const top = api.coord([x, y + e])
      const bottom = api.coord([x, y - e])
      const half = 3
      const style = { stroke: color, lineWidth: 1 }
      return {
        type: 'group',
        children: [
          { type: 'line', shape: { x1: top[0], y1: top[1], x2: bottom[0], y2: bottom[1] }, style },
          { type: 'line', shape: { x1: top[0]! - half, y1: top[1], x2: top[0]! + half, y2: top[1] }, style },
          { type: 'line', shape: { x1: bottom[0]! - half, y1: bottom[1], x2: bottom[0]! + half, y2: bottom[1] }, style },
        ],
      }
    },
  }
}

/** Builds the velocity-versus-time chart: error bars, one colour and symbol per instrument, excluded points hollow grey. */
export function buildVelocityChart(input: VelocityChartInput): VelocityChartModel {
  const { measurements, timeScale, showExcluded } = input
  const offset = timeOffset(measurements.map((m) => m.time))
  const styles = instrumentStyles(measurements.map((m) => m.instrument))
  const byInstrument = new Map<string, Point[]>()
  const excludedPoints: Point[] = []
  const lookup = new Map<number, Measurement>()
  for (const m of measurements) {
    lookup.set(m.id, m)
    const point: Point = [m.time - offset, m.rv, m.error, m.id]
    if (m.excluded) excludedPoints.push(point)
    else {
      const list = byInstrument.get(m.instrument) ?? []
      list.push(point)
      byInstrument.set(m.instrument, list)
    }
  }

  const series: NonNullable<EChartsOption['series']> & unknown[] = []
  const counts: Record<string, number> = {}
  for (const [name, style] of styles) {
    const data = byInstrument.get(name) ?? []
    counts[name] = data.length
    // The scatter series comes first: the legend takes its colour and symbol from the first series of a name.
    series.push({
      type: 'scatter', name, data, symbol: style.symbol, symbolSize: 8, z: 3,
      itemStyle: { color: style.color, borderColor: '#ffffff', borderWidth: 0.5 },
      encode: { x: 0, y: 1 },
    })
    series.push(errorBarSeries(name, style.color, data, 2))
  }
  if (showExcluded && excludedPoints.length > 0) {
    counts[EXCLUDED_NAME] = excludedPoints.length
    series.push({
      type: 'scatter', name: EXCLUDED_NAME, data: excludedPoints, symbol: 'circle', symbolSize: 8, z: 2,
      itemStyle: { color: 'rgba(255,255,255,0)', borderColor: EXCLUDED_COLOR, borderWidth: 1.5 },
      encode: { x: 0, y: 1 },
    })
    series.push(errorBarSeries(EXCLUDED_NAME, EXCLUDED_COLOR, excludedPoints, 1))
  }

  const legendNames = [...styles.keys()]
  if (showExcluded && excludedPoints.length > 0) legendNames.push(EXCLUDED_NAME)

  const option: EChartsOption = {
    animation: false,
    textStyle: { fontFamily: 'Roboto, sans-serif' },
    grid: { left: 72, right: 24, top: 48, bottom: 96 },
    legend: { top: 8, left: 'center', data: legendNames },
    tooltip: {
      trigger: 'item',
      formatter: (p: unknown) => {
        const params = p as { data?: Point }
        const m = params.data ? lookup.get(params.data[3]) : undefined
        if (!m) return ''
        const lines = [
          `<b>${escapeHtml(m.instrument)}</b>`,
          `${timeScale} ${m.time.toFixed(5)}`,
          `RV ${m.rv.toFixed(2)} ± ${m.error.toFixed(2)} m/s`,
        ]
        if (m.excluded) lines.push(`excluded: ${escapeHtml(m.excludedReason ?? '')}`)
        return lines.join('<br>')
      },
    },
    toolbox: {
      right: 16,
      top: 4,
      feature: {
        dataZoom: { yAxisIndex: 'none', title: { zoom: 'Zoom to box', back: 'Undo zoom' } },
        restore: { title: 'Reset view' },
        saveAsImage: { type: 'png', title: 'Save PNG', name: 'velocities', pixelRatio: 2 },
      },
    },
    dataZoom: [
      { type: 'inside', xAxisIndex: 0, filterMode: 'none' },
      { type: 'slider', xAxisIndex: 0, filterMode: 'none', bottom: 16, height: 22 },
      { type: 'inside', yAxisIndex: 0, filterMode: 'none', zoomOnMouseWheel: 'shift', moveOnMouseMove: 'shift' },
    ],
    xAxis: {
      type: 'value', scale: true, name: timeAxisLabel(timeScale, offset),
      nameLocation: 'middle', nameGap: 28, splitLine: { lineStyle: { color: '#eceff1' } },
    },
    yAxis: {
      type: 'value', scale: true, name: input.yName ?? 'RV [m/s]', nameLocation: 'middle', nameGap: 56,
      splitLine: { lineStyle: { color: '#eceff1' } },
    },
    series,
  }
  const included = measurements.length - excludedPoints.length
  return { option, offset, counts, included, excluded: showExcluded ? excludedPoints.length : 0 }
}

export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!)
}

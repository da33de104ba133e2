// ECharts options and small pieces of reasoning for the periodogram section: power against period
// on a log axis with the false-alarm levels, the spectral window beneath, the listed peaks marked.
import type { EChartsOption } from 'echarts'
import type { PeriodogramPeak, PeriodogramRun } from '@shared/api/analyses.ts'
import { coincidences as sharedCoincidences, peakWidth, COINCIDENCE_FAP, type Coincidence } from '@shared/rv/index.ts'
import { escapeHtml } from '@/components/data/velocity-chart-option.ts'

export const POWER_AXIS = 'Power (normalised)'
export const PERIOD_AXIS = 'Period [d]'
const FAP_COLORS: Record<string, string> = { '0.1': '#8a6d3b', '0.01': '#b3261e', '0.001': '#6a1b9a' }

/** "10 %", "1 %", "0.1 %". */
export function fapLabel(fap: number): string {
  const percent = fap * 100
  return `${percent >= 1 ? percent.toFixed(0) : String(Number(percent.toPrecision(2)))} %`
}

/** A false-alarm probability for the list: "< 1e-10", "3.2e-5", "0.042". */
export function formatFap(fap: number): string {
  if (!(fap >= 1e-10)) return '< 1e-10'
  if (fap < 1e-3) return fap.toExponential(1)
  return fap.toPrecision(2)
}

export function formatPeriod(period: number): string {
  if (period >= 1000) return period.toFixed(0)
  if (period >= 100) return period.toFixed(1)
  if (period >= 10) return period.toFixed(2)
  return period.toFixed(3)
}

/**
 * A start semi-amplitude for a planet at a peak: a sinusoid of amplitude K carries variance K²/2,
 * and the normalised generalised Lomb–Scargle power is the fraction of the variance it explains
 * (Zechmeister & Kürster 2009), so K ≈ √(2 p) · σ with σ the scatter of the data searched.
 */
export function startAmplitude(power: number, scatter: number): number {
  if (!(power > 0) || !(scatter > 0)) return 1
  return Math.sqrt(2 * Math.min(power, 1)) * scatter
}

/** Weighted-mean-free scatter (m/s) of velocities, each instrument's own mean removed. */
export function scatterAboutMeans(points: Array<{ instrument: string; rv: number }>): number {
  const groups = new Map<string, number[]>()
  for (const p of points) groups.set(p.instrument, [...(groups.get(p.instrument) ?? []), p.rv])
  let sum = 0
  let n = 0
  for (const values of groups.values()) {
    const mean = values.reduce((a, b) => a + b, 0) / values.length
    for (const v of values) { sum += (v - mean) ** 2; n++ }
  }
  return n > 1 ? Math.sqrt(sum / (n - 1)) : 0
}

export { peakWidth, type Coincidence }

/**
 * Velocity peaks that an activity indicator's periodogram shares: the core's `coincidences`
 * (shared/rv/peak-coincidence.ts) on stored periodogram runs.
 */
export function coincidences(
  rvPeaks: PeriodogramPeak[], indicatorRuns: Array<{ name: string; run: PeriodogramRun }>, baseline: number, fapLimit = COINCIDENCE_FAP,
): Coincidence[] {
  return sharedCoincidences(rvPeaks, indicatorRuns.map(({ name, run }) => ({ name, peaks: run.result.peaks })), baseline, fapLimit)
}

export interface PeriodogramChartInput {
  run: PeriodogramRun
  /** Shown above the chart. */
  title: string
  showWindow: boolean
  /** Period axis range (days), shared with the indicator charts. */
  range?: [number, number]
  /** Periods of the planets of the current model, marked with thin lines. */
  planetPeriods?: number[]
  /** Peaks get numbered, clickable markers. */
  markPeaks?: boolean
  color?: string
  compact?: boolean
}

/** Series name of the peak markers (clicks on them add planets). */
export const PEAK_SERIES = 'Peaks'
/** Series name and colour of the Keplerian periodogram drawn beside the sinusoid (GLS) power. */
export const KEPLERIAN_SERIES = 'Keplerian (e and offsets fitted)'
const KEPLERIAN_COLOR = '#b35806'

export function buildPeriodogramChart(input: PeriodogramChartInput): EChartsOption {
  const { run, showWindow, compact } = input
  const [min, max] = input.range ?? [run.settings.minPeriod, run.settings.maxPeriod]
  const curve = run.result.curve.period.map((p, i) => [p, run.result.curve.power[i]!])
  const window = run.result.window.period.map((p, i) => [p, run.result.window.power[i]!])
  // a loop, not Math.max(...): a full curve has more points than a call can take arguments
  let top = 0.05
  for (const xs of [run.result.curve.power, run.result.fapLevels.map((l) => l.power), run.result.keplerian?.curve.power ?? []]) for (const x of xs) if (x > top) top = x
  /** ECharts thins long curves per pixel keeping each pixel's extremes ('minmax'), so peaks stay visible. */
  const thin = run.result.curve.period.length > 8000 ? { sampling: 'minmax' as const } : {}
  const mainHeight = showWindow ? '58%' : undefined
  const grids: NonNullable<EChartsOption['grid']> = showWindow
    ? [{ left: 72, right: 24, top: compact ? 36 : 48, height: mainHeight }, { left: 72, right: 24, bottom: 64, height: '17%' }]
    : [{ left: 72, right: 24, top: compact ? 36 : 48, bottom: compact ? 48 : 88 }]
  const xAxis = (gridIndex: number, named: boolean) => ({
    type: 'log' as const, gridIndex, min, max, logBase: 10,
    name: named ? PERIOD_AXIS : '', nameLocation: 'middle' as const, nameGap: 26,
    axisLabel: { show: true, formatter: (v: number) => String(Number(formatPeriod(v))) },
    splitLine: { lineStyle: { color: '#eceff1' } }, minorSplitLine: { show: false },
  })
  // Labels staggered along the lines: the three levels lie close together.
  const labelPositions = ['insideStartTop', 'insideMiddleTop', 'insideEndTop'] as const
  const fapLines = run.result.fapLevels.map((l, i) => ({
    yAxis: l.power,
    name: `FAP ${fapLabel(l.fap)}`,
    lineStyle: { color: FAP_COLORS[String(l.fap)] ?? '#777', type: 'dashed' as const, width: 1.2 },
    label: { formatter: `FAP ${fapLabel(l.fap)}`, position: labelPositions[i % 3], color: FAP_COLORS[String(l.fap)] ?? '#777', fontSize: 11 },
  }))
  const planetLines = (input.planetPeriods ?? []).filter((p) => p >= min && p <= max).map((p) => ({
    xAxis: p, lineStyle: { color: '#2e7d4f', type: 'dotted' as const, width: 1.5 },
    label: { formatter: `model ${formatPeriod(p)} d`, position: 'insideEndBottom' as const, color: '#2e7d4f', fontSize: 10 },
  }))
  const series: NonNullable<EChartsOption['series']> & unknown[] = [{
    type: 'line', name: 'Power', data: curve, showSymbol: false, xAxisIndex: 0, yAxisIndex: 0, ...thin,
    lineStyle: { width: 1, color: input.color ?? '#28507a' }, itemStyle: { color: input.color ?? '#28507a' },
    markLine: { silent: true, symbol: 'none', data: [...fapLines, ...planetLines] },
  }]
  if (input.markPeaks !== false) {
    series.push({
      type: 'scatter', name: PEAK_SERIES, xAxisIndex: 0, yAxisIndex: 0, symbolSize: 11, z: 5, cursor: 'pointer',
      data: run.result.peaks.slice(0, 5).map((p, i) => ({ value: [p.period, p.power], peakIndex: i })),
      itemStyle: { color: '#d55e00', borderColor: '#fff', borderWidth: 1 },
      label: { show: true, position: 'top', formatter: (p: unknown) => String(((p as { dataIndex: number }).dataIndex) + 1), fontSize: 11 },
    })
  }
  const kp = run.result.keplerian
  if (kp) {
    // The Keplerian periodogram (Δχ²/χ² of offsets only, e and offsets fitted per period) on the
    // same 0…1 scale: the statistic the search uses, drawn beside the sinusoid's power.
    series.push({
      type: 'line', name: KEPLERIAN_SERIES, data: kp.curve.period.map((p, i) => [p, kp.curve.power[i]!]), showSymbol: false,
      xAxisIndex: 0, yAxisIndex: 0, z: 1, lineStyle: { width: 1, color: KEPLERIAN_COLOR, opacity: 0.85 }, itemStyle: { color: KEPLERIAN_COLOR }, ...thin,
    })
  }
  if (showWindow) {
    series.push({
      type: 'line', name: 'Window', data: window, showSymbol: false, xAxisIndex: 1, yAxisIndex: 1,
      lineStyle: { width: 1, color: '#777' }, itemStyle: { color: '#777' },
    })
  }
  return {
    animation: false,
    textStyle: { fontFamily: 'Roboto, sans-serif' },
    title: { text: input.title, left: 72, top: 4, textStyle: { fontSize: 13, fontWeight: 500 } },
    ...(kp ? { legend: { top: 4, right: 140, data: ['Power', KEPLERIAN_SERIES], textStyle: { fontSize: 11 } } } : {}),
    grid: grids,
    tooltip: {
      trigger: 'axis',
      axisPointer: { type: 'line', snap: false },
      formatter: (raw: unknown) => {
        const list = (Array.isArray(raw) ? raw : [raw]) as Array<{ seriesName: string; value: number[] | { value: number[] }; data: unknown }>
        const first = list[0]
        if (!first) return ''
        const value = Array.isArray(first.value) ? first.value : (first.data as { value: number[] }).value
        const lines = [`P = ${formatPeriod(value[0]!)} d`]
        for (const item of list) {
          const v = Array.isArray(item.value) ? item.value : (item.data as { value: number[] }).value
          lines.push(`${escapeHtml(item.seriesName)}: ${v[1]!.toFixed(3)}`)
        }
        return lines.join('<br>')
      },
    },
    toolbox: {
      right: 16, top: 0,
      feature: {
        dataZoom: { yAxisIndex: 'none', title: { zoom: 'Zoom to box', back: 'Undo zoom' } },
        restore: { title: 'Reset view' },
        saveAsImage: { type: 'png', title: 'Save PNG', name: 'periodogram', pixelRatio: 2 },
      },
    },
    dataZoom: compact ? [] : [
      { type: 'inside', xAxisIndex: showWindow ? [0, 1] : [0], filterMode: 'none' },
      { type: 'slider', xAxisIndex: showWindow ? [0, 1] : [0], filterMode: 'none', bottom: 8, height: 18 },
    ],
    xAxis: showWindow ? [xAxis(0, false), xAxis(1, true)] : [xAxis(0, true)],
    yAxis: [
      { type: 'value', gridIndex: 0, min: 0, max: Math.min(1, Math.ceil((top * 1.1) * 20) / 20) /* in 0.05 steps, divided so the label has no float noise */, name: POWER_AXIS, nameLocation: 'middle', nameGap: 48, splitLine: { lineStyle: { color: '#eceff1' } } },
      ...(showWindow ? [{ type: 'value' as const, gridIndex: 1, min: 0, max: 1, name: 'Window', nameLocation: 'middle' as const, nameGap: 48, splitNumber: 2 }] : []),
    ],
    series,
  }
}

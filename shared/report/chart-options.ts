// The report's plots as ECharts options (plain objects): drawn on the report page and rendered to
// SVG for the PDF on the server (server/reports/charts.ts).
import type { ReportSnapshot, SnapshotPeriodogram } from '../api/reports.ts'
import { keplerianVelocity, trendVelocity } from './curve.ts'
import { formatPlain } from './round.ts'

export type Option = Record<string, unknown>
const COLORS = ['#1565c0', '#c62828', '#2e7d32', '#ef6c00', '#6a1b9a', '#00838f', '#5d4037', '#ad1457']
const base = { animation: false, textStyle: { fontFamily: 'Roboto' }, color: COLORS }
const title = (text: string) => ({ text, left: 'center', top: 4, textStyle: { fontSize: 13, fontWeight: 'normal' } })

function timeBase(s: ReportSnapshot): number {
  const t = s.data.points.map((p) => p.time)
  return t.length ? Math.floor(Math.min(...t) / 1000) * 1000 : 0
}

function grid(n: number, lo: number, hi: number): number[] {
  return Array.from({ length: n }, (_, i) => lo + ((hi - lo) * i) / (n - 1))
}

function offsets(s: ReportSnapshot): Map<string, number> {
  return new Map(s.result.instruments.map((i) => [i.name, i.offset ?? 0]))
}

/** Velocities with each instrument's offset removed, and the model (Keplerians + trend) over the baseline. */
export function timeSeriesOption(s: ReportSnapshot): Option {
  const t0 = timeBase(s)
  const off = offsets(s)
  const used = s.data.points.filter((p) => p.included)
  const lo = Math.min(...used.map((p) => p.time)), hi = Math.max(...used.map((p) => p.time))
  const pad = 0.02 * (hi - lo || 1)
  const g = grid(3000, lo - pad, hi + pad)
  const kep = keplerianVelocity(s.result, g), tr = trendVelocity(s.result, g)
  const series: Option[] = s.data.instruments.map((name) => ({
    type: 'scatter', name, symbolSize: 5,
    data: used.filter((p) => p.instrument === name).map((p) => [p.time - t0, p.rv - (off.get(name) ?? 0)]),
  }))
  const excluded = s.data.points.filter((p) => !p.included)
  if (excluded.length) series.push({ type: 'scatter', name: 'excluded', symbol: 'emptyCircle', symbolSize: 5, itemStyle: { color: '#9e9e9e' }, data: excluded.map((p) => [p.time - t0, p.rv - (off.get(p.instrument) ?? 0)]) })
  series.push({ type: 'line', name: 'model', showSymbol: false, lineStyle: { width: 1.2, color: '#212121' }, data: g.map((x, i) => [x - t0, kep[i]! + tr[i]!]) })
  return {
    ...base, title: title('Radial velocities and the model'), legend: { bottom: 0, textStyle: { fontSize: 10 } },
    grid: { left: 60, right: 20, top: 30, bottom: 68 },
    xAxis: { type: 'value', name: `JD − ${t0}`, nameLocation: 'middle', nameGap: 22, min: Math.floor(lo - pad - t0), max: Math.ceil(hi + pad - t0) },
    yAxis: { type: 'value', name: 'RV (m/s)', nameLocation: 'middle', nameGap: 42, scale: true },
    series,
  }
}

export function residualsOption(s: ReportSnapshot): Option {
  const t0 = timeBase(s)
  const used = s.data.points.filter((p) => p.included && p.residual !== null)
  return {
    ...base, title: title(`Residuals (rms ${s.result.stats.rms?.toFixed(2) ?? '—'} m/s)`), legend: { bottom: 0, textStyle: { fontSize: 10 } },
    grid: { left: 60, right: 20, top: 30, bottom: 68 },
    xAxis: { type: 'value', name: `JD − ${t0}`, nameLocation: 'middle', nameGap: 22, scale: true },
    yAxis: { type: 'value', name: 'O − C (m/s)', nameLocation: 'middle', nameGap: 42, scale: true },
    series: s.data.instruments.map((name) => ({
      type: 'scatter', name, symbolSize: 5,
      data: used.filter((p) => p.instrument === name).map((p) => [p.time - t0, p.residual]),
      markLine: { silent: true, symbol: 'none', lineStyle: { color: '#757575', type: 'dashed' }, data: [{ yAxis: 0 }], label: { show: false } },
    })),
  }
}

/** Planet k's signal: each velocity minus its offset, the trend and the other planets, against phase from Tc. */
export function phaseOption(s: ReportSnapshot, k: number): Option {
  const p = s.result.planets[k]!
  const off = offsets(s)
  const used = s.data.points.filter((x) => x.included)
  const times = used.map((x) => x.time)
  const all = keplerianVelocity(s.result, times), mine = keplerianVelocity(s.result, times, k), tr = trendVelocity(s.result, times)
  const phase = (t: number) => { const f = ((t - p.tc) / p.period) % 1; return f < 0 ? f + 1 : f }
  const g = grid(400, 0, 1)
  const curve = keplerianVelocity(s.result, g.map((f) => p.tc + f * p.period), k)
  return {
    ...base, title: title(`Planet ${p.label}: P = ${p.period.toPrecision(6)} d, phase-folded`), legend: { bottom: 0, textStyle: { fontSize: 10 } },
    grid: { left: 60, right: 20, top: 30, bottom: 68 },
    xAxis: { type: 'value', name: 'Phase from Tc', nameLocation: 'middle', nameGap: 22, min: 0, max: 1 },
    yAxis: { type: 'value', name: 'RV (m/s)', nameLocation: 'middle', nameGap: 42, scale: true },
    series: [
      ...s.data.instruments.map((name) => ({
        type: 'scatter', name, symbolSize: 5,
        data: used.map((x, i) => ({ x, i })).filter(({ x }) => x.instrument === name)
          .map(({ x, i }) => [phase(x.time), x.rv - (off.get(name) ?? 0) - tr[i]! - (all[i]! - mine[i]!)]),
      })),
      { type: 'line', name: 'model', showSymbol: false, lineStyle: { width: 1.2, color: '#212121' }, data: g.map((f, i) => [f, curve[i]]) },
    ],
  }
}

export function periodogramOption(pg: SnapshotPeriodogram, label: string): Option {
  return {
    ...base, title: title(label), legend: { show: false },
    grid: { left: 60, right: 20, top: 30, bottom: 40 },
    xAxis: {
      type: 'log', name: 'Period (d)', nameLocation: 'middle', nameGap: 22, min: pg.curve.period[0], max: pg.curve.period[pg.curve.period.length - 1],
      axisLabel: { formatter: (v: number) => formatPlain(v, 3) },
    },
    yAxis: { type: 'value', name: 'Power', nameLocation: 'middle', nameGap: 42, min: 0 },
    series: [{
      type: 'line', showSymbol: false, lineStyle: { width: 0.8, color: COLORS[0] },
      data: pg.curve.period.map((x, i) => [x, pg.curve.power[i]]),
      markLine: {
        silent: true, symbol: 'none', lineStyle: { type: 'dashed', color: '#c62828', width: 0.8 },
        data: pg.fapLevels.map((f) => ({ yAxis: f.power, label: { formatter: `FAP ${f.fap * 100}%`, fontSize: 9, position: 'insideEndTop' } })),
      },
    }],
  }
}

/** Pairs of the sampled P, K, e (lower triangle: scatter; diagonal: histograms). */
export function cornerOption(s: ReportSnapshot): Option | null {
  const c = s.sampling?.corner
  if (!c || c.names.length < 2) return null
  const n = Math.min(c.names.length, 6)
  const size = 1 / n
  const grids: Option[] = [], xAxes: Option[] = [], yAxes: Option[] = [], series: Option[] = []
  for (let r = 0; r < n; r++) {
    for (let q = 0; q <= r; q++) {
      const gi = grids.length
      grids.push({ left: `${8 + q * size * 88}%`, top: `${4 + r * size * 88}%`, width: `${size * 80}%`, height: `${size * 80}%` })
      const show = (on: boolean, name: string) => ({ show: on, fontSize: 8, hideOverlap: true, name, nameTextStyle: { fontSize: 9 } })
      xAxes.push({ type: 'value', gridIndex: gi, scale: true, axisLabel: show(r === n - 1, ''), splitLine: { show: false }, name: r === n - 1 ? c.names[q] : '', nameLocation: 'middle', nameGap: 18 })
      if (q === r) {
        const col = c.columns[q]!.filter(Number.isFinite)
        const lo = Math.min(...col), hi = Math.max(...col), bins = 24, w = (hi - lo) / bins || 1
        const counts = new Array(bins).fill(0)
        for (const x of col) counts[Math.min(bins - 1, Math.floor((x - lo) / w))]++
        yAxes.push({ type: 'value', gridIndex: gi, axisLabel: { show: false }, splitLine: { show: false } })
        series.push({ type: 'bar', xAxisIndex: gi, yAxisIndex: gi, barWidth: '90%', itemStyle: { color: COLORS[0] }, data: counts.map((k, i) => [lo + (i + 0.5) * w, k]) })
      } else {
        yAxes.push({ type: 'value', gridIndex: gi, scale: true, axisLabel: show(q === 0, ''), splitLine: { show: false }, name: q === 0 ? c.names[r] : '', nameLocation: 'middle', nameGap: 40 })
        series.push({ type: 'scatter', xAxisIndex: gi, yAxisIndex: gi, symbolSize: 1.5, itemStyle: { color: COLORS[0], opacity: 0.4 }, data: c.columns[q]!.map((x, i) => [x, c.columns[r]![i]]).filter(([x, y]) => Number.isFinite(x) && Number.isFinite(y)) })
      }
    }
  }
  return { ...base, grid: grids, xAxis: xAxes, yAxis: yAxes, series }
}


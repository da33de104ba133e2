// The report's plots as ECharts options (plain objects): drawn on the report page and rendered to
// SVG for the PDF on the server (server/reports/charts.ts). Every point carries its quoted 1σ error
// bar; instruments keep the app's colours and symbols; the velocity and residual panels share one
// time axis, labelled with the data's time system.
import type { ReportSnapshot, SnapshotPeriodogram, SnapshotPoint } from '../api/reports.ts'
import { keplerianVelocity, trendVelocity } from './curve.ts'
import { formatPlain } from './round.ts'
import { EXCLUDED_COLOR, instrumentStyles } from './palette.ts'
import { snapshotTimeSystem } from './time-label.ts'

export type Option = Record<string, unknown>
export const FONT_FAMILY = 'Roboto'
const base = { animation: false, textStyle: { fontFamily: FONT_FAMILY } }
const title = (text: string) => ({ text, left: 'center', top: 4, textStyle: { fontSize: 13, fontWeight: 'normal' } })
const MODEL_COLOR = '#212121'

function grid(n: number, lo: number, hi: number): number[] {
  return Array.from({ length: n }, (_, i) => lo + ((hi - lo) * i) / (n - 1))
}

function offsets(s: ReportSnapshot): Map<string, number> {
  return new Map(s.result.instruments.map((i) => [i.name, i.offset ?? 0]))
}

interface ErrorPoint { x: number; y: number; err: number }

/** A vertical 1σ bar per point, drawn by a custom series in the instrument's colour. */
export function errorBarSeries(name: string, color: string, points: ErrorPoint[]): Option {
  return {
    type: 'custom', name, silent: true, z: 1, itemStyle: { color },
    encode: { x: 0, y: [1, 2] },
    data: points.map((p) => [p.x, p.y - p.err, p.y + p.err]),
    renderItem: (_params: unknown, api: { value: (i: number) => number; coord: (v: number[]) => number[] }) => {
      const lo = api.coord([api.value(0), api.value(1)]), hi = api.coord([api.value(0), api.value(2)])
      return { type: 'line', shape: { x1: lo[0], y1: lo[1], x2: hi[0], y2: hi[1] }, style: { stroke: color, lineWidth: 0.8, opacity: 0.8 } }
    },
  }
}

/** Scatter + error bars of one instrument's points, in its colour and symbol. */
function pointsWithErrors(name: string, style: { color: string; symbol: string }, pts: ErrorPoint[], hollow = false): Option[] {
  return [
    errorBarSeries(name, style.color, pts),
    {
      type: 'scatter', name, symbol: hollow ? 'emptyCircle' : style.symbol, symbolSize: 5, z: 2,
      itemStyle: { color: style.color }, data: pts.map((p) => [p.x, p.y]),
    },
  ]
}

/** The common time axis of the velocity and residual panels: span of every point (included or not), reduced epoch. */
export function timeAxis(s: ReportSnapshot): { t0: number; min: number; max: number; name: string } {
  const ts = snapshotTimeSystem(s)
  const t = s.data.points.map((p) => p.time).filter(Number.isFinite)
  const lo = t.length ? Math.min(...t) : 0, hi = t.length ? Math.max(...t) : 1
  const pad = 0.02 * (hi - lo || 1)
  return { t0: ts.offset, min: Math.floor(lo - pad - ts.offset), max: Math.ceil(hi + pad - ts.offset), name: `Time (${ts.label})` }
}

function groupBy(points: SnapshotPoint[], name: string) { return points.filter((p) => p.instrument === name) }

/** Velocities with each instrument's offset removed, and the model (Keplerians + trend) over the baseline. */
export function timeSeriesOption(s: ReportSnapshot): Option {
  const ax = timeAxis(s)
  const off = offsets(s)
  const styles = instrumentStyles(s.data.instruments)
  const used = s.data.points.filter((p) => p.included)
  // dense enough for every orbit: at least 40 samples per shortest period over the span (capped)
  const shortest = Math.min(...s.result.planets.map((p) => p.period), Infinity)
  const span = ax.max - ax.min
  const n = Math.min(20000, Math.max(1000, Number.isFinite(shortest) ? Math.ceil((40 * span) / shortest) : 1000))
  const g = grid(n, ax.min + ax.t0, ax.max + ax.t0)
  const kep = keplerianVelocity(s.result, g), tr = trendVelocity(s.result, g)
  const series: Option[] = s.data.instruments.flatMap((name) => pointsWithErrors(name, styles.get(name)!,
    groupBy(used, name).map((p) => ({ x: p.time - ax.t0, y: p.rv - (off.get(name) ?? 0), err: p.error }))))
  const excluded = s.data.points.filter((p) => !p.included)
  if (excluded.length) {
    series.push(...pointsWithErrors('excluded', { color: EXCLUDED_COLOR, symbol: 'emptyCircle' },
      excluded.map((p) => ({ x: p.time - ax.t0, y: p.rv - (off.get(p.instrument) ?? 0), err: p.error })), true))
  }
  series.push({ type: 'line', name: 'model', showSymbol: false, z: 3, itemStyle: { color: MODEL_COLOR }, lineStyle: { width: 0.9, color: MODEL_COLOR }, data: g.map((x, i) => [x - ax.t0, kep[i]! + tr[i]!]) })
  return {
    ...base, title: title('Radial velocities (instrument zero points removed) and the model'), legend: { bottom: 0, textStyle: { fontSize: 10 } },
    grid: { left: 60, right: 20, top: 30, bottom: 68 },
    xAxis: { type: 'value', name: ax.name, nameLocation: 'middle', nameGap: 22, min: ax.min, max: ax.max },
    yAxis: { type: 'value', name: 'Radial velocity (m/s)', nameLocation: 'middle', nameGap: 42, scale: true },
    series,
  }
}

/** Residuals (O − C) against time, on the same axis as the velocities. */
export function residualsOption(s: ReportSnapshot): Option {
  const ax = timeAxis(s)
  const styles = instrumentStyles(s.data.instruments)
  const used = s.data.points.filter((p) => p.included && p.residual !== null)
  const series: Option[] = s.data.instruments.flatMap((name) => pointsWithErrors(name, styles.get(name)!,
    groupBy(used, name).map((p) => ({ x: p.time - ax.t0, y: p.residual!, err: p.error }))))
  series.push({ type: 'line', name: 'zero', silent: true, showSymbol: false, lineStyle: { color: '#757575', type: 'dashed', width: 0.8 }, data: [[ax.min, 0], [ax.max, 0]] })
  return {
    ...base, title: title(`Residuals (rms ${s.result.stats.rms === null ? '—' : formatPlain(s.result.stats.rms, 3)} m/s)`),
    legend: { bottom: 0, textStyle: { fontSize: 10 }, data: s.data.instruments },
    grid: { left: 60, right: 20, top: 30, bottom: 68 },
    xAxis: { type: 'value', name: ax.name, nameLocation: 'middle', nameGap: 22, min: ax.min, max: ax.max },
    yAxis: { type: 'value', name: 'O − C (m/s)', nameLocation: 'middle', nameGap: 42, scale: true },
    series,
  }
}

/** Planet k's signal: each velocity minus its offset, the trend and the other planets, against phase from Tc. */
export function phaseOption(s: ReportSnapshot, k: number): Option {
  const p = s.result.planets[k]!
  const off = offsets(s)
  const styles = instrumentStyles(s.data.instruments)
  const used = s.data.points.filter((x) => x.included)
  const times = used.map((x) => x.time)
  const all = keplerianVelocity(s.result, times), mine = keplerianVelocity(s.result, times, k), tr = trendVelocity(s.result, times)
  const phase = (t: number) => { const f = ((t - p.tc) / p.period) % 1; return f < 0 ? f + 1 : f }
  const g = grid(600, 0, 1)
  const curve = keplerianVelocity(s.result, g.map((f) => p.tc + f * p.period), k)
  const rows = used.map((x, i) => ({ x, i }))
  return {
    ...base, title: title(`Planet ${p.label}: P = ${formatPlain(p.period, 7)} d, phase-folded`), legend: { bottom: 0, textStyle: { fontSize: 10 }, data: s.data.instruments },
    grid: { left: 60, right: 20, top: 30, bottom: 68 },
    xAxis: { type: 'value', name: 'Phase from the conjunction Tc', nameLocation: 'middle', nameGap: 22, min: 0, max: 1 },
    yAxis: { type: 'value', name: 'Radial velocity (m/s)', nameLocation: 'middle', nameGap: 42, scale: true },
    series: [
      ...s.data.instruments.flatMap((name) => pointsWithErrors(name, styles.get(name)!, rows.filter(({ x }) => x.instrument === name)
        .map(({ x, i }) => ({ x: phase(x.time), y: x.rv - (off.get(name) ?? 0) - tr[i]! - (all[i]! - mine[i]!), err: x.error })))),
      { type: 'line', name: 'model', showSymbol: false, z: 3, itemStyle: { color: MODEL_COLOR }, lineStyle: { width: 1.2, color: MODEL_COLOR }, data: g.map((f, i) => [f, curve[i]]) },
    ],
  }
}

const FAP_COLORS = ['#8a6d3b', '#b3261e', '#6a1b9a']
const FAP_POSITIONS = ['insideEndTop', 'insideMiddleTop', 'insideStartTop']

/** "1 %", "0.1 %": a false-alarm level in words. */
export function fapPercent(fap: number): string {
  return `${formatPlain(fap * 100, 3)} %`
}

/** The periodogram over its whole grid, with every FAP level inside the axis and labelled where the labels cannot overlap. */
export function periodogramOption(pg: SnapshotPeriodogram, label: string): Option {
  const top = Math.max(...pg.curve.power, ...pg.fapLevels.map((f) => f.power), 0)
  const levels = [...pg.fapLevels].sort((a, b) => b.fap - a.fap)
  return {
    ...base, title: title(label), legend: { show: false },
    grid: { left: 60, right: 20, top: 30, bottom: 40 },
    xAxis: {
      type: 'log', name: 'Period (d)', nameLocation: 'middle', nameGap: 22, min: Math.min(...pg.curve.period), max: Math.max(...pg.curve.period),
      axisLabel: { formatter: (v: number) => formatPlain(v, 3) },
    },
    yAxis: { type: 'value', name: 'Normalised power', nameLocation: 'middle', nameGap: 42, min: 0, max: Math.min(1, Math.ceil(top * 1.1 * 20) / 20) },
    series: [{
      type: 'line', showSymbol: false, lineStyle: { width: 0.8, color: '#0072B2' },
      data: pg.curve.period.map((x, i) => [x, pg.curve.power[i]]),
      markLine: {
        silent: true, symbol: 'none',
        data: levels.map((f, i) => ({
          yAxis: f.power, lineStyle: { type: 'dashed', color: FAP_COLORS[i % 3], width: 0.9 },
          label: { formatter: `FAP ${fapPercent(f.fap)}`, fontSize: 9, color: FAP_COLORS[i % 3], position: FAP_POSITIONS[i % 3] },
        })),
      },
    }],
  }
}

export { cornerOption, cornerInputOf } from './corner-option.ts'

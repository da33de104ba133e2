/**
 * The corner plot of a posterior (common practice in the field): for every pair of the chosen
 * parameters, the 2-D density of the draws as contours enclosing 39.3 % and 86.5 % of them (the
 * 1σ and 2σ regions of a 2-D Gaussian, 1 − e^(−1/2) and 1 − e^(−2)) over the faint draws; on the
 * diagonal, each parameter's histogram with dashed lines at the 16th, 50th and 84th percentiles and
 * its median and interval written above it. Contours are traced by d3-contour (marching squares)
 * on a lightly smoothed 2-D histogram.
 */
import { contours } from 'd3-contour'
import { roundAsymmetric } from './round.ts'

type Option = Record<string, unknown>

export interface CornerInput { names: string[]; units: string[]; columns: number[][] }

/** Mass enclosed by the 1σ and 2σ contours of a 2-D Gaussian. */
export const CONTOUR_MASSES = [1 - Math.exp(-0.5), 1 - Math.exp(-2)] as const

const COLOR = '#0072B2'
const BINS_1D = 28
const BINS_2D = 26

/** The q-quantile of sorted values (linear interpolation between order statistics). */
export function quantileSorted(sorted: ArrayLike<number>, q: number): number {
  const n = sorted.length
  if (n === 0) return NaN
  const h = (n - 1) * q, i = Math.floor(h)
  return i + 1 < n ? sorted[i]! + (h - i) * (sorted[i + 1]! - sorted[i]!) : sorted[n - 1]!
}

/** "K b = 55.8 +0.3 −0.4 m/s" from the 16/50/84 % quantiles. */
export function intervalTitle(name: string, unit: string, q16: number, q50: number, q84: number): string {
  const plus = q84 - q50, minus = q50 - q16
  const u = unit ? ` ${unit}` : ''
  if (!(plus > 0) || !(minus > 0)) return `${name} = ${q50}${u}`
  const r = roundAsymmetric(q50, plus, minus)
  return r.plus === r.minus ? `${name} = ${r.value} ± ${r.plus}${u}` : `${name} = ${r.value} +${r.plus} −${r.minus}${u}`
}

/** Density thresholds of a histogram whose highest cells hold the given fractions of all counts. */
export function massThresholds(values: ArrayLike<number>, masses: readonly number[]): number[] {
  const sorted = Array.from(values).sort((a, b) => b - a)
  const total = sorted.reduce((a, b) => a + b, 0)
  return masses.map((m) => {
    let acc = 0
    for (const v of sorted) { acc += v; if (acc >= m * total) return v }
    return sorted[sorted.length - 1] ?? 0
  })
}

function range(sorted: number[]): [number, number] {
  let lo = quantileSorted(sorted, 0.002), hi = quantileSorted(sorted, 0.998)
  if (!(hi > lo)) { lo -= 0.5 * (Math.abs(lo) || 1); hi += 0.5 * (Math.abs(hi) || 1) }
  return [lo, hi]
}

/** 2-D histogram of (x, y) on bins × bins cells over the ranges, smoothed by a 1-2-1 kernel in each direction. */
function density(x: number[], y: number[], rx: [number, number], ry: [number, number], bins: number): number[] {
  const h = new Array(bins * bins).fill(0)
  const wx = (rx[1] - rx[0]) / bins, wy = (ry[1] - ry[0]) / bins
  for (let k = 0; k < x.length; k++) {
    const i = Math.floor((x[k]! - rx[0]) / wx), j = Math.floor((y[k]! - ry[0]) / wy)
    if (i >= 0 && i < bins && j >= 0 && j < bins) h[i + j * bins]++
  }
  const pass = (src: number[], dx: number, dy: number) => src.map((_, idx) => {
    const i = idx % bins, j = Math.floor(idx / bins)
    let s = 2 * src[idx]!, w = 2
    for (const d of [-1, 1]) {
      const a = i + d * dx, b = j + d * dy
      if (a >= 0 && a < bins && b >= 0 && b < bins) { s += src[a + b * bins]!; w += 1 }
    }
    return s / w
  })
  return pass(pass(h, 1, 0), 0, 1)
}

/** Contour rings (data coordinates) of the 1σ and 2σ regions of the draws (x, y). */
export function contourRings(x: number[], y: number[], rx: [number, number], ry: [number, number], bins = BINS_2D): Array<{ mass: number; rings: number[][][] }> {
  const d = density(x, y, rx, ry, bins)
  const levels = massThresholds(d, CONTOUR_MASSES)
  const wx = (rx[1] - rx[0]) / bins, wy = (ry[1] - ry[0]) / bins
  return levels.map((level, k) => {
    const [shape] = contours().size([bins, bins]).thresholds([level])(d)
    const rings = (shape?.coordinates ?? []).flatMap((poly) => poly.map((ring) => ring.map(([gx, gy]) => [rx[0] + gx! * wx, ry[0] + gy! * wy])))
    return { mass: CONTOUR_MASSES[k]!, rings }
  })
}

/** What a frozen report offers the corner plot: every sampled parameter's draws when stored, else the planets' P, K, e. */
export function cornerInputOf(sampling: { corner: CornerInput; samples?: CornerInput } | null | undefined): CornerInput | null {
  if (!sampling) return null
  const s = sampling.samples
  return s && s.names.length >= 2 ? { names: s.names, units: s.units, columns: s.columns } : sampling.corner
}

/**
 * The corner plot of the chosen parameters (default: all, at most `max`), as one ECharts option with
 * a grid per panel. Returns null with fewer than two parameters.
 */
export function cornerOption(post: CornerInput | null | undefined, opts: { names?: string[]; max?: number; fontFamily?: string } = {}): Option | null {
  if (!post) return null
  const chosen = (opts.names ?? post.names).map((n) => post.names.indexOf(n)).filter((i) => i >= 0).slice(0, opts.max ?? 8)
  const n = chosen.length
  if (n < 2) return null
  const cols = chosen.map((i) => post.columns[i]!.filter(Number.isFinite))
  const sorted = cols.map((c) => [...c].sort((a, b) => a - b))
  const ranges = sorted.map(range)
  const size = 88 / n
  const grids: Option[] = [], xAxes: Option[] = [], yAxes: Option[] = [], series: Option[] = [], titles: Option[] = []
  const label = (on: boolean) => ({ show: on, fontSize: 7, hideOverlap: true, rotate: 40 })
  const name = (k: number) => `${post.names[chosen[k]!]}${post.units[chosen[k]!] ? ` (${post.units[chosen[k]!]})` : ''}`
  for (let r = 0; r < n; r++) {
    for (let q = 0; q <= r; q++) {
      const gi = grids.length
      const left = 9 + q * size, top = 5 + r * size
      grids.push({ left: `${left}%`, top: `${top}%`, width: `${size * 0.9}%`, height: `${size * 0.9}%` })
      xAxes.push({
        type: 'value', gridIndex: gi, min: ranges[q]![0], max: ranges[q]![1], axisLabel: label(r === n - 1), axisTick: { show: r === n - 1 }, splitLine: { show: false },
        name: r === n - 1 ? name(q) : '', nameLocation: 'middle', nameGap: 28, nameTextStyle: { fontSize: 8 },
      })
      if (q === r) {
        const s = sorted[q]!, [lo, hi] = ranges[q]!, w = (hi - lo) / BINS_1D
        const counts = new Array(BINS_1D).fill(0)
        for (const x of s) { const i = Math.floor((x - lo) / w); if (i >= 0 && i < BINS_1D) counts[i]++ }
        const [q16, q50, q84] = [0.16, 0.5, 0.84].map((p) => quantileSorted(s, p)) as [number, number, number]
        yAxes.push({ type: 'value', gridIndex: gi, min: 0, axisLabel: { show: false }, axisTick: { show: false }, splitLine: { show: false } })
        series.push({
          type: 'bar', xAxisIndex: gi, yAxisIndex: gi, barWidth: '100%', barGap: '-100%', itemStyle: { color: COLOR, opacity: 0.55 },
          data: counts.map((c, i) => [lo + (i + 0.5) * w, c]),
          markLine: { silent: true, symbol: 'none', label: { show: false }, lineStyle: { color: '#333', type: 'dashed', width: 0.8 }, data: [q16, q50, q84].map((x) => ({ xAxis: x })) },
        })
        titles.push({
          text: intervalTitle(post.names[chosen[q]!]!, post.units[chosen[q]!] ?? '', q16, q50, q84),
          left: `${left + size * 0.45}%`, top: `${top - 2.2}%`, textAlign: 'center', textStyle: { fontSize: 7.5, fontWeight: 'normal' },
        })
      } else {
        const x = cols[q]!, y = cols[r]!
        yAxes.push({
          type: 'value', gridIndex: gi, min: ranges[r]![0], max: ranges[r]![1], axisLabel: label(q === 0), axisTick: { show: q === 0 }, splitLine: { show: false },
          name: q === 0 ? name(r) : '', nameLocation: 'middle', nameGap: 40, nameTextStyle: { fontSize: 8 },
        })
        const step = Math.max(1, Math.floor(x.length / 800))
        series.push({
          type: 'scatter', xAxisIndex: gi, yAxisIndex: gi, symbolSize: 1.2, silent: true, itemStyle: { color: '#9e9e9e', opacity: 0.5 },
          data: x.filter((_, i) => i % step === 0).map((v, i) => [v, y[i * step]]),
        })
        for (const { mass, rings } of contourRings(x, y, ranges[q]!, ranges[r]!)) {
          for (const ring of rings) {
            series.push({
              type: 'line', xAxisIndex: gi, yAxisIndex: gi, showSymbol: false, silent: true, smooth: false,
              lineStyle: { color: COLOR, width: mass < 0.5 ? 1.2 : 0.8 }, data: ring,
            })
          }
        }
      }
    }
  }
  return { animation: false, textStyle: { fontFamily: opts.fontFamily ?? 'Roboto' }, title: titles, grid: grids, xAxis: xAxes, yAxis: yAxes, series }
}

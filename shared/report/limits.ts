// Detection limits as reports and screens show them: the period–M sin i completeness map as an
// ECharts option (one rectangle per grid cell coloured by the recovered fraction on log axes, the 50 %
// and 90 % contours, the model's planets and the Solar System's giants placed around this star),
// the table for a paper as CSV, and the non-detection sentence. Browser and server (PDF) alike.
import type { EChartsOption } from 'echarts'
import type { LimitsResult, LimitsSettings } from '../api/limits.ts'

/** Cell edges halfway (in log) between grid values. */
export function logEdges(v: readonly number[]): number[] {
  const n = v.length
  if (n === 1) return [v[0]! / 1.5, v[0]! * 1.5]
  const e = [v[0]! * Math.sqrt(v[0]! / v[1]!)]
  for (let i = 0; i + 1 < n; i++) e.push(Math.sqrt(v[i]! * v[i + 1]!))
  e.push(v[n - 1]! * Math.sqrt(v[n - 1]! / v[n - 2]!))
  return e
}

/** White (0 %) to deep blue (100 %). */
export function fractionColour(f: number): string {
  const c = Math.max(0, Math.min(1, f))
  const r = Math.round(255 - c * (255 - 21)), g = Math.round(255 - c * (255 - 101)), b = Math.round(255 - c * (255 - 192))
  return `rgb(${r},${g},${b})`
}

/** The map; `still` drops the interactive parts (toolbox, tooltips) for a PDF page. */
export function limitsChartOption(r: LimitsResult, opts: { still?: boolean; fontFamily?: string } = {}): EChartsOption {
  const pe = logEdges(r.periods), me = logEdges(r.massesEarth)
  const cells: number[][] = []
  r.fraction.forEach((row, i) => row.forEach((f, j) => cells.push([pe[i]!, me[j]!, pe[i + 1]!, me[j + 1]!, f])))
  const contour = (c: LimitsResult['contour50']) => c.filter((p) => p.massEarth !== null).map((p) => [p.period, p.massEarth as number])
  const inRange = (p: { period: number; massEarth: number }) => p.period >= pe[0]! && p.period <= pe[pe.length - 1]!
  const still = opts.still === true
  return {
    animation: false,
    ...(opts.fontFamily ? { textStyle: { fontFamily: opts.fontFamily } } : {}),
    grid: { left: 80, right: 30, top: still ? 64 : 40, bottom: 60 },
    legend: { top: 0 },
    ...(still ? {} : { tooltip: { trigger: 'item' }, toolbox: { feature: { saveAsImage: { title: 'Save PNG' } } } }),
    // the grid's edges are not round numbers: their labels are left out
    xAxis: { type: 'log', name: 'Period (days)', nameLocation: 'middle', nameGap: 32, min: pe[0], max: pe[pe.length - 1], axisLabel: { showMinLabel: false, showMaxLabel: false } },
    yAxis: { type: 'log', name: 'M sin i (Earth masses)', nameLocation: 'middle', nameGap: 55, min: me[0], max: me[me.length - 1], axisLabel: { showMinLabel: false, showMaxLabel: false } },
    series: [
      {
        name: 'Recovered fraction', type: 'custom', data: cells,
        renderItem: (_params, api) => {
          const a = api.coord([api.value(0), api.value(1)]), b = api.coord([api.value(2), api.value(3)])
          return { type: 'rect', shape: { x: a[0]!, y: b[1]!, width: b[0]! - a[0]!, height: a[1]! - b[1]! }, style: { fill: fractionColour(Number(api.value(4))) } }
        },
        encode: { x: [0, 2], y: [1, 3] },
        ...(still ? {} : { tooltip: { formatter: (p: unknown) => { const v = (p as { value: number[] }).value; return `P ${v[0]!.toPrecision(3)}–${v[2]!.toPrecision(3)} d, M sin i ${v[1]!.toPrecision(3)}–${v[3]!.toPrecision(3)} M⊕: ${(100 * v[4]!).toFixed(0)} % recovered` } } }),
      },
      { name: '50 % completeness', type: 'line', data: contour(r.contour50), showSymbol: false, lineStyle: { color: '#e65100', width: 2 } },
      { name: '90 % completeness', type: 'line', data: contour(r.contour90), showSymbol: false, lineStyle: { color: '#b71c1c', width: 2, type: 'dashed' } },
      { name: 'Planets of the model', type: 'scatter', data: r.planets.filter(inRange).map((p) => ({ value: [p.period, p.massEarth], name: p.label })), symbolSize: 12, itemStyle: { color: '#2e7d32' }, label: { show: true, formatter: '{b}', position: 'right' } },
      { name: 'Solar System giants (at this star)', type: 'scatter', data: r.giants.filter(inRange).map((g) => ({ value: [g.period, g.massEarth], name: g.name })), symbol: 'diamond', symbolSize: 10, itemStyle: { color: '#6a1b9a' }, label: { show: true, formatter: '{b}', position: 'right' } },
    ],
  } as EChartsOption
}

/** The table for a paper as CSV (period range, 50 % and 90 % limits in Earth masses, mean completeness). */
export function limitsTableCsv(r: LimitsResult): string {
  const f = (v: number | null) => (v === null ? 'not reached' : v.toPrecision(3))
  const lines = ['period_from_d,period_to_d,msini_50pct_earth,msini_90pct_earth,mean_completeness']
  for (const row of r.table) lines.push([row.from, row.to, f(row.mass50Earth), f(row.mass90Earth), row.meanCompleteness.toFixed(3)].join(','))
  return lines.join('\r\n') + '\r\n'
}

const sig = (v: number) => (v >= 100 ? v.toFixed(0) : v.toPrecision(2))

/**
 * The non-detection statement for a paper, from the limits table: per period range, the M sin i
 * above which 90 % of the injected planets were recovered (ranges where 90 % is not reached within
 * the grid are named as such), with the trials, the recovery criterion and the seed.
 */
export function nonDetectionSentence(r: LimitsResult, settings: Pick<LimitsSettings, 'fapThreshold' | 'criterion'>, seed: number): string {
  const parts = r.table.map((row) => row.mass90Earth === null
    ? `not reached below ${sig(r.massesEarth[r.massesEarth.length - 1]!)} M⊕ at ${sig(row.from)}–${sig(row.to)} d`
    : `${sig(row.mass90Earth)} M⊕ at ${sig(row.from)}–${sig(row.to)} d`)
  const crit = settings.criterion === 'power' ? 'the periodogram power at the injected period' : 'the highest periodogram peak at the injected period'
  return `From ${r.nPoints} velocities over ${r.baseline.toFixed(0)} d, injection–recovery tests (${r.perCell} trials per cell of a ${r.periods.length} × ${r.massesEarth.length} period–M sin i grid, ` +
    `recovered when ${crit} passes a false-alarm probability of ${settings.fapThreshold}; seed ${seed}) exclude with 90 % completeness planets with M sin i above ` +
    `${parts.length ? parts.join('; ') : 'no tabulated range'} (stellar mass ${r.starMass} M☉).`
}

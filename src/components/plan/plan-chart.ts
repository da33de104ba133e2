// The predicted velocity over the planning window (posterior median and 16–84 % band, m/s) with
// the recommended instants marked, against JD (UTC) − an offset shown in the axis name.
import type { EChartsOption } from 'echarts'
import type { PlanResponse } from '@shared/api/plan.ts'

export function planChartOption(p: PlanResponse): EChartsOption {
  const t0 = Math.floor(p.window.startJd)
  const x = (jd: number) => jd - t0
  // the band as one polygon (hi forwards, lo backwards): ECharts does not stack lines on a value axis
  const hi = p.curve.jd.map((jd, i) => [x(jd), p.curve.hi[i]])
  const lo = p.curve.jd.map((jd, i) => [x(jd), p.curve.lo[i]])
  return {
    animation: false,
    grid: { left: 70, right: 30, top: 40, bottom: 60 },
    legend: { top: 0 },
    tooltip: { trigger: 'axis' },
    toolbox: { feature: { saveAsImage: { title: 'Save PNG' } } },
    xAxis: { type: 'value', name: `JD (UTC) − ${t0}`, nameLocation: 'middle', nameGap: 32, min: x(p.window.startJd), max: x(p.window.endJd), axisLabel: { showMinLabel: false, showMaxLabel: false } },
    yAxis: { type: 'value', name: `Predicted velocity, ${p.instrument} (m/s)`, nameLocation: 'middle', nameGap: 50, scale: true },
    series: [
      {
        name: '16–84 % of the posterior', type: 'custom', data: [...hi, ...lo], encode: { x: 0, y: 1 }, tooltip: { show: false }, itemStyle: { color: 'rgba(21,101,192,0.25)' },
        renderItem: (params, api) => {
          if (params.dataIndex !== 0) return null
          const points = [...hi, ...[...lo].reverse()].map((q) => api.coord(q))
          return { type: 'polygon', shape: { points }, style: { fill: 'rgba(21,101,192,0.25)' } }
        },
      },
      {
        name: 'Median prediction', type: 'line', data: p.curve.jd.map((jd, i) => [x(jd), p.curve.mid[i]]), showSymbol: false, lineStyle: { color: '#1565c0' },
        markLine: { symbol: 'none', label: { formatter: '{b}', position: 'end' }, lineStyle: { color: '#e65100', type: 'dashed' }, data: p.recommendations.map((r, i) => ({ xAxis: x(r.jdUtc), name: String(i + 1) })) },
      },
    ],
  }
}

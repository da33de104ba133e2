// The report's plots rendered to SVG on the server (ECharts' SSR SVG renderer) for the PDF.
import * as echarts from 'echarts'
import type { Option } from '../../shared/report/chart-options.ts'

export { cornerOption, periodogramOption, phaseOption, residualsOption, timeSeriesOption } from '../../shared/report/chart-options.ts'

/** Renders an option to an SVG string; the chart is always disposed (an undisposed one keeps Node running). */
export function renderSvg(option: Option, width: number, height: number): string {
  const chart = echarts.init(null, null, { renderer: 'svg', ssr: true, width, height })
  try {
    chart.setOption(option)
    return chart.renderToSVGString()
  } finally {
    chart.dispose()
  }
}

// @vitest-environment happy-dom
// Issue 11, hole 8: user text (a star name, an indicator name) inside a chart tooltip is shown as
// text, never run as HTML (ECharts renders a formatter's string as HTML).
import { describe, expect, it } from 'vitest'
import type { ModelVersion } from '@shared/api/analyses.ts'
import DerivedPanel from '@/components/analysis/DerivedPanel.vue'
import { buildPeriodogramChart } from '@/components/analysis/periodogram-option.ts'
import { mountWithApp, settle } from '../../mount.ts'

const HOSTILE = '<img src=x onerror="alert(1)">'

type Formatter = (p: unknown) => string
const tooltipOf = (option: unknown) => (option as { tooltip: { formatter: Formatter } }).tooltip.formatter

describe('chart tooltips escape user text', () => {
  it('the period–mass chart shows a star name with markup as text', async () => {
    const planet = {
      label: 'b', period: 12.3, msiniMearth: 8.1, msiniMjup: 0.0255, aAu: 0.1, tc: 2459000.1, insolationEarth: null,
      derivedUncertainty: { msiniMearth: 0.5, msiniMjup: 0.0016, aAu: 0.001 }, uncertainty: { tc: 0.01 },
    }
    const version = { result: { planets: [planet] } } as unknown as ModelVersion
    const w = mountWithApp(DerivedPanel, { props: { version, massMsun: 1, starName: HOSTILE }, global: { stubs: { ChartFrame: true } } })
    await settle()
    const option = w.findComponent({ name: 'ChartFrame' }).props('option') as { series: Array<{ data: Array<{ name: string; value: number[] }> }> }
    const point = option.series[1]!.data[0]!
    const html = tooltipOf(option)(point)
    expect(html).not.toContain('<img')
    expect(html).toContain('&lt;img src=x onerror=')
    w.unmount()
  })

  it('the periodogram tooltip shows an indicator (series) name with markup as text', () => {
    const run = {
      id: 1, starId: 1, kind: 'rv', indicator: null, modelVersionId: null,
      settings: { minPeriod: 1.1, maxPeriod: 100, oversample: 10, instruments: null },
      data: { instruments: ['A'], nPoints: 50, nExcluded: 0, hash: 'x', firstTime: 2458000, lastTime: 2458100, baseline: 100 },
      result: {
        grid: { minFrequency: 0.01, maxFrequency: 1 / 1.1, count: 3, method: 'direct' },
        curve: { period: [1.1, 10, 100], power: [0.01, 0.2, 0.05] }, window: { period: [1.1, 10, 100], power: [0.1, 0.05, 0.02] },
        windowPeaks: [], peaks: [], fapLevels: [{ fap: 0.1, power: 0.09 }], downsampling: 'none',
      },
      createdBy: null, createdAt: '2026-12-02T00:00:00Z',
    } as never
    const html = tooltipOf(buildPeriodogramChart({ run, title: 't', showWindow: false }))([{ seriesName: HOSTILE, value: [10, 0.2] }])
    expect(html).not.toContain('<img')
    expect(html).toContain('&lt;img')
  })
})

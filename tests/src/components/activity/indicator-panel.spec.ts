// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest'
import type { VueWrapper } from '@vue/test-utils'
import type { Measurement } from '@/api/types.ts'
import IndicatorPanel from '@/components/activity/IndicatorPanel.vue'
import {
  buildIndicatorScatterChart, buildIndicatorTimeChart, indicatorCorrelations, indicatorNames, indicatorRows,
} from '@/components/activity/indicator-panel.ts'
import { mountWithApp, settle } from '../../mount.ts'

// Invented rows: the bisector follows the velocity with the opposite sign on two instruments whose
// zero points differ (the centring per instrument must remove them).
function rows(): Measurement[] {
  const out: Measurement[] = []
  for (let i = 0; i < 30; i++) {
    const instrument = i % 3 === 0 ? 'South' : 'North'
    const act = 8 * Math.sin((2 * Math.PI * i * 3.1) / 23.5)
    out.push({
      id: i + 1, datasetId: 1, instrument, time: 2459000 + i * 3.1, rv: act + (instrument === 'South' ? 40 : -5) + 0.5 * Math.cos(i),
      error: 1.5, indicators: { bisector: -0.9 * act + (instrument === 'South' ? 30 : 0) + 0.3 * Math.sin(7 * i), bisector_err: 2, quiet: (i * 37) % 11 },
      excluded: i === 29, excludedReason: i === 29 ? 'cloud' : null, excludedBy: null, excludedAt: null,
    })
  }
  return out
}

describe('indicator panel logic', () => {
  it('lists indicators without their error columns', () => {
    expect(indicatorNames(rows())).toEqual(['bisector', 'quiet'])
  })

  it('keeps included rows only, with errors and values centred per instrument', () => {
    const r = indicatorRows(rows(), 'bisector')
    expect(r).toHaveLength(29)
    expect(r[0].valueErr).toBe(2)
    const south = r.filter((x) => x.instrument === 'South')
    expect(Math.abs(south.reduce((s, x) => s + x.rvCentred, 0))).toBeLessThan(1e-9)
  })

  it('finds the anticorrelation across instruments once each is centred', () => {
    const lines = indicatorCorrelations(indicatorRows(rows(), 'bisector'))
    expect(lines.map((l) => l.label)).toEqual(['all instruments (each centred)', 'South', 'North'])
    expect(lines[0].correlation.pearson).toBeLessThan(-0.9)
    expect(lines[0].correlation.pearsonP).toBeLessThan(1e-6)
  })

  it('puts units and the time system on the axes, and error bars beside the points', () => {
    const r = indicatorRows(rows(), 'bisector')
    const time = buildIndicatorTimeChart(r, 'bisector', 'BJD_TDB')
    expect((time.xAxis as { name: string }).name).toBe('BJD_TDB − 2\u2009450\u2009000 [d]')
    expect((time.yAxis as { name: string }).name).toBe('bisector [as uploaded]')
    const scatter = buildIndicatorScatterChart(r, 'bisector')
    expect((scatter.yAxis as { name: string }).name).toBe('RV − instrument mean [m/s]')
    const types = (scatter.series as Array<{ type: string; name: string }>).map((s) => `${s.type}:${s.name}`)
    expect(types).toEqual(['scatter:North', 'custom:North', 'scatter:South', 'custom:South'])
  })
})

let wrapper: VueWrapper | undefined
afterEach(() => { wrapper?.unmount(); wrapper = undefined; document.body.innerHTML = '' })

describe('IndicatorPanel', () => {
  it('shows the coefficients table and a caution for a strongly correlated indicator', async () => {
    wrapper = mountWithApp(IndicatorPanel, { props: { measurements: rows(), timeScale: 'BJD_TDB', starName: 'Test' }, global: { stubs: { ChartFrame: true } } })
    await settle()
    const table = wrapper.find('[data-test="indicator-correlations"]')
    expect(table.text()).toContain('all instruments (each centred)')
    expect(table.text()).toContain('North')
    expect(wrapper.find('[data-test="indicator-caution"]').text()).toMatch(/velocities follow bisector/)
    const charts = wrapper.findAllComponents({ name: 'ChartFrame' })
    expect(charts).toHaveLength(2)
    expect((charts[1].props('option') as { yAxis: { name: string } }).yAxis.name).toBe('RV − instrument mean [m/s]')
  })

  it('says so when there are no indicators', async () => {
    const plain = rows().map((m) => ({ ...m, indicators: {} }))
    wrapper = mountWithApp(IndicatorPanel, { props: { measurements: plain, timeScale: 'BJD_TDB', starName: 'Test' }, global: { stubs: { ChartFrame: true } } })
    await settle()
    expect(wrapper.find('[data-test="no-indicators"]').exists()).toBe(true)
  })
})

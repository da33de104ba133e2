// @vitest-environment happy-dom
// The ECharts canvas is stubbed (happy-dom has no 2-D context); the chart option is tested in velocity-chart-option.spec.ts.
import { afterEach, describe, expect, it, vi } from 'vitest'
import { defineComponent, h } from 'vue'
import type { VueWrapper } from '@vue/test-utils'
import VelocityChart from '@/components/data/VelocityChart.vue'
import type { Measurement } from '@/api/types.ts'
import { mountWithApp, settle } from '../../mount.ts'

vi.mock('vue-echarts', () => ({ default: defineComponent({ name: 'ChartStub', render: () => h('div', { class: 'chart-stub' }) }) }))

const point = (id: number, instrument: string, rv: number): Measurement => ({
  id, datasetId: 1, instrument, timeScale: 'bjd_tdb', time: 2459000 + id, rv, error: 2, indicators: {},
  excluded: false, excludedReason: null, excludedBy: null, excludedAt: null,
})
const measurements = [point(1, 'Absolute', -33010), point(2, 'Absolute', -32990), point(3, 'Relative', 3), point(4, 'Relative', -3)]

let wrapper: VueWrapper | undefined
afterEach(() => { wrapper?.unmount(); wrapper = undefined; document.body.innerHTML = '' })

describe('VelocityChart views', () => {
  it('switches to the median-corrected view and says what was removed per instrument', async () => {
    wrapper = mountWithApp(VelocityChart, { props: { measurements, timeScale: 'BJD_TDB' } })
    await settle()
    expect(wrapper.find('[data-test="velocity-chart"]').attributes('data-view')).toBe('raw')
    expect(wrapper.find('[data-test="view-fitted"]').exists()).toBe(false)
    await wrapper.find('[data-test="view-median"]').trigger('click')
    await settle()
    expect(wrapper.find('[data-test="velocity-chart"]').attributes('data-view')).toBe('median')
    const text = wrapper.find('[data-test="zero-points"]').text()
    expect(text).toContain('Absolute −33000.00 m/s')
    expect(text).toContain('median of 2')
  })

  it('offers the fitted offsets when a model gives them and names the model', async () => {
    wrapper = mountWithApp(VelocityChart, { props: { measurements, timeScale: 'BJD_TDB', fittedOffsets: { modelName: 'one planet', offsets: { Absolute: -33001.5 } } } })
    await settle()
    await wrapper.find('[data-test="view-fitted"]').trigger('click')
    await settle()
    const text = wrapper.find('[data-test="zero-points"]').text()
    expect(text).toContain('Absolute −33001.50 m/s')
    expect(text).toContain('offset of “one planet”')
    expect(text).toContain('instruments the model does not fit use their median')
  })
})

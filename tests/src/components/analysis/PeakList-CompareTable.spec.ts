// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest'
import type { VueWrapper } from '@vue/test-utils'
import PeakList from '@/components/analysis/PeakList.vue'
import CompareTable from '@/components/analysis/CompareTable.vue'
import type { CompareResponse } from '@shared/api/analyses.ts'
import { mountWithApp, settle } from '../../mount.ts'

let wrapper: VueWrapper | undefined
afterEach(() => { wrapper?.unmount(); wrapper = undefined; document.body.innerHTML = '' })

const peaks = [
  { period: 186.1, frequency: 1 / 186.1, power: 0.62, fap: 1e-40, aliases: [{ period: 0.995, frequency: 1 / 0.995, source: '1 solar day', windowPower: 0.9, power: 0.1 }] },
  { period: 12.4, frequency: 1 / 12.4, power: 0.29, fap: 3e-5, aliases: [] },
]

describe('PeakList', () => {
  it('lists period, power, FAP and aliases, marks a peak an indicator shares, and offers each as a planet', async () => {
    wrapper = mountWithApp(PeakList, {
      props: { peaks, canAdd: true, coincidences: [{ period: 12.4, indicator: 's_index', indicatorPeriod: 12.5, indicatorFap: 0.001 }] },
    })
    await settle()
    const rows = wrapper.findAll('tbody tr')
    expect(rows[0]!.text()).toContain('186.1')
    expect(rows[0]!.text()).toContain('< 1e-10')
    expect(rows[0]!.text()).toContain('0.995 (1 solar day)')
    expect(rows[1]!.text()).toContain('3.0e-5')
    expect(rows[1]!.find('[data-test="coincidence-chip"]').text()).toBe('also in s_index')
    await wrapper.find('[data-test="add-peak-1"]').trigger('click')
    expect(wrapper.emitted('add')![0]![0]).toEqual(peaks[1])
  })

  it('offers no planet buttons to a reader', async () => {
    wrapper = mountWithApp(PeakList, { props: { peaks, canAdd: false } })
    await settle()
    expect(wrapper.find('[data-test="add-peak-0"]').exists()).toBe(false)
  })
})

describe('CompareTable', () => {
  const compare: CompareResponse = {
    rows: [
      { modelId: 2, name: '2 planets', version: 2, planets: 2, trend: 'none', lnL: -533.7, bic: 1142.9, deltaBic: 0, rms: 2.88, jitters: [{ instrument: 'Kestrel', jitter: 1.85 }], nPoints: 220, dataHash: 'h', comparable: true, preferred: true, evidence: null, reading: 'Preferred by the BIC rule.' },
      { modelId: 1, name: '1 planet', version: 2, planets: 1, trend: 'none', lnL: -741.2, bic: 1531.0, deltaBic: 388.1, rms: 7.04, jitters: [{ instrument: 'Kestrel', jitter: 6.7 }], nPoints: 220, dataHash: 'h', comparable: true, preferred: false, evidence: 'very strong', reading: 'very strong evidence for the preferred model' },
    ],
    preferredModelId: 2, rule: 'the rule', reading: '"2 planets" is preferred.',
  }

  it('marks the preferred model, shows ΔBIC and the reading, and selects a model by click or Enter', async () => {
    wrapper = mountWithApp(CompareTable, { props: { compare, selectedId: 1 } })
    await settle()
    const preferred = wrapper.find('tr[data-preferred="true"]')
    expect(preferred.attributes('data-planets')).toBe('2')
    expect(preferred.text()).toContain('preferred')
    expect(wrapper.find('[data-test="compare-row-1"]').text()).toContain('388.10')
    expect(wrapper.find('[data-test="compare-reading"]').text()).toBe('"2 planets" is preferred.')
    await wrapper.find('[data-test="compare-row-1"]').trigger('click')
    await wrapper.find('[data-test="compare-row-2"]').trigger('keydown', { key: 'Enter' })
    expect(wrapper.emitted('select')).toEqual([[1], [2]])
  })

  it('shows an exact repeat of a model in that model\'s row ("same model as …"), never as a ΔBIC of 1e-11, and the noise model per row', async () => {
    const dup = { ...compare.rows[0]!, modelId: 3, name: '2 planets (copy)', version: 1, bic: 1142.9 + 1.27e-11, deltaBic: null, preferred: false, sameAs: { modelId: 2, name: '2 planets', version: 2 }, reading: 'Same model as "2 planets" (v2)' }
    const gp = { ...compare.rows[1]!, modelId: 4, name: '1 planet + GP', noise: 'gp' as const }
    wrapper = mountWithApp(CompareTable, { props: { compare: { ...compare, rows: [compare.rows[0]!, dup, compare.rows[1]!, gp] } } })
    await settle()
    expect(wrapper.find('[data-test="compare-row-3"]').exists()).toBe(false)
    expect(wrapper.findAll('tbody tr')).toHaveLength(3)
    const same = wrapper.find('[data-test="compare-same-3"]')
    expect(same.text()).toBe('same model as “2 planets (copy)” v1')
    expect(wrapper.text()).not.toMatch(/e-11/)
    await same.find('a').trigger('click')
    expect(wrapper.emitted('select')).toEqual([[3]])
    expect(wrapper.find('[data-test="compare-noise-2"]').text()).toBe('white + jitter')
    expect(wrapper.find('[data-test="compare-noise-4"]').text()).toBe('GP')
  })
})

// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest'
import type { VueWrapper } from '@vue/test-utils'
import SearchReport from '@/components/analysis/SearchReport.vue'
import type { SearchReport as Report } from '@shared/api/analyses.ts'
import { mountWithApp, settle } from '../../mount.ts'

let wrapper: VueWrapper | undefined
afterEach(() => { wrapper?.unmount(); wrapper = undefined; document.body.innerHTML = '' })

const report: Report = {
  flags: [
    { kind: 'alias-runner-up', severity: 'info', period: 4.23, instrument: null, message: 'The 1.31-d partner fits worse by ΔlnL 41.' },
    { kind: 'one-instrument-short-span', severity: 'rejection', period: 58.6, instrument: 'Lick6', message: 'The 58.6-d signal comes from Lick6 alone, which spans 114 d: not kept.' },
    { kind: 'period-beyond-baseline', severity: 'warning', period: 7460, instrument: null, message: 'P = 7460 d is longer than the data: period poorly constrained.' },
  ],
  signals: [{ planet: 0, period: 4.2308, runnerUpDeltaLnL: 41.2, aliases: [{ period: 1.3103, relation: '1 solar day', lnL: -1234.5, converged: true }] }],
  alternatives: [{ description: 'a long-period orbit instead of the quadratic trend', planets: 2, trend: 'none', bic: 2500.1, lnL: -1200.3 }],
  settings: { minPeriod: 0.5, maxPeriod: 30000, bicThreshold: 10, maxPlanets: 5 },
}

describe('SearchReport', () => {
  it('shows the caution, rejections first, the alias partners with ΔlnL and the alternatives', async () => {
    wrapper = mountWithApp(SearchReport, { props: { report, labels: ['b'] } })
    await settle()
    expect(wrapper.find('[data-test="search-caution"]').text()).toContain('not yet a planet')
    const flags = wrapper.findAll('[data-test="search-flag"]')
    expect(flags.map((f) => f.attributes('data-severity'))).toEqual(['rejection', 'warning', 'info'])
    expect(flags[0]!.text()).toContain('Lick6')
    const row = wrapper.find('[data-test="alias-row-0"]')
    expect(row.text()).toContain('b')
    expect(row.text()).toContain('1.310 (1 solar day, -1234.5)')
    expect(row.text()).toContain('41.2')
    expect(wrapper.find('[data-test="search-alternatives"]').text()).toContain('long-period orbit')
    expect(wrapper.text()).toContain('0.500–30000 d')
    expect(wrapper.find('[data-test="search-candidates"]').exists()).toBe(false)
  })

  it('lists flagged candidates apart from the planets, with their doubts', async () => {
    const withCandidate: Report = {
      ...report,
      candidates: [{ period: 135.2, K: 5.0, e: 0.82, omegaDeg: 40, deltaLnL: 24.3, deltaBic: -19.1, kinds: ['candidate-short-instrument'] }],
    }
    wrapper = mountWithApp(SearchReport, { props: { report: withCandidate, labels: ['b'] } })
    await settle()
    const table = wrapper.find('[data-test="search-candidates"]')
    expect(table.text()).toContain('135.2')
    expect(table.text()).toContain('candidate short instrument')
    expect(wrapper.text()).toContain('not counted as planets')
  })
})

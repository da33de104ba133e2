// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest'
import type { VueWrapper } from '@vue/test-utils'
import SamplingResults from '@/components/sampling/SamplingResults.vue'
import { mountWithApp, settle } from '../../mount.ts'
import { makeResult } from './fixture.ts'

let wrapper: VueWrapper | undefined
afterEach(() => { wrapper?.unmount(); wrapper = undefined; document.body.innerHTML = '' })

const rowText = (w: VueWrapper, name: string) => w.find(`[data-test="interval-${name}"]`).text()

describe('SamplingResults: credible intervals and convergence', () => {
  it('lists every fitted and derived parameter with its interval and unit', async () => {
    wrapper = mountWithApp(SamplingResults, { props: { result: makeResult(true), charts: false } })
    await settle()
    const w = wrapper
    expect(w.findAll('[data-test="interval-table"] tbody tr')).toHaveLength(8)
    expect(rowText(w, 'K b')).toContain('9.84 +0.31 −0.29 m/s')
    expect(rowText(w, 'P b')).toContain('12.4021 +0.0012 −0.0011 d')
    expect(rowText(w, 'M sin i b')).toContain('M_Jup')
    expect(rowText(w, 'M sin i b')).toContain('0.0921 +0.0039 −0.0037 M_Jup')
    expect(rowText(w, 'M sin i b (Earth masses)')).toContain('29.3 +1.2 −1.2 M_Earth')
    expect(rowText(w, 'a b')).toContain('0.1051 +0.0021 −0.0021 au')
    expect(rowText(w, 'ω b')).toContain('41 +40 −29°')
    expect(w.find('[data-test="convergence-ok"]').exists()).toBe(true)
    expect(w.find('[data-test="convergence-warnings"]').exists()).toBe(false)
    expect(w.attributes('data-converged')).toBe('true')
  })

  it('marks parameters the model held fixed, keeps them out of the plots, and links the chain as CSV', async () => {
    const r = makeResult(true)
    r.parameters[2] = { name: 'e b', unit: '', median: 0, lo: 0, hi: 0, mean: 0, sd: 0, fixed: true }
    r.settings = { ...r.settings, untilConverged: true, steps: 100_000, keptThin: 4, keptRows: 900, rhatGroups: 4, fixed: [['e', 'omegaDeg']] }
    wrapper = mountWithApp(SamplingResults, { props: { result: r, charts: false, chainUrl: '/api/sampling/7/chain.csv' } })
    await settle()
    expect(rowText(wrapper, 'e b')).toContain('fixed')
    expect(rowText(wrapper, 'e b')).toContain('held fixed')
    expect(wrapper.text()).toContain('Held fixed by the model, not sampled: e b')
    expect(wrapper.text()).toContain('every 4th step kept')
    expect(wrapper.find('[data-test="chain-csv"]').attributes('href')).toBe('/api/sampling/7/chain.csv')
  })

  it('shows the warnings in plain words when the run has not converged', async () => {
    const warnings = ['The chain is only 8 autocorrelation times long for √e sin ω b; run at least 50 times longer than that.']
    wrapper = mountWithApp(SamplingResults, { props: { result: makeResult(false, warnings), charts: false } })
    await settle()
    const box = wrapper.find('[data-test="convergence-warnings"]')
    expect(box.exists()).toBe(true)
    expect(box.text()).toContain('only 8 autocorrelation times')
    expect(wrapper.find('[data-test="convergence-ok"]').exists()).toBe(false)
    expect(wrapper.attributes('data-converged')).toBe('false')
  })

  it('says so when a run was not converged without a warning, and when it was stopped early', async () => {
    const result = makeResult(false)
    result.settings = { ...result.settings, stopped: true, stepsDone: 1200 }
    wrapper = mountWithApp(SamplingResults, { props: { result, charts: false } })
    await settle()
    expect(wrapper.find('[data-test="convergence-warnings"]').text()).toContain('stopped after 1200 of 3600 steps')
  })
})

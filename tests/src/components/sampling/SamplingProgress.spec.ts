// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest'
import type { VueWrapper } from '@vue/test-utils'
import type { SamplingRun } from '@shared/api/sampling.ts'
import SamplingProgress from '@/components/sampling/SamplingProgress.vue'
import { mountWithApp, settle } from '../../mount.ts'

let wrapper: VueWrapper | undefined
afterEach(() => { wrapper?.unmount(); wrapper = undefined; document.body.innerHTML = '' })

function run(state: SamplingRun['state'], stepsDone: number): SamplingRun {
  return {
    id: 5, starId: 1, modelId: 2, modelVersionId: 3, modelVersion: 1, settings: { walkers: 32, steps: 1000, burn: 250, thin: 1, seed: 9 },
    state, progress: { stepsDone, stepsTotal: 1000, tau: 12.5, etaSeconds: 125, acceptance: 0.41, updatedAt: '2026-01-01T00:00:00Z' },
    estimateSeconds: 160, attempts: 1, checkpointStep: 0, resumedFromStep: null, error: state === 'failed' ? 'The worker ran out of retries.' : null,
    requestedBy: { id: 1, name: 'Tomas' }, createdAt: '2026-01-01T00:00:00Z', startedAt: null, finishedAt: null, result: null,
  }
}

describe('SamplingProgress: live state of a run', () => {
  it('shows steps done, the autocorrelation time, acceptance and the time left; analysts may cancel', async () => {
    wrapper = mountWithApp(SamplingProgress, { props: { run: run('running', 400), canCancel: true } })
    await settle()
    const text = wrapper.text()
    expect(wrapper.find('[data-test="sampling-steps"]').text()).toBe('Steps 400 of 1,000 (40 %)')
    expect(text).toContain('Autocorrelation time: 13 steps')
    expect(text).toContain('Acceptance 41 %')
    expect(wrapper.find('[data-test="sampling-eta"]').text()).toContain('2 min 05 s')
    await wrapper.find('[data-test="cancel-sampling"]').trigger('click')
    expect(wrapper.emitted('cancel')).toHaveLength(1)
  })

  it('offers no cancel to readers, nor once the run has finished; a failure is on screen', async () => {
    wrapper = mountWithApp(SamplingProgress, { props: { run: run('running', 400), canCancel: false } })
    await settle()
    expect(wrapper.find('[data-test="cancel-sampling"]').exists()).toBe(false)
    wrapper.unmount()
    wrapper = mountWithApp(SamplingProgress, { props: { run: run('failed', 400), canCancel: true } })
    await settle()
    expect(wrapper.find('[data-test="cancel-sampling"]').exists()).toBe(false)
    expect(wrapper.find('[data-test="sampling-failed"]').text()).toContain('ran out of retries')
  })
})

// @vitest-environment happy-dom
import { afterEach, describe, expect, it, vi } from 'vitest'
import type { VueWrapper } from '@vue/test-utils'
import type { LimitsRun } from '@shared/api/limits.ts'
import { mountWithApp, settle } from '../../mount.ts'
import { RESULT } from './fixture.ts'

const run: LimitsRun = {
  id: 5, starId: 1, modelId: 2, modelVersion: 1, seed: 42, state: 'succeeded', trials: 120, chunkCount: 4,
  settings: { periods: 3, masses: 4, phases: 10, eccentricities: [0], minPeriod: null, maxPeriod: null, minMassEarth: null, maxMassEarth: null, criterion: 'peak', fapThreshold: 1e-3, chunks: 4 },
  progress: { trialsDone: 120, chunksDone: 4, chunksRunning: 0 }, error: null, requestedBy: { id: 1, name: 'A' },
  createdAt: '2026-12-01T00:00:00Z', startedAt: null, finishedAt: null, result: RESULT,
}
vi.mock('@/api/limits.ts', () => ({
  listLimits: vi.fn(async () => [{ ...run, result: null }]),
  fetchLimits: vi.fn(async () => run),
  startLimits: vi.fn(), cancelLimits: vi.fn(), resumeLimits: vi.fn(),
}))
vi.mock('@/components/analysis/ChartFrame.vue', () => ({ default: { name: 'ChartFrame', props: ['option', 'fileName', 'height'], template: '<div data-test="chart" />' } }))

const { default: LimitsPanel } = await import('@/components/limits/LimitsPanel.vue')

let wrapper: VueWrapper | undefined
afterEach(() => { wrapper?.unmount(); wrapper = undefined; document.body.innerHTML = '' })

describe('LimitsPanel', () => {
  it('opens the newest run and shows the map, the seed and the table with "not reached" where a level is not reached', async () => {
    wrapper = mountWithApp(LimitsPanel, { props: { starId: 1, model: null, canWrite: false, starName: 'Probe' } })
    await settle()
    expect(wrapper.find('[data-test="chart"]').exists()).toBe(true)
    expect(wrapper.text()).toContain('seed 42')
    const rows = wrapper.findAll('[data-test="limits-table"] tbody tr')
    expect(rows).toHaveLength(2)
    expect(rows[1].text()).toContain('not reached')
    expect(wrapper.find('[data-test="limits-start"]').exists()).toBe(false) // reviewers do not start runs
  })

  it('offers the start form to analysts, disabled until the model is fitted', async () => {
    wrapper = mountWithApp(LimitsPanel, { props: { starId: 1, model: null, canWrite: true, starName: 'Probe' } })
    await settle()
    expect(wrapper.find('[data-test="limits-start"]').attributes('disabled')).toBeDefined()
    expect(wrapper.text()).toContain('Fit the selected model first')
  })
})

// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest'
import type { VueWrapper } from '@vue/test-utils'
import type { SamplingEstimate } from '@shared/api/sampling.ts'
import SamplingLauncher from '@/components/sampling/SamplingLauncher.vue'
import { mountWithApp, settle } from '../../mount.ts'

let wrapper: VueWrapper | undefined
afterEach(() => { wrapper?.unmount(); wrapper = undefined; document.body.innerHTML = '' })

function mountLauncher(props: Partial<{ nDim: number; canStart: boolean; estimate: SamplingEstimate }> = {}) {
  wrapper = mountWithApp(SamplingLauncher, { props: { nDim: 12, modelLabel: '2 planets, version 3', canStart: true, ...props } })
  return wrapper
}
const input = (w: VueWrapper, name: string) => w.find(`[data-test="${name}"] input`)

describe('SamplingLauncher: settings of a new run', () => {
  it('starts from sensible defaults: 32 walkers (or twice the parameters), until converged within 100 000 steps, a random seed', async () => {
    let w = mountLauncher()
    expect((input(w, 'walkers').element as HTMLInputElement).value).toBe('32')
    expect((input(w, 'steps').element as HTMLInputElement).value).toBe('100000')
    expect((input(w, 'until-converged').element as HTMLInputElement).checked).toBe(true)
    expect((input(w, 'seed').element as HTMLInputElement).value).toBe('')
    expect(w.find('[data-test="sampling-estimate"]').text()).toContain('stops by itself')
    w.unmount()
    // 17 free parameters (51 Peg's case) → 34 walkers, which the server accepts
    w = mountLauncher({ nDim: 17 })
    expect((input(w, 'walkers').element as HTMLInputElement).value).toBe('34')
  })

  it('shows the server\'s estimate before starting: free parameters, expected steps and time, the budget\'s time', async () => {
    const w = mountLauncher({ nDim: 5, estimate: { nDim: 5, names: ['ln P b', 'ln K b', 'Tc b', 'offset A', 'ln jitter A'], walkers: 32, steps: 100_000, expectedSteps: 4400, seconds: 11.5, maxSeconds: 230 } })
    await settle()
    expect(w.find('[data-test="sampling-free-parameters"]').text()).toContain('5 free parameters (ln P b, ln K b, Tc b, offset A, ln jitter A)')
    const text = w.find('[data-test="sampling-estimate"]').text()
    expect(text).toContain('Expected about 4,400 steps')
    expect(text).toContain('Expected time about 12 s')
    expect(text).toMatch(/At most \d+ min \d+ s for the whole budget/)
  })

  it('emits the settings on start', async () => {
    const w = mountLauncher()
    await input(w, 'walkers').setValue('48')
    await input(w, 'steps').setValue('3000')
    await settle()
    await w.find('form').trigger('submit')
    await input(w, 'seed').setValue('42')
    await input(w, 'until-converged').setValue(false)
    await settle()
    await input(w, 'steps').setValue('300')
    await settle()
    await w.find('form').trigger('submit')
    expect(w.emitted('start')).toEqual([[{ walkers: 48, steps: 3000, untilConverged: true }], [{ walkers: 48, steps: 300, untilConverged: false, seed: 42 }]])
  })

  it('refuses odd walkers, fewer than twice the parameters and steps ≤ 0, and does not start', async () => {
    const w = mountLauncher()
    await input(w, 'walkers').setValue('33')
    await input(w, 'steps').setValue('0')
    await settle()
    expect(w.find('[data-test="walkers"]').text()).toContain('even')
    expect(w.find('[data-test="steps"]').text()).toContain('greater than 0')
    expect(w.find('[data-test="start-sampling"]').attributes('disabled')).toBeDefined()
    await w.find('form').trigger('submit')
    expect(w.emitted('start')).toBeUndefined()
    await input(w, 'walkers').setValue('20')
    await settle()
    expect(w.find('[data-test="walkers"]').text()).toContain('At least 24 walkers')
  })

  it('shows reviewers no start button', async () => {
    const w = mountLauncher({ canStart: false })
    await settle()
    expect(w.find('[data-test="start-sampling"]').exists()).toBe(false)
    expect(w.find('[data-test="sampling-read-only"]').exists()).toBe(true)
    await w.find('form').trigger('submit')
    expect(w.emitted('start')).toBeUndefined()
  })
})

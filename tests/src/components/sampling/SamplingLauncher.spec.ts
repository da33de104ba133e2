// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest'
import type { VueWrapper } from '@vue/test-utils'
import SamplingLauncher from '@/components/sampling/SamplingLauncher.vue'
import { mountWithApp, settle } from '../../mount.ts'

let wrapper: VueWrapper | undefined
afterEach(() => { wrapper?.unmount(); wrapper = undefined; document.body.innerHTML = '' })

function mountLauncher(props: Partial<{ nDim: number; canStart: boolean }> = {}) {
  wrapper = mountWithApp(SamplingLauncher, { props: { nDim: 12, modelLabel: '2 planets, version 3', canStart: true, ...props } })
  return wrapper
}
const input = (w: VueWrapper, name: string) => w.find(`[data-test="${name}"] input`)

describe('SamplingLauncher: settings of a new run', () => {
  it('starts from sensible defaults: 32 walkers (or twice the parameters), 5000 steps, a random seed', async () => {
    let w = mountLauncher()
    expect((input(w, 'walkers').element as HTMLInputElement).value).toBe('32')
    expect((input(w, 'steps').element as HTMLInputElement).value).toBe('5000')
    expect((input(w, 'seed').element as HTMLInputElement).value).toBe('')
    w.unmount()
    w = mountLauncher({ nDim: 20 })
    expect((input(w, 'walkers').element as HTMLInputElement).value).toBe('40')
    expect(w.find('[data-test="sampling-estimate"]').text()).toContain('200,000 walker-steps')
  })

  it('emits the settings on start', async () => {
    const w = mountLauncher()
    await input(w, 'walkers').setValue('48')
    await input(w, 'steps').setValue('300')
    await settle()
    await w.find('form').trigger('submit')
    await input(w, 'seed').setValue('42')
    await settle()
    await w.find('form').trigger('submit')
    expect(w.emitted('start')).toEqual([[{ walkers: 48, steps: 300 }], [{ walkers: 48, steps: 300, seed: 42 }]])
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

// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest'
import type { VueWrapper } from '@vue/test-utils'
import StarForm from '@/components/stars/StarForm.vue'
import { mountWithApp, settle } from '../../mount.ts'

let wrapper: VueWrapper | undefined
afterEach(() => { wrapper?.unmount(); wrapper = undefined; document.body.innerHTML = '' })

async function fill(w: VueWrapper, values: Record<string, string>) {
  for (const [name, value] of Object.entries(values)) await w.find(`input[name="${name}"]`).setValue(value)
}

describe('StarForm', () => {
  it('refuses a mass that is not above zero and a negative mass error, saying why', async () => {
    wrapper = mountWithApp(StarForm)
    await fill(wrapper, { name: 'HD 1', massMsun: '0', massErrMsun: '-0.1' })
    await wrapper.find('form').trigger('submit')
    await settle()
    expect(wrapper.emitted('submit')).toBeUndefined()
    expect(wrapper.text()).toContain('Must be greater than 0')
    expect(wrapper.text()).toContain('Must be 0 or more')
  })

  it('refuses an empty name and text in a number field', async () => {
    wrapper = mountWithApp(StarForm)
    await fill(wrapper, { name: '  ', massMsun: 'heavy', massErrMsun: '0.02' })
    await wrapper.find('form').trigger('submit')
    await settle()
    expect(wrapper.emitted('submit')).toBeUndefined()
    expect(wrapper.text()).toContain('Required')
    expect(wrapper.text()).toContain('Enter a number')
  })

  it('emits clean numbers for a valid star, leaving blank optional fields out', async () => {
    wrapper = mountWithApp(StarForm)
    await fill(wrapper, { name: ' Gliese 9999 ', massMsun: '0.84', massErrMsun: '0.03', teffK: '5200' })
    await wrapper.find('form').trigger('submit')
    await settle()
    const emitted = wrapper.emitted('submit')
    expect(emitted).toHaveLength(1)
    expect(emitted![0]![0]).toEqual({
      name: 'Gliese 9999', massMsun: 0.84, massErrMsun: 0.03, teffK: 5200,
      radiusRsun: undefined, luminosityLsun: undefined, raDeg: undefined, decDeg: undefined, notes: undefined,
    })
  })

  it('shows a server error under the field it names', async () => {
    wrapper = mountWithApp(StarForm, { props: { error: 'A star with this name exists in the team', errorField: 'name' } })
    await settle()
    const nameField = wrapper.find('input[name="name"]').element.closest('.v-input')!
    expect(nameField.textContent).toContain('A star with this name exists in the team')
  })
})

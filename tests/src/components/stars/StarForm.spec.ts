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
    // the messages of the API's own schema (shared/api/stars.ts)
    expect(wrapper.text()).toContain('Mass must be positive')
    expect(wrapper.text()).toContain('Mass uncertainty must not be negative')
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

describe('StarForm astrometry', () => {
  it('refuses a proper motion without coordinates and one beyond the schema\'s bound, with the schema\'s words', async () => {
    wrapper = mountWithApp(StarForm)
    await fill(wrapper, { name: 'Fast', massMsun: '0.2', massErrMsun: '0.01', pmRaMasYr: '100', pmDecMasYr: '30000' })
    await wrapper.find('form').trigger('submit')
    await settle()
    expect(wrapper.emitted('submit')).toBeUndefined()
    expect(wrapper.text()).toContain('A proper motion needs RA and Dec')
    expect(wrapper.text()).toContain('μδ must be within ±20 000 mas/yr')
  })

  it('emits proper motion, the epoch as a Julian date and a site from the table', async () => {
    wrapper = mountWithApp(StarForm, { props: { initial: { defaultSite: { id: 'la-silla', name: 'La Silla', lonDeg: -70.73, latDeg: -29.256667, heightM: 2347 } } } })
    await fill(wrapper, { name: 'Fast', massMsun: '0.16', massErrMsun: '0.01', raDeg: '269.4486', decDeg: '4.7392', pmRaMasYr: '-801.55', pmDecMasYr: '10362.5', epochYear: '2016.0' })
    await wrapper.find('form').trigger('submit')
    await settle()
    const input = wrapper.emitted('submit')![0]![0] as Record<string, unknown>
    expect(input).toMatchObject({ pmRaMasYr: -801.55, pmDecMasYr: 10362.5, coordEpochJd: 2457389.0, raDeg: 269.4486 })
    expect(input.defaultSite).toMatchObject({ id: 'la-silla', lonDeg: -70.73 })
  })

  it('clears a proper motion the star had when the field is emptied', async () => {
    wrapper = mountWithApp(StarForm, { props: { initial: { name: 'S', massMsun: 1, massErrMsun: 0.1, raDeg: 10, decDeg: 10, pmRaMasYr: 5, pmDecMasYr: 6 } } })
    await fill(wrapper, { pmRaMasYr: '', pmDecMasYr: '' })
    await wrapper.find('form').trigger('submit')
    await settle()
    expect(wrapper.emitted('submit')![0]![0]).toMatchObject({ pmRaMasYr: null, pmDecMasYr: null })
  })
})

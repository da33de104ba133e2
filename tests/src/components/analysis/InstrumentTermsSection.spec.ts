// @vitest-environment happy-dom
// Pinned instrument jitters: rows per instrument, "fitted" by default; a pinned value goes into the
// spec's instrumentTerms, checked with the API's schema (a negative jitter is refused with its message).
import { afterEach, describe, expect, it } from 'vitest'
import type { VueWrapper } from '@vue/test-utils'
import InstrumentTermsSection from '@/components/analysis/InstrumentTermsSection.vue'
import { rowsToTerms, termsToRows } from '@/components/analysis/instrument-terms.ts'
import { modelSpecSchema } from '@shared/api/analyses.ts'
import { formToSpec, specToForm } from '@/components/analysis/model-form.ts'
import { mountWithApp, settle } from '../../mount.ts'

let wrapper: VueWrapper | undefined
afterEach(() => { wrapper?.unmount(); wrapper = undefined; document.body.innerHTML = '' })

describe('instrument terms', () => {
  it('turns rows into the spec\'s terms and back, the schema\'s limits and messages included', () => {
    const rows = termsToRows(['Kestrel', 'Osprey'], [{ instrument: 'Osprey', jitter: 2.5 }])
    expect(rows).toEqual([{ instrument: 'Kestrel', pinned: false, jitter: '' }, { instrument: 'Osprey', pinned: true, jitter: '2.5' }])
    const { terms, errors } = rowsToTerms(rows)
    expect(terms).toEqual([{ instrument: 'Osprey', jitter: 2.5 }])
    expect(errors).toEqual({})
    expect(modelSpecSchema.parse({ planets: [], instrumentTerms: terms }).instrumentTerms).toEqual(terms)
    expect(rowsToTerms([{ instrument: 'Kestrel', pinned: true, jitter: '-1' }]).errors.Kestrel).toBe('Jitter must not be negative')
    expect(rowsToTerms([{ instrument: 'Kestrel', pinned: true, jitter: 'abc' }]).errors.Kestrel).toMatch(/number in m\/s/)
    expect(rowsToTerms([{ instrument: 'Kestrel', pinned: false, jitter: '' }]).terms).toBeUndefined()
  })

  it('writes a pinned jitter into the model\'s terms', async () => {
    let terms: unknown
    wrapper = mountWithApp(InstrumentTermsSection, { props: { instruments: ['Kestrel', 'Osprey'], terms: undefined, 'onUpdate:terms': (v: unknown) => { terms = v; void wrapper!.setProps({ terms: v as never }) } } })
    await settle()
    expect(wrapper.find('[data-test="instrument-term-Kestrel"]').text()).toContain('fitted')
    await wrapper.find('[data-test="pin-Osprey"] input').setValue(true)
    await settle()
    await wrapper.find('[data-test="jitter-Osprey"] input').setValue('3.2')
    await settle()
    expect(terms).toEqual([{ instrument: 'Osprey', jitter: 3.2 }])
    await wrapper.find('[data-test="jitter-Osprey"] input').setValue('-4')
    await settle()
    expect(wrapper.find('[data-test="jitter-Osprey"]').text()).toContain('Jitter must not be negative')
  })
  it('goes into the model spec from the form and back (instruments not fitted are left out)', () => {
    const form = specToForm('m', { planets: [], instrumentTerms: [{ instrument: 'Osprey', jitter: 2 }] }, ['Kestrel', 'Osprey'])
    expect(form.instrumentTerms).toEqual([{ instrument: 'Osprey', jitter: 2 }])
    expect(formToSpec(form, ['Kestrel', 'Osprey'])?.instrumentTerms).toEqual([{ instrument: 'Osprey', jitter: 2 }])
    expect(formToSpec({ ...form, instruments: ['Kestrel'] }, ['Kestrel', 'Osprey'])?.instrumentTerms).toBeUndefined()
  })
})

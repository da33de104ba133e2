// @vitest-environment happy-dom
// The noise-model section of the model form: white by default; a GP with the rotation period offered
// from an activity-indicator peak (source named), the API schema's limits and messages, the priors in
// words, and the spec the fit receives.
import { afterEach, describe, expect, it } from 'vitest'
import type { VueWrapper } from '@vue/test-utils'
import { reactive } from 'vue'
import ModelEditor from '@/components/analysis/ModelEditor.vue'
import { type ModelForm } from '@/components/analysis/model-form.ts'
import { noiseToSpec, priorWords, specToNoiseForm, whiteNoiseForm } from '@/components/analysis/noise-form.ts'
import { mountWithApp, settle } from '../../mount.ts'

let wrapper: VueWrapper | undefined
afterEach(() => { wrapper?.unmount(); wrapper = undefined; document.body.innerHTML = '' })

const INSTRUMENTS = ['Kestrel', 'Osprey']
const SUGGESTION = { period: 23.4219, indicator: 'bisector_span', fap: 6e-27 }

function mountEditor(form: ModelForm, suggestion: typeof SUGGESTION | null = SUGGESTION) {
  wrapper = mountWithApp(ModelEditor, { props: { form, instruments: INSTRUMENTS, rotationSuggestion: suggestion } })
  return wrapper
}
const newForm = () => reactive({ name: 'No planet', trend: 'none', instruments: [...INSTRUMENTS], planets: [] }) as ModelForm

describe('noise-form: the GP fields against the API schema', () => {
  it('white noise sends nothing; a GP needs its rotation period and refuses what the server refuses', () => {
    expect(noiseToSpec(whiteNoiseForm()).spec).toEqual({ kind: 'white' })
    const f = whiteNoiseForm()
    f.kind = 'gp'
    expect(noiseToSpec(f).errors['period.value']).toMatch(/Required/)
    f.period.value = '23.4'
    f.decayTime.fixed = true
    f.shape.value = '1.5'
    const e = noiseToSpec(f).errors
    expect(e['decayTime.value']).toBe('give the value to fix it at')
    expect(e['shape.value']).toMatch(/\[0, 1\]/)
    f.decayTime.value = '10'
    expect(noiseToSpec(f).errors['decayTime.value']).toMatch(/half the rotation period/)
    f.decayTime.value = '45'; f.shape.value = '0.3'; f.amplitude.value = '3, 4'; f.amplitude.perInstrument = true
    const ok = noiseToSpec(f)
    expect(ok.errors).toEqual({})
    expect(ok.spec).toMatchObject({ kind: 'gp', kernel: 'rotation', period: { value: 23.4 }, decayTime: { value: 45, fixed: true }, amplitude: { value: [3, 4], perInstrument: true } })
    // back and forth through the stored spec
    expect(noiseToSpec(specToNoiseForm(ok.spec)).spec).toEqual(ok.spec)
    expect(priorWords(f).period).toBe('Gaussian, centre 23.4 d, 1σ 2.34 d')
    expect(priorWords(f).decayTime).toBe('fixed at the value given')
  })
})

describe('NoiseModelSection in the model form', () => {
  it('offers the indicator peak as P_rot, names its source, and puts the GP in the fitted spec', async () => {
    const form = newForm()
    const w = mountEditor(form)
    await settle()
    expect(w.find('[data-test="noise-section"]').exists()).toBe(true)
    form.noise!.kind = 'gp'
    await settle()
    expect(w.find('[data-test="rotation-suggestion"]').text()).toContain("the 'bisector_span' periodogram peak (FAP 6e-27)")
    await w.find('[data-test="use-rotation-suggestion"]').trigger('click')
    await settle()
    expect(form.noise!.period.value).toBe('23.422')
    expect(w.find('[data-test="gp-period"]').text()).toMatch(/Gaussian, centre 23.422 d, 1σ 2.34 d — from the 'bisector_span' periodogram peak/)
    await w.find('form').trigger('submit')
    await settle()
    const [, spec] = w.emitted('fit')![0] as [string, { noise?: unknown }]
    expect(spec.noise).toMatchObject({ kind: 'gp', kernel: 'rotation', period: { value: 23.422, source: "the 'bisector_span' periodogram peak (FAP 6e-27)" } })
  })

  it('without an indicator peak asks for the period, and a bad GP field blocks the fit', async () => {
    const form = newForm()
    const w = mountEditor(form, null)
    await settle()
    form.noise!.kind = 'gp'
    await settle()
    expect(w.find('[data-test="no-rotation-suggestion"]').exists()).toBe(true)
    await w.find('form').trigger('submit')
    await settle()
    expect(w.emitted('fit')).toBeUndefined()
    expect(w.find('[data-test="form-errors"]').exists()).toBe(true)
  })
})

// @vitest-environment happy-dom
import { afterEach, describe, expect, it } from 'vitest'
import type { VueWrapper } from '@vue/test-utils'
import { reactive } from 'vue'
import ModelEditor from '@/components/analysis/ModelEditor.vue'
import { planetForm, type ModelForm } from '@/components/analysis/model-form.ts'
import { mountWithApp, settle } from '../../mount.ts'

let wrapper: VueWrapper | undefined
afterEach(() => { wrapper?.unmount(); wrapper = undefined; document.body.innerHTML = '' })

const INSTRUMENTS = ['Harrier', 'Kestrel']

function makeForm(planets = [planetForm(12.4, 9, 0)]): ModelForm {
  return reactive({ name: '1 planet', trend: 'none', instruments: [...INSTRUMENTS], planets }) as ModelForm
}

function mountEditor(form: ModelForm) {
  wrapper = mountWithApp(ModelEditor, { props: { form, instruments: INSTRUMENTS } })
  return wrapper
}

const input = (w: VueWrapper, testId: string) => w.find(`[data-test="${testId}"] input`)
const row = (w: VueWrapper, i: number, p: string) => w.find(`[data-test="row-${i}-${p}"]`)

async function submit(w: VueWrapper) {
  await w.find('form').trigger('submit')
  await settle()
}

describe('ModelEditor: the parameter form of a fit model', () => {
  it('refuses P ≤ 0, negative K and e outside [0, 0.99), naming each field', async () => {
    const w = mountEditor(makeForm())
    await input(w, 'value-0-period').setValue('0')
    await input(w, 'value-0-K').setValue('-3')
    await input(w, 'value-0-e').setValue('1')
    await submit(w)
    expect(w.emitted('fit')).toBeUndefined()
    expect(row(w, 0, 'period').text()).toContain('P must be greater than 0')
    expect(row(w, 0, 'K').text()).toContain('K must be 0 or more')
    expect(row(w, 0, 'e').text()).toContain('e must be at least 0 and below 0.99')
    expect(w.find('[data-test="form-errors"]').text()).toContain('3 fields need attention')
  })

  it('asks for P and K, reads text as no number, and lets blank e, ω and Tc come from the data', async () => {
    const w = mountEditor(makeForm([planetForm(null, null, null)]))
    await input(w, 'value-0-omegaDeg').setValue('east')
    await submit(w)
    expect(w.emitted('fit')).toBeUndefined()
    expect(row(w, 0, 'period').text()).toContain('Required')
    expect(row(w, 0, 'K').text()).toContain('Required')
    expect(row(w, 0, 'omegaDeg').text()).toContain('Enter a number')
    expect(row(w, 0, 'e').text()).not.toContain('Required')
    expect(row(w, 0, 'phase').text()).not.toContain('Required')
  })

  it('locks a fixed value (read-only, no prior) and asks a fixed blank parameter for a value', async () => {
    const w = mountEditor(makeForm())
    const fixE = w.find('[data-test="fix-0-e"] input')
    await fixE.setValue(true)
    await settle()
    expect(input(w, 'value-0-e').attributes('readonly')).toBeDefined()
    const priorButtons = w.findAll('[data-test="prior-0-e"] button')
    expect(priorButtons).toHaveLength(3)
    for (const b of priorButtons) expect(b.attributes('disabled')).toBeDefined()
    expect(row(w, 0, 'e').text()).toContain('kept at its value')
    expect(input(w, 'value-0-period').attributes('readonly')).toBeUndefined()

    await w.find('[data-test="fix-0-phase"] input').setValue(true)
    await submit(w)
    expect(row(w, 0, 'phase').text()).toContain('A fixed parameter needs a value')
    expect(w.emitted('fit')).toBeUndefined()

    // Unfixing unlocks the value again.
    await w.find('[data-test="fix-0-e"] input').setValue(false)
    await settle()
    expect(input(w, 'value-0-e').attributes('readonly')).toBeUndefined()
  })

  it('asks a Gaussian prior for μ and σ > 0, and a uniform prior for min < max', async () => {
    const w = mountEditor(makeForm())
    await w.find('[data-test="prior-0-K"] [data-test="prior-gaussian"]').trigger('click')
    await settle()
    // μ starts at the value; σ must be given and positive.
    expect((input(w, 'prior-a-0-K').element as HTMLInputElement).value).toBe('9')
    await input(w, 'prior-b-0-K').setValue('0')
    await w.find('[data-test="prior-0-period"] [data-test="prior-uniform"]').trigger('click')
    await settle()
    await input(w, 'prior-a-0-period').setValue('13')
    await input(w, 'prior-b-0-period').setValue('12')
    await submit(w)
    expect(w.emitted('fit')).toBeUndefined()
    expect(row(w, 0, 'K').text()).toContain('σ must be greater than 0')
    expect(row(w, 0, 'period').text()).toContain('max must be larger than min')

    await input(w, 'prior-a-0-K').setValue('')
    await settle()
    expect(row(w, 0, 'K').text()).toContain('Required')
  })

  it('emits the spec the API takes: numbers, fixed parameters, priors, the phase as Tp, all instruments as null', async () => {
    const w = mountEditor(makeForm([planetForm(12.4, 9, 0), planetForm(187, 14, 0)]))
    await input(w, 'value-0-omegaDeg').setValue('40')
    await w.find('[data-test="fix-0-e"] input').setValue(true)
    await w.find('[data-test="prior-1-K"] [data-test="prior-gaussian"]').trigger('click')
    await settle()
    await input(w, 'prior-b-1-K').setValue('3')
    await w.find('[data-test="prior-1-period"] [data-test="prior-uniform"]').trigger('click')
    await settle()
    await input(w, 'prior-a-1-period').setValue('150')
    await input(w, 'prior-b-1-period').setValue('220')
    await w.find('[data-test="phase-kind-1"] button[value="tp"]').trigger('click')
    await input(w, 'value-1-phase').setValue('2458090')
    await w.find('[data-test="fix-1-phase"] input').setValue(true)
    await submit(w)

    const emitted = w.emitted('fit')
    expect(emitted).toHaveLength(1)
    const [name, spec, asNew] = emitted![0]!
    expect(name).toBe('1 planet')
    expect(asNew).toBe(false)
    expect(spec).toEqual({
      planets: [
        { period: 12.4, K: 9, e: 0, omegaDeg: 40, fix: ['e'] },
        {
          period: 187, K: 14, e: 0, tp: 2458090, fix: ['tp'],
          priors: [{ param: 'period', uniform: { min: 150, max: 220 } }, { param: 'K', gaussian: { mu: 14, sigma: 3 } }],
        },
      ],
      trend: 'none',
      instruments: null,
    })
  })

  it('sends a subset of instruments by name and refuses none at all', async () => {
    const form = makeForm()
    const w = mountEditor(form)
    await w.find('[data-test="instrument-Harrier"] input').setValue(false)
    await submit(w)
    expect((w.emitted('fit')![0]![1] as { instruments: string[] }).instruments).toEqual(['Kestrel'])
    await w.find('[data-test="instrument-Kestrel"] input').setValue(false)
    await submit(w)
    expect(w.emitted('fit')).toHaveLength(1)
    expect(w.find('[data-test="instrument-choice"]').text()).toContain('Tick at least one instrument')
  })

  it('adds and removes planets by hand', async () => {
    const form = makeForm()
    const w = mountEditor(form)
    await w.find('[data-test="add-planet-blank"]').trigger('click')
    await settle()
    expect(w.findAll('fieldset.planet')).toHaveLength(2)
    await w.find('[data-test="remove-planet-0"]').trigger('click')
    await settle()
    expect(form.planets).toHaveLength(1)
    expect(w.findAll('fieldset.planet')).toHaveLength(1)
  })
})

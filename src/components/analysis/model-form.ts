// The parameter form of a fit model as plain data, its validation and its translation to and from
// the API's model spec. The components only render this; tests check it through them.
import type {
  FittedPlanet, InstrumentTermSpec, ModelSpec, ModelSpecInput, PlanetParamName, PlanetSpec, PriorSpec, Trend,
} from '@shared/api/analyses.ts'
import { toNumber } from '@/components/app/rules.ts'
import { noiseToSpec, specToNoiseForm, type NoiseForm } from './noise-form.ts'

export type PriorKind = 'none' | 'gaussian' | 'uniform'
/** The parameters a planet row shows: the phase is given as Tc or Tp (one of them). */
export type FormParam = 'period' | 'K' | 'e' | 'omegaDeg' | 'phase'

export interface ParamField {
  /** As typed; blank means "let the fit choose a start" where that is allowed. */
  value: string
  fixed: boolean
  prior: PriorKind
  /** μ (Gaussian) or min (uniform), as typed. */
  a: string
  /** σ (Gaussian) or max (uniform), as typed. */
  b: string
}

export interface PlanetForm {
  /** Stable key for lists (not sent). */
  key: number
  /** Which reference time the phase field holds. */
  phaseKind: 'tc' | 'tp'
  params: Record<FormParam, ParamField>
}

export interface ModelForm {
  name: string
  trend: Trend
  /** Instruments fitted; all of the star's when every one is ticked. */
  instruments: string[]
  planets: PlanetForm[]
  /** Noise model (absent: white noise); NoiseModelSection.vue edits it. */
  noise?: NoiseForm
  /** Pinned instrument jitters (absent: all fitted); InstrumentTermsSection.vue edits them. */
  instrumentTerms?: InstrumentTermSpec[]
}

/** Highest eccentricity the fitter accepts (the API's limit). */
export const E_LIMIT = 0.99

export const PARAM_LABELS: Record<FormParam, { label: string; unit: string }> = {
  period: { label: 'P', unit: 'd' },
  K: { label: 'K', unit: 'm/s' },
  e: { label: 'e', unit: '' },
  omegaDeg: { label: 'ω', unit: '°' },
  phase: { label: 'T', unit: 'JD' },
}
export const FORM_PARAMS: FormParam[] = ['period', 'K', 'e', 'omegaDeg', 'phase']

let nextKey = 1

export function emptyField(value = ''): ParamField {
  return { value, fixed: false, prior: 'none', a: '', b: '' }
}

/** A new planet row at a period (days) with a start K (m/s) and e = 0; ω and the phase left to the data. */
export function planetForm(period: number | null, K: number | null, e: number | null = 0): PlanetForm {
  return {
    key: nextKey++,
    phaseKind: 'tc',
    params: {
      period: emptyField(period === null ? '' : formatNumber(period, 6)),
      K: emptyField(K === null ? '' : formatNumber(K, 4)),
      e: emptyField(e === null ? '' : formatNumber(e, 3)),
      omegaDeg: emptyField(),
      phase: emptyField(),
    },
  }
}

/** A planet row started from a fitted planet (its values become the next fit's start). */
export function planetFormFromFit(p: FittedPlanet): PlanetForm {
  const form = planetForm(p.period, p.K, p.e)
  form.params.omegaDeg.value = formatNumber(p.omegaDeg, 5)
  form.params.phase.value = formatNumber(p.tc, 10)
  return form
}

/** Short decimal text of a number: `digits` significant figures, no exponent for ordinary sizes. */
export function formatNumber(x: number, digits: number): string {
  if (!Number.isFinite(x)) return ''
  if (x === 0) return '0'
  const magnitude = Math.floor(Math.log10(Math.abs(x)))
  const decimals = Math.max(0, digits - 1 - magnitude)
  return String(Number(x.toFixed(Math.min(decimals, 12))))
}

function paramName(form: PlanetForm, p: FormParam): PlanetParamName {
  return p === 'phase' ? form.phaseKind : p
}

/** Why the value of one parameter cannot be used (null when it can). */
export function valueError(form: PlanetForm, p: FormParam): string | null {
  const field = form.params[p]
  const n = toNumber(field.value)
  if (n === null) {
    if (p === 'period' || p === 'K') return 'Required'
    if (field.fixed) return 'A fixed parameter needs a value'
    return null
  }
  if (!Number.isFinite(n)) return 'Enter a number'
  if (p === 'period' && !(n > 0)) return 'P must be greater than 0'
  if (p === 'K' && !(n >= 0)) return 'K must be 0 or more'
  if (p === 'e' && !(n >= 0 && n < E_LIMIT)) return `e must be at least 0 and below ${E_LIMIT}`
  return null
}

/** Why the prior's first and second number cannot be used. */
export function priorErrors(form: PlanetForm, p: FormParam): { a: string | null; b: string | null } {
  const field = form.params[p]
  if (field.prior === 'none' || field.fixed) return { a: null, b: null }
  const a = toNumber(field.a)
  const b = toNumber(field.b)
  const number = (x: number | null) => (x === null ? 'Required' : Number.isFinite(x) ? null : 'Enter a number')
  if (field.prior === 'gaussian') {
    const sigma = number(b) ?? (b! > 0 ? null : 'σ must be greater than 0')
    return { a: number(a), b: sigma }
  }
  const aError = number(a)
  const bError = number(b) ?? (aError === null && !(a! < b!) ? 'max must be larger than min' : null)
  return { a: aError, b: bError }
}

export interface FormErrors {
  /** `planets.0.period`, `planets.0.period.prior.b`, `name` … → message. */
  byField: Record<string, string>
  count: number
}

export function formErrors(form: ModelForm): FormErrors {
  const byField: Record<string, string> = {}
  if (!form.name.trim()) byField.name = 'Required'
  if (form.instruments.length === 0) byField.instruments = 'Tick at least one instrument'
  if (form.planets.length > 8) byField.planets = 'At most 8 planets'
  form.planets.forEach((planet, i) => {
    for (const p of FORM_PARAMS) {
      const v = valueError(planet, p)
      if (v) byField[`planets.${i}.${p}`] = v
      const pr = priorErrors(planet, p)
      if (pr.a) byField[`planets.${i}.${p}.prior.a`] = pr.a
      if (pr.b) byField[`planets.${i}.${p}.prior.b`] = pr.b
    }
  })
  if (form.noise) for (const [k, v] of Object.entries(noiseToSpec(form.noise).errors)) byField[`noise.${k}`] = v
  return { byField, count: Object.keys(byField).length }
}

/**
 * The spec the API takes, or null while the form has errors. Blank optional values are left out
 * (the server chooses them from the data); every instrument ticked is sent as null (= all).
 */
export function formToSpec(form: ModelForm, allInstruments: string[]): ModelSpecInput | null {
  if (formErrors(form).count > 0) return null
  const planets: PlanetSpec[] = form.planets.map((planet) => {
    const spec: PlanetSpec = {
      period: toNumber(planet.params.period.value)!,
      K: toNumber(planet.params.K.value)!,
    }
    const fix: PlanetParamName[] = []
    const priors: PriorSpec[] = []
    for (const p of FORM_PARAMS) {
      const field = planet.params[p]
      const name = paramName(planet, p)
      const n = toNumber(field.value)
      if (p === 'e' && n !== null) spec.e = n
      if (p === 'omegaDeg' && n !== null) spec.omegaDeg = n
      if (p === 'phase' && n !== null) spec[planet.phaseKind] = n
      if (field.fixed) fix.push(name)
      else if (field.prior === 'gaussian') priors.push({ param: name, gaussian: { mu: toNumber(field.a)!, sigma: toNumber(field.b)! } })
      else if (field.prior === 'uniform') priors.push({ param: name, uniform: { min: toNumber(field.a)!, max: toNumber(field.b)! } })
    }
    if (fix.length) spec.fix = fix
    if (priors.length) spec.priors = priors
    return spec
  })
  const every = allInstruments.length > 0 && allInstruments.every((name) => form.instruments.includes(name))
  const noise = form.noise?.kind === 'gp' ? { noise: noiseToSpec(form.noise).spec } : {}
  const terms = form.instrumentTerms?.filter((t) => form.instruments.includes(t.instrument))
  return { planets, trend: form.trend, instruments: every ? null : [...form.instruments].sort(), ...noise, ...(terms?.length ? { instrumentTerms: terms } : {}) }
}

/** The form for a stored spec (e.g. to edit a saved model). */
export function specToForm(name: string, spec: ModelSpec | ModelSpecInput, allInstruments: string[]): ModelForm {
  return {
    name,
    trend: spec.trend ?? 'none',
    instruments: spec.instruments ? [...spec.instruments] : [...allInstruments],
    noise: specToNoiseForm(spec.noise),
    ...(spec.instrumentTerms?.length ? { instrumentTerms: spec.instrumentTerms.map((t) => ({ ...t })) } : {}),
    planets: spec.planets.map((p) => {
      const form = planetForm(p.period, p.K ?? null, p.e ?? null)
      if (p.omegaDeg !== undefined) form.params.omegaDeg.value = String(p.omegaDeg)
      if (p.tc !== undefined) form.params.phase.value = String(p.tc)
      else if (p.tp !== undefined) { form.phaseKind = 'tp'; form.params.phase.value = String(p.tp) }
      for (const name of p.fix ?? []) {
        const key: FormParam = name === 'tc' || name === 'tp' ? 'phase' : name
        form.params[key].fixed = true
      }
      for (const prior of p.priors ?? []) {
        const key: FormParam = prior.param === 'tc' || prior.param === 'tp' ? 'phase' : prior.param
        const field = form.params[key]
        if (prior.gaussian) { field.prior = 'gaussian'; field.a = String(prior.gaussian.mu); field.b = String(prior.gaussian.sigma) }
        else if (prior.uniform) { field.prior = 'uniform'; field.a = String(prior.uniform.min); field.b = String(prior.uniform.max) }
      }
      return form
    }),
  }
}

/** The name a model gets from its planet count, e.g. "2 planets". */
export function defaultModelName(planets: number, trend: Trend): string {
  const base = planets === 0 ? 'No planet' : planets === 1 ? '1 planet' : `${planets} planets`
  return trend === 'none' ? base : `${base} + ${trend} trend`
}

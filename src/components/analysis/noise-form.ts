// The noise-model part of the model form as plain data: white noise or a GP with its hyperparameters
// (each fixed or free), checked by the API's own zod schema (the same limits and messages as the
// server), and the priors each hyperparameter gets, in words (as `shared/rv/gp-fit.ts` applies them).
import type { z } from 'zod'
import { gpNoiseSchema, type GpKernelName, type NoiseModelSpec, type noiseModelSchema } from '@shared/api/analyses.ts'
import { toNumber } from '@/components/app/rules.ts'

export interface HyperField { value: string; fixed: boolean }

export interface NoiseForm {
  kind: 'white' | 'gp'
  kernel: GpKernelName
  /** Rotation period (d): prior centre, its 1σ (blank: 10 %), where the value came from. */
  period: HyperField & { sigma: string; source: string }
  decayTime: HyperField
  shape: HyperField
  /** One amplitude (m/s) for every instrument, or one per instrument. */
  amplitude: HyperField & { perInstrument: boolean }
}

/** A strongest significant activity-indicator peak, offered as the rotation period. */
export interface RotationSuggestion { period: number; indicator: string; fap: number }

export function whiteNoiseForm(): NoiseForm {
  return {
    kind: 'white', kernel: 'rotation',
    period: { value: '', fixed: false, sigma: '', source: '' },
    decayTime: { value: '', fixed: false }, shape: { value: '', fixed: false }, amplitude: { value: '', fixed: false, perInstrument: false },
  }
}

const fmtFap = (f: number): string => (f < 1e-3 ? f.toExponential(0) : f.toPrecision(2))
export const suggestionSource = (s: RotationSuggestion): string => `the '${s.indicator}' periodogram peak (FAP ${fmtFap(s.fap)})`

/** Fills the rotation period from an indicator peak (and names it as the source). */
export function applySuggestion(form: NoiseForm, s: RotationSuggestion): void {
  form.period.value = String(Number(s.period.toPrecision(5)))
  form.period.source = suggestionSource(s)
}

/** The spec's noise model, or a list of field → message from the API's schema. */
export function noiseToSpec(form: NoiseForm): { spec: NoiseModelSpec; errors: Record<string, string> } {
  if (form.kind === 'white') return { spec: { kind: 'white' }, errors: {} }
  const errors: Record<string, string> = {}
  const num = (field: string, text: string): number | undefined => {
    const n = toNumber(text)
    if (n === null) return undefined
    if (!Number.isFinite(n)) { errors[field] = 'Enter a number'; return undefined }
    return n
  }
  const amp = form.amplitude.value.split(/[,\s]+/).filter(Boolean).map((x, k) => num(`amplitude.value.${k}`, x)).filter((x): x is number => x !== undefined)
  const raw = {
    kind: 'gp' as const, kernel: form.kernel,
    period: {
      value: num('period.value', form.period.value), sigma: num('period.sigma', form.period.sigma), fixed: form.period.fixed || undefined,
      source: form.period.source.trim() || undefined,
    },
    decayTime: { value: num('decayTime.value', form.decayTime.value), fixed: form.decayTime.fixed || undefined },
    shape: { value: num('shape.value', form.shape.value), fixed: form.shape.fixed || undefined },
    amplitude: { value: amp.length ? amp : undefined, fixed: form.amplitude.fixed || undefined, perInstrument: form.amplitude.perInstrument || undefined },
  }
  if (raw.period.value === undefined && !errors['period.value']) errors['period.value'] = 'Required: the rotation period the GP is tied to'
  const parsed = gpNoiseSchema.safeParse(raw)
  if (!parsed.success) for (const issue of parsed.error.issues) errors[issue.path.join('.')] ??= issue.message
  const d = raw.decayTime.value, p = raw.period.value
  if (d !== undefined && p !== undefined && !(d > p / 2)) errors['decayTime.value'] ??= `must exceed half the rotation period (${p / 2} d)`
  return { spec: (parsed.success ? parsed.data : { kind: 'white' }) as NoiseModelSpec, errors }
}

export function specToNoiseForm(noise: NoiseModelSpec | z.input<typeof noiseModelSchema> | undefined): NoiseForm {
  const form = whiteNoiseForm()
  if (!noise || noise.kind === 'white') return form
  const s = (v: number | undefined) => (v === undefined ? '' : String(v))
  form.kind = 'gp'
  form.kernel = noise.kernel ?? 'rotation'
  form.period = { value: s(noise.period.value), sigma: s(noise.period.sigma), fixed: !!noise.period.fixed, source: noise.period.source ?? '' }
  form.decayTime = { value: s(noise.decayTime?.value), fixed: !!noise.decayTime?.fixed }
  form.shape = { value: s(noise.shape?.value), fixed: !!noise.shape?.fixed }
  form.amplitude = { value: (noise.amplitude?.value ?? []).join(', '), fixed: !!noise.amplitude?.fixed, perInstrument: !!noise.amplitude?.perInstrument }
  return form
}

/** The prior each hyperparameter gets, in words (the fitter's, `shared/rv/gp-fit.ts`). */
export function priorWords(form: NoiseForm): Record<'period' | 'decayTime' | 'shape' | 'amplitude', string> {
  const p = toNumber(form.period.value)
  const sigma = toNumber(form.period.sigma) ?? (p !== null ? 0.1 * p : null)
  return {
    period: form.period.fixed ? 'fixed at the value given'
      : p !== null && sigma !== null ? `Gaussian, centre ${p} d, 1σ ${Number(sigma.toPrecision(3))} d` : 'Gaussian around the value given (1σ 10 % unless set)',
    decayTime: form.decayTime.fixed ? 'fixed at the value given' : 'flat in ln between half the rotation period and 10 × the data\'s baseline',
    shape: form.shape.fixed ? 'fixed at the value given' : form.kernel === 'rotation' ? 'flat on [0, 1] (share of the half-period harmonic)' : 'Γ flat in ln on [0.05, 20]',
    amplitude: form.amplitude.fixed ? 'fixed at the value(s) given' : 'flat in ln on [0.01, 1000] m/s',
  }
}

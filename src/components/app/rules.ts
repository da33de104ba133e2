// Validation rules for Vuetify inputs: each returns true or the message shown under the field.

export type Rule = (value: unknown) => true | string

export const required: Rule = (v) => (v !== null && v !== undefined && String(v).trim() !== '') || 'Required'

export const email: Rule = (v) => /^[^\s@]+@[^\s@]+\.[^\s@]+$/.test(String(v ?? '')) || 'Enter an e-mail address'

export const MIN_PASSWORD = 10
export const passwordRules: Rule[] = [
  required,
  (v) => String(v ?? '').length >= MIN_PASSWORD || `At least ${MIN_PASSWORD} characters`,
]

/** Parses a form field as a number; empty gives null, garbage gives NaN. */
export function toNumber(value: unknown): number | null {
  if (value === null || value === undefined || String(value).trim() === '') return null
  return Number(String(value).trim())
}

export const number: Rule = (v) => {
  const n = toNumber(v)
  return n === null || Number.isFinite(n) || 'Enter a number'
}
export const positive: Rule = (v) => {
  const n = toNumber(v)
  return n === null || (Number.isFinite(n) && n > 0) || 'Must be greater than 0'
}
export const nonNegative: Rule = (v) => {
  const n = toNumber(v)
  return n === null || (Number.isFinite(n) && n >= 0) || 'Must be 0 or more'
}
export const between = (lo: number, hi: number): Rule => (v) => {
  const n = toNumber(v)
  return n === null || (Number.isFinite(n) && n >= lo && n <= hi) || `Must be between ${lo} and ${hi}`
}

// Validation rules for Vuetify inputs: each returns true or the message shown under the field.
// Limits and messages come from the shared zod schemas the server checks with (shared/api).
import type { ZodTypeAny } from 'zod'
import { emailSchema, passwordSchema } from '@shared/api/auth.ts'
import { weakPasswordReason } from '@shared/api/password.ts'

export type Rule = (value: unknown) => true | string

export const required: Rule = (v) => (v !== null && v !== undefined && String(v).trim() !== '') || 'Required'

/** A rule for a text field checked by a shared zod schema: the schema's own message, after the label. */
export function textSchemaRule(schema: ZodTypeAny, label: string): Rule {
  return (v) => {
    const r = schema.safeParse(String(v ?? ''))
    return r.success || `${label} ${r.error.issues[0]?.message ?? 'is not valid'}`
  }
}

export const email: Rule = textSchemaRule(emailSchema, 'E-mail')

export const passwordRules: Rule[] = [
  required,
  textSchemaRule(passwordSchema, 'Password'),
  (v) => { const why = weakPasswordReason(String(v ?? '')); return why === null || `Password ${why}` },
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

/** A Vuetify rule for a numeric field checked by the shared zod schema (the server runs the same check). */
export function schemaRule(schema: ZodTypeAny, label: string): Rule {
  return (v) => {
    const n = toNumber(v)
    if (n === null) return true
    if (!Number.isFinite(n)) return 'Enter a number'
    const r = schema.safeParse(n)
    return r.success || `${label} ${r.error.issues[0]?.message ?? 'is not valid'}`
  }
}

// The form rules take their limits and messages from the shared schemas the server checks with.
import { describe, expect, it } from 'vitest'
import { email, passwordRules, schemaRule } from '@/components/app/rules.ts'
import { passwordSchema } from '@shared/api/auth.ts'
import { starObjectSchema } from '@shared/api/stars.ts'

const check = (rules: Array<(v: unknown) => true | string>, v: unknown) => rules.map((r) => r(v)).find((x) => x !== true) ?? true

describe('form rules from the shared schemas', () => {
  it('passwords: the schema\'s length and the common-password policy, as the server says them', () => {
    expect(check(passwordRules, 'short')).toBe('Password must be at least 10 characters')
    expect(passwordSchema.safeParse('short').success).toBe(false)
    expect(check(passwordRules, 'password12')).toMatch(/^Password is one of the most common passwords/)
    expect(check(passwordRules, 'copper kettle lantern')).toBe(true)
    expect(check(passwordRules, 'x'.repeat(201))).toBe('Password must be at most 200 characters')
  })
  it('e-mail: the schema, with surrounding spaces allowed as the server normalises them', () => {
    expect(email(' Nadia@Lanternfield.test ')).toBe(true)
    expect(email('nadia@')).toBe('E-mail must be an e-mail address')
  })
  it('numbers: the schema\'s bounds; empty is left to `required`', () => {
    const mass = schemaRule(starObjectSchema.shape.massMsun, 'Mass')
    expect(mass('')).toBe(true)
    expect(mass('abc')).toBe('Enter a number')
    expect(mass('-1')).toMatch(/^Mass /)
    expect(mass('1.1')).toBe(true)
  })
})

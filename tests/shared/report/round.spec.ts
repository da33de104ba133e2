// Rounding by uncertainty: worked examples of the Particle Data Group rule (PDG, Review of Particle
// Physics, "Introduction", §5.3; common practice). Each case is worked by hand beside it.
import { describe, expect, it } from 'vitest'
import { errorPlace, formatPlain, roundAsymmetric, roundByUncertainty } from '../../../shared/report/round.ts'

describe('roundByUncertainty (PDG rule)', () => {
  const cases: Array<[number, number, string, string, string]> = [
    // value, error, printed value, printed error, why
    [1.23456, 0.0123, '1.235', '0.012', 'error digits 123 ≤ 354: two significant digits'],
    [380.8612, 0.082, '380.86', '0.08', 'error digits 820 in 355–949: one significant digit'],
    [100.37, 0.39, '100.4', '0.4', 'error digits 390: one significant digit'],
    [12345, 678, '12300', '700', 'error digits 678: one significant digit, hundreds place'],
    [5.4321, 0.097, '5.43', '0.10', 'error digits 970 ≥ 950: up to 0.100, two significant digits'],
    [0.5, 0.354, '0.50', '0.35', '354 is the last two-digit case'],
    [0.5, 0.355, '0.5', '0.4', '355 is the first one-digit case'],
    [2459123.456789, 0.00123, '2459123.4568', '0.0012', 'a Tc in full JD'],
    [-3.21, 1.5, '-3.2', '1.5', 'negative value, error digits 150'],
    [57.0, 9.96, '57', '10', 'error 9.96: 996 → 10, two digits at the units place'],
    [0.001, 0.2, '0.00', '0.20', 'value smaller than the last kept place prints as zero, no minus sign'],
    [4.2, 1, '4.2', '1.0', 'error exactly 1: digits 100, two significant digits'],
  ]
  for (const [v, e, pv, pe, why] of cases) {
    it(`${v} ± ${e} → ${pv} ± ${pe} (${why})`, () => {
      const r = roundByUncertainty(v, e)
      expect([r.value, r.error]).toEqual([pv, pe])
    })
  }
  it('reports the decimal place and the digits kept', () => {
    expect(errorPlace(0.0123)).toEqual({ place: -3, mantissa: 12, digits: 2 })
    expect(errorPlace(678)).toEqual({ place: 2, mantissa: 7, digits: 1 })
    expect(errorPlace(0.097)).toEqual({ place: -2, mantissa: 10, digits: 2 })
  })
  it('throws naming the parameter for a zero, negative or non-finite error', () => {
    expect(() => roundByUncertainty(1, 0)).toThrow(/err/)
    expect(() => roundByUncertainty(1, -1)).toThrow(/err/)
    expect(() => roundByUncertainty(1, Number.NaN)).toThrow(/err/)
    expect(() => roundByUncertainty(Number.POSITIVE_INFINITY, 1)).toThrow(/value/)
  })
})

describe('roundAsymmetric', () => {
  it('rounds both sides at the place the smaller side needs', () => {
    // smaller side 0.12 → digits 120 → two digits, place −2; 0.35 kept at that place
    expect(roundAsymmetric(0.1234, 0.35, 0.12)).toEqual({ value: '0.12', plus: '0.35', minus: '0.12', place: -2 })
    // smaller side 0.6 → one digit, place −1; 2.44 → 2.4
    expect(roundAsymmetric(10.06, 0.6, 2.44)).toEqual({ value: '10.1', plus: '0.6', minus: '2.4', place: -1 })
  })
  it('never prints a side as zero', () => {
    expect(roundAsymmetric(1, 0.0123, 0.0004).plus).toBe('0.0123')
  })
  it('throws naming the side', () => {
    expect(() => roundAsymmetric(1, 0, 1)).toThrow(/plus/)
    expect(() => roundAsymmetric(1, 1, -1)).toThrow(/minus/)
  })
})

describe('formatPlain', () => {
  it('keeps six significant digits and drops trailing zeros', () => {
    expect(formatPlain(0.25)).toBe('0.25')
    expect(formatPlain(2459123.456789)).toBe('2459120')
    expect(formatPlain(3.14159265)).toBe('3.14159')
    expect(formatPlain(0)).toBe('0')
  })
})

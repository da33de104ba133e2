import { describe, it, expect } from 'vitest'
import { readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { expectClose } from '../../helpers/expect-close.ts'
import { correlate, averageRanks, incompleteBeta, correlationPValue } from '../../../shared/rv/index.ts'

// Reference: fixtures/activity/correlation.json, written by scripts/reference/correlation_reference.py
// with scipy.stats.pearsonr and scipy.stats.spearmanr (two-sided p-values).
const ref = JSON.parse(readFileSync(fileURLToPath(new URL('../../../fixtures/activity/correlation.json', import.meta.url)), 'utf8'))

describe('correlation against scipy.stats pearsonr and spearmanr', () => {
  for (const c of ref.cases as Array<{ name: string; x: number[]; y: number[]; pearson: { r: number; p: number }; spearman: { rho: number; p: number } }>) {
    it(`gives scipy's coefficients and p-values (${c.name})`, () => {
      const got = correlate(c.x, c.y)
      expect(got.n).toBe(c.x.length)
      expectClose(got.pearson, c.pearson.r, { rtol: 1e-12, atol: 1e-15 }, 'r')
      expectClose(got.pearsonP, c.pearson.p, { rtol: 1e-9 }, 'Pearson p')
      expectClose(got.spearman, c.spearman.rho, { rtol: 1e-12, atol: 1e-15 }, 'ρ')
      expectClose(got.spearmanP, c.spearman.p, { rtol: 1e-9 }, 'Spearman p')
    })
  }
})

describe('correlation helpers', () => {
  it('average ranks share tied places', () => {
    expect(Array.from(averageRanks([10, 20, 20, 5, 20]))).toEqual([2, 4, 4, 1, 4])
  })

  it('incomplete beta has its closed forms: I_x(1, 1) = x, I_x(a, 1) = x^a, symmetry', () => {
    expectClose(incompleteBeta(0.3, 1, 1), 0.3, { rtol: 1e-14 })
    expectClose(incompleteBeta(0.7, 2.5, 1), 0.7 ** 2.5, { rtol: 1e-14 })
    expectClose(incompleteBeta(0.2, 3, 4.5) + incompleteBeta(0.8, 4.5, 3), 1, { rtol: 1e-14 })
  })

  it('p is 1 at r = 0 and 0 at |r| = 1', () => {
    expectClose(correlationPValue(0, 20), 1, { rtol: 1e-14 })
    expect(correlationPValue(-1, 20)).toBe(0)
  })

  it('skips non-finite pairs and says why a value cannot be measured', () => {
    const got = correlate([1, 2, NaN, 4, 5], [2, 4, 6, Infinity, 10])
    expect(got.n).toBe(3)
    expectClose(got.pearson, 1, { rtol: 1e-14 })
    expect(correlate([1, 1, 1, 1], [1, 2, 3, 4]).note).toMatch(/constant/)
    expect(correlate([1, 2], [1, 2]).note).toMatch(/at least 3/)
    expect(() => correlate([1, 2, 3], [1, 2])).toThrow(/y has 2/)
  })
})

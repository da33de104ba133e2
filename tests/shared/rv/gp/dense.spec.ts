import { describe, it, expect } from 'vitest'
import { expectClose } from '../../../helpers/expect-close.ts'
import { createRandom } from '../../../../shared/math/random.ts'
import { choleskyInPlace, choleskyRowByRow } from '../../../../shared/rv/gp/dense.ts'
import { denseCovariance, quasiPeriodic } from '../../../../shared/rv/index.ts'

describe('dense Cholesky: four-rows-at-a-time form against the plain row-by-row reference', () => {
  for (const n of [1, 3, 4, 7, 64, 101]) {
    it(`gives the same factor (n = ${n})`, () => {
      const rng = createRandom(n)
      const t = Float64Array.from({ length: n }, () => 300 * rng.next())
      const c = denseCovariance(t, new Float64Array(n).fill(4), Float64Array.from(t, () => 1 + rng.next()), (x) => quasiPeriodic(x, { kind: 'quasi-periodic', period: 23.5, decayTime: 40, roughness: 1.3 }))
      const a = Float64Array.from(c), b = Float64Array.from(c)
      expect(choleskyInPlace(a, n)).toBe(true)
      expect(choleskyRowByRow(b, n)).toBe(true)
      for (let i = 0; i < n; i++) expectClose(a.subarray(i * n, i * n + i + 1), b.subarray(i * n, i * n + i + 1), { rtol: 1e-12, atol: 1e-12 }, `row ${i}`)
    })
  }

  it('reports a matrix that is not positive definite', () => {
    const a = Float64Array.from([1, 2, 2, 1])
    expect(choleskyInPlace(a, 2)).toBe(false)
    const big = new Float64Array(25).fill(1)
    expect(choleskyInPlace(big, 5)).toBe(false)
  })
})

import { describe, it, expect } from 'vitest'
import { expectClose } from '../../../helpers/expect-close.ts'
import { createRandom } from '../../../../shared/math/random.ts'
import { choleskyInPlace, choleskyRowByRow, choleskyTiled, WASM_MIN_N } from '../../../../shared/rv/gp/dense.ts'
import { choleskyWasm, wasmCholeskyAvailable, wasmMatrix } from '../../../../shared/rv/gp/dense-wasm.ts'
import { denseCovariance, quasiPeriodic } from '../../../../shared/rv/index.ts'

/** A quasi-periodic covariance on n random times (row-major, both triangles). */
function covariance(n: number): Float64Array {
  const rng = createRandom(n)
  const t = Float64Array.from({ length: n }, () => 300 * rng.next())
  return denseCovariance(t, new Float64Array(n).fill(4), Float64Array.from(t, () => 1 + rng.next()), (x) => quasiPeriodic(x, { kind: 'quasi-periodic', period: 23.5, decayTime: 40, roughness: 1.3 }))
}

function expectSameFactor(a: Float64Array, b: Float64Array, n: number, label: string): void {
  for (let i = 0; i < n; i++) expectClose(a.subarray(i * n, i * n + i + 1), b.subarray(i * n, i * n + i + 1), { rtol: 1e-12, atol: 1e-12 }, `${label} row ${i}`)
}

describe('dense Cholesky: the fast forms against the plain row-by-row reference', () => {
  it('has the WebAssembly kernel in Node (so the fast path is the one tested here)', () => {
    expect(wasmCholeskyAvailable()).toBe(true)
  })

  for (const n of [1, 3, 4, 7, 64, 101, 203]) {
    it(`gives the same factor (n = ${n})`, () => {
      const c = covariance(n)
      const ref = Float64Array.from(c)
      expect(choleskyRowByRow(ref, n)).toBe(true)
      const tiled = Float64Array.from(c)
      expect(choleskyTiled(tiled, n)).toBe(true)
      expectSameFactor(tiled, ref, n, 'tiled')
      // panel widths: the default, and a narrow one so several panels, solves and updates run
      for (const nb of [undefined, 8, 12]) {
        const w = Float64Array.from(c)
        expect(choleskyWasm(w, n, nb)).toBe(true)
        expectSameFactor(w, ref, n, `wasm nb=${nb ?? 'default'}`)
        for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) if (w[i * n + j] !== c[i * n + j]) expect.fail(`upper triangle changed at ${i},${j}`)
      }
      const d = Float64Array.from(c)
      expect(choleskyInPlace(d, n)).toBe(true)
      expectSameFactor(d, ref, n, 'choleskyInPlace')
    })
  }

  it('factors a matrix filled in the kernel\'s own memory where it lies (wasmMatrix), the same factor', () => {
    expect(wasmMatrix(6)).toBeNull() // not a multiple of 4: the caller keeps its own array
    for (const n of [8, 64, 100, 204]) {
      const c = covariance(n)
      const ref = Float64Array.from(c)
      expect(choleskyRowByRow(ref, n)).toBe(true)
      const m = wasmMatrix(n)
      if (!m) return expect.fail('no view')
      expect(m.length).toBe(n * n)
      m.set(c)
      expect(choleskyInPlace(m, n)).toBe(true)
      expectSameFactor(m, ref, n, `in kernel memory, n = ${n}`)
      m.set(c)
      expect(choleskyWasm(m, n, 8)).toBe(true)
      expectSameFactor(m, ref, n, `in kernel memory, n = ${n}, nb = 8`)
    }
    // the copied path (through the same memory, so the view's content is gone after it) gives the same factor
    const n = 100
    const m = wasmMatrix(n)
    if (!m) return expect.fail('no view')
    m.set(covariance(n))
    expect(choleskyWasm(m, n)).toBe(true)
    const kept = Float64Array.from(m)
    const other = covariance(n)
    expect(choleskyWasm(other, n)).toBe(true)
    expectSameFactor(other, kept, n, 'the copied path after the view')
    const bad = wasmMatrix(n)
    if (!bad) return expect.fail('no view')
    bad.set(covariance(n))
    bad[50 * n + 50] = -1
    expect(choleskyInPlace(bad, n)).toBe(false)
  })

  it('reports a matrix that is not positive definite', () => {
    const a = Float64Array.from([1, 2, 2, 1])
    expect(choleskyInPlace(a, 2)).toBe(false)
    const big = new Float64Array(25).fill(1)
    expect(choleskyInPlace(big, 5)).toBe(false)
    expect(choleskyTiled(new Float64Array(25).fill(1), 5)).toBe(false)
    // the WebAssembly path: a rank-one block past the first panel, and a NaN
    const n = WASM_MIN_N + 21
    const c = covariance(n)
    for (let i = n - 9; i < n; i++) for (let j = n - 9; j < n; j++) c[i * n + j] = 50
    const before = Float64Array.from(c)
    expect(choleskyWasm(c, n, 8)).toBe(false)
    expect(c).toEqual(before)
    expect(choleskyInPlace(c, n)).toBe(false)
    const nan = covariance(n)
    nan[40 * n + 3] = NaN
    expect(choleskyWasm(nan, n)).toBe(false)
  })
})

describe('dense covariance', () => {
  it('is symmetric, element by element the kernel times the amplitudes, plus the noise on the diagonal', () => {
    const n = 77
    const rng = createRandom(5)
    const t = Float64Array.from({ length: n }, () => 100 * rng.next())
    const s = Float64Array.from(t, () => 1 + rng.next()), nv = Float64Array.from(t, () => 0.5 + rng.next())
    const kappa = (x: number): number => quasiPeriodic(x, { kind: 'quasi-periodic', period: 11, decayTime: 20, roughness: 0.8 })
    const c = denseCovariance(t, s, nv, kappa)
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        const want = s[i] * s[j] * kappa(t[i] - t[j]) + (i === j ? nv[i] : 0)
        if (c[i * n + j] !== c[j * n + i] || Math.abs(c[i * n + j] - want) > 1e-15 * Math.abs(want) + 1e-300) expect.fail(`C[${i}, ${j}] = ${c[i * n + j]}, want ${want}`)
      }
    }
  })
})

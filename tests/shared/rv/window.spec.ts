import { describe, it, expect } from 'vitest'
import { expectClose } from '../../helpers/expect-close.ts'
import { createRandom } from '../../../shared/math/random.ts'
import { windowFunction, windowPowerAt } from '../../../shared/rv/periodogram.ts'

// Spectral window |W(f)|² = |Σ e^{2πift}|²/N² (Dawson & Fabrycky 2010, ApJ 722, 937, eq. 1).
function nightly(n: number, nights: number, seed: number): Float64Array {
  const r = createRandom(seed)
  const t = new Float64Array(n)
  for (let i = 0; i < n; i++) t[i] = 2456000 + Math.floor(nights * r.next()) + (r.next() - 0.5) * 0.12 // ±1.4 h around one hour angle
  return t.sort()
}

describe('window function', () => {
  const t = nightly(120, 300, 3)

  it('is 1 at f = 0 and nowhere larger', () => {
    const w = windowFunction(t, { f0: 0, df: 0.0005, count: 4001 }) // 0…2 c/d
    expectClose(w[0], 1, { rtol: 1e-12 }, 'W(0)')
    for (let k = 1; k < w.length; k++) expect(w[k]).toBeLessThanOrEqual(1 + 1e-12)
  })

  it('shows the 1-day alias for nightly sampling: strong near 1 c/d, weak half-way', () => {
    const df = 0.0005
    const w = windowFunction(t, { f0: 0, df, count: 4001 })
    let best = 0, at = 0
    for (let k = Math.round(0.9 / df); k <= Math.round(1.1 / df); k++) if (w[k] > best) { best = w[k]; at = k }
    expect(best).toBeGreaterThan(0.8)
    expect(Math.abs(at * df - 1)).toBeLessThan(0.01)
    let mid = 0
    for (let k = Math.round(0.4 / df); k <= Math.round(0.6 / df); k++) mid = Math.max(mid, w[k])
    expect(mid).toBeLessThan(0.2)
  })

  it('matches the exact sum at single frequencies on both the direct and the FFT path', () => {
    const small = windowFunction(t, { f0: 0.01, df: 0.001, count: 2000 })          // N·M = 2.4e5: direct
    const large = windowFunction(t, { f0: 0.01, df: 0.00001, count: 200_000 })     // N·M = 2.4e7: extirpolation + FFT
    for (const k of [0, 17, 990, 1999]) expectClose(small[k], windowPowerAt(t, 0.01 + k * 0.001), { atol: 1e-10 }, `direct[${k}]`)
    for (const k of [0, 1234, 99_000, 199_999]) expectClose(large[k], windowPowerAt(t, 0.01 + k * 0.00001), { atol: 1e-6 }, `fft[${k}]`)
  })

  it('rejects a bad grid', () => {
    expect(() => windowFunction(t, { f0: 0, df: 0, count: 10 })).toThrow(/df/)
    expect(() => windowFunction(t, { f0: 0, df: 0.1, count: 0 })).toThrow(/count/)
  })
})

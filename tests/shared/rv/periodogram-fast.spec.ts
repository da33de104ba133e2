import { describe, it, expect } from 'vitest'
import { createRandom } from '../../../shared/math/random.ts'
import { periodogramDirect, periodogramFast, releasePeriodogramBuffers } from '../../../shared/rv/periodogram.ts'
import { maxAbs, maxAbsDiff } from './periodogram-fixtures.ts'

// Requirement of the product (issue 3 §1): the fast method (Press & Rybicki 1989 extirpolation + FFT)
// stays within 1e-4 of the direct method's peak power over the whole grid.
function synthetic(n: number, baseline: number, seed: number, nightly: boolean) {
  const r = createRandom(seed)
  const t = new Float64Array(n), y = new Float64Array(n), dy = new Float64Array(n)
  for (let i = 0; i < n; i++) t[i] = 2455000 + (nightly ? Math.floor(baseline * r.next()) + 0.1 * r.next() : baseline * r.next())
  t.sort()
  for (let i = 0; i < n; i++) {
    dy[i] = 0.5 + 3 * r.next()
    y[i] = 6 * Math.sin(2 * Math.PI * t[i] / 5.7 + 1) + 3 * Math.sin(2 * Math.PI * t[i] / 61) + dy[i] * r.normal()
  }
  return { t, y, dy }
}

describe('fast vs direct periodogram', () => {
  const cases: Array<{ n: number; baseline: number; opts: Record<string, unknown>; nightly?: boolean }> = [
    { n: 20, baseline: 100, opts: {} },
    { n: 60, baseline: 300, opts: { oversample: 5 } },
    { n: 150, baseline: 400, opts: { oversample: 20 }, nightly: true },
    { n: 300, baseline: 1500, opts: {} },
    { n: 500, baseline: 800, opts: { frequencies: 40_000 } },
    { n: 1000, baseline: 3000, opts: { frequencies: 20_000, minPeriod: 0.5 } },
    { n: 2000, baseline: 1000, opts: { oversample: 3 } },
    { n: 200, baseline: 600, opts: { minPeriod: 4, maxPeriod: 8, frequencies: 5000 } },   // narrow band far from 0
    { n: 200, baseline: 600, opts: { floatingMean: false } },
    { n: 200, baseline: 600, opts: { jitter: 4, oversample: 15 } },
    { n: 100, baseline: 50, opts: { minPeriod: 0.2, oversample: 50 } },                 // M ≈ 12 500, short baseline
  ]
  for (const c of cases) {
    it(`N=${c.n}, baseline ${c.baseline} d, ${JSON.stringify(c.opts)}${c.nightly ? ', nightly' : ''}`, () => {
      const { t, y, dy } = synthetic(c.n, c.baseline, c.n + c.baseline, c.nightly ?? false)
      const d = periodogramDirect(t, y, dy, c.opts)
      const f = periodogramFast(t, y, dy, c.opts)
      expect(f.grid).toEqual(d.grid)
      const err = maxAbsDiff(f.power, d.power), peak = maxAbs(d.power)
      expect(err, `max |fast − direct| = ${err.toExponential(2)}, peak ${peak}`).toBeLessThanOrEqual(1e-4 * peak)
    })
  }

  it('reuses its buffers: a second call on other data is not affected by the first', () => {
    const a = synthetic(300, 900, 1, false), b = synthetic(300, 900, 2, false)
    const fa1 = periodogramFast(a.t, a.y, a.dy).power.slice()
    periodogramFast(b.t, b.y, b.dy)
    const fa2 = periodogramFast(a.t, a.y, a.dy).power
    expect(maxAbsDiff(fa1, fa2)).toBe(0)
  })

  it('stays right when a call needs bigger or smaller buffers than the previous one, and after releasing them', () => {
    const a = synthetic(400, 1200, 3, false)
    const small = { oversample: 5 }, large = { frequencies: 150_000 }
    const ref = periodogramDirect(a.t, a.y, a.dy, small)
    periodogramFast(a.t, a.y, a.dy, large)
    const after = periodogramFast(a.t, a.y, a.dy, small)
    expect(maxAbsDiff(after.power, ref.power)).toBeLessThanOrEqual(1e-4 * maxAbs(ref.power))
    releasePeriodogramBuffers()
    const again = periodogramFast(a.t, a.y, a.dy, small)
    expect(maxAbsDiff(again.power, after.power)).toBe(0)
  })
})

import { describe, expect, it } from 'vitest'
import { radialVelocity } from '@shared/rv/index.ts'
import { computeBand, drawsFromSample, quantileSorted } from '@/workers/posterior-band.ts'
import { expectClose } from '../../../helpers/expect-close.ts'
import { makeResult } from './fixture.ts'

const planet = { period: 12.4, K: 10, e: 0.2, omegaDeg: 60, tp: 2459000 }

describe('posterior band of model curves', () => {
  it('quantiles interpolate linearly between order statistics (the usual type-7 definition, common practice)', () => {
    const s = Float64Array.from([1, 2, 3, 4, 5])
    expect(quantileSorted(s, 0.5)).toBe(3)
    expect(quantileSorted(s, 0.16)).toBeCloseTo(1.64, 12)
    expect(quantileSorted(s, 0.84)).toBeCloseTo(4.36, 12)
  })

  it('collapses to the one curve when every draw is the same, trend included', () => {
    const draws = Array.from({ length: 5 }, () => ({ planets: [planet], slope: 0.01, curvature: 0 }))
    const band = computeBand({ draws, epoch: 2459010, start: 2459000, end: 2459050, samples: 200 })
    expect(band.used).toBe(5)
    const t = Float64Array.from(band.time)
    const v = radialVelocity(t, [{ period: 12.4, K: 10, e: 0.2, omega: (60 * Math.PI) / 180, tp: 2459000 }])
    const expected = Array.from(t, (x, i) => v[i]! + 0.01 * (x - 2459010))
    expectClose(band.median, expected, { atol: 1e-9 }, 'median curve equals the model (shared/rv radialVelocity)')
    expectClose(band.lo, expected, { atol: 1e-9 }, '16 % curve')
    expectClose(band.hi, expected, { atol: 1e-9 }, '84 % curve')
  })

  it('spreads with K: draws of K 8…12 m/s give a band inside their extremes, median between', () => {
    const draws = [8, 9, 10, 11, 12].map((K) => ({ planets: [{ ...planet, e: 0 }], slope: 0, curvature: 0 }))
      .map((d, i) => ({ ...d, planets: [{ ...d.planets[0]!, K: 8 + i }] }))
    const band = computeBand({ draws, epoch: 0, start: 2459000, end: 2459012.4, samples: 100 })
    for (let i = 0; i < band.time.length; i++) {
      expect(band.lo[i]!).toBeLessThanOrEqual(band.median[i]! + 1e-12)
      expect(band.median[i]!).toBeLessThanOrEqual(band.hi[i]! + 1e-12)
    }
    expect(Math.max(...band.hi)).toBeGreaterThan(10.5)
    expect(Math.max(...band.hi)).toBeLessThan(12)
  })

  it('reads parameter sets from the thinned sample (P, K, e, ω, Tp per planet)', () => {
    const draws = drawsFromSample(makeResult(true).sample, 4)
    expect(draws).toHaveLength(4)
    expect(draws[0]!.planets).toHaveLength(1)
    expect(draws[0]!.planets[0]!.period).toBeCloseTo(12.4 * 0.98, 10)
    expect(draws[0]!.slope).toBe(0)
  })
})

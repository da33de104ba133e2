import { describe, it, expect } from 'vitest'
import { createRandom } from '../../../shared/math/index.ts'
import {
  expectedInformation, expectedInformationDirect, predictiveSpread, predictiveBand, informationFromVariance, drawsFromSample,
  type PosteriorDraws,
} from '../../../shared/plan/index.ts'
import { expectClose } from '../../helpers/expect-close.ts'

/** Seeded two-planet draws with a trend and an offset, scattered like a posterior. */
function twoPlanetDraws(n: number, seed: number): PosteriorDraws {
  const r = createRandom(seed)
  const col = (f: () => number): Float64Array => Float64Array.from({ length: n }, f)
  return {
    planets: [
      { period: col(() => 12.3 + 0.05 * r.normal()), K: col(() => 25 + 2 * r.normal()), e: col(() => Math.abs(0.2 + 0.05 * r.normal())),
        omegaDeg: col(() => 80 + 10 * r.normal()), tp: col(() => 2461000 + 0.4 * r.normal()) },
      { period: col(() => 340 + 20 * r.normal()), K: col(() => 12 + 3 * r.normal()), e: col(() => 0.05 * r.next()),
        omegaDeg: col(() => 360 * r.next()), tp: col(() => 2460900 + 15 * r.normal()) },
    ],
    offset: col(() => -3 + 0.5 * r.normal()),
    slope: col(() => 0.001 * r.normal()),
    epoch: 2461000,
  }
}

describe('expected information of the next velocity (Ford 2008)', () => {
  it('the one-pass computation equals the direct per-time, per-draw computation', () => {
    const draws = twoPlanetDraws(300, 7)
    const times = Float64Array.from({ length: 97 }, (_, i) => 2461380 + 0.37 * i)
    expectClose(expectedInformation(draws, times, 2.5), expectedInformationDirect(draws, times, 2.5), { rtol: 1e-9, atol: 1e-12 })
  })

  it('½ ln(1 + s²/σ²) matches the mutual information of the draws\' predictive mixture computed by quadrature', () => {
    // Predicted velocity at the chosen time is K (circular orbit at its quadrature): K ~ N(10, 2²).
    const r = createRandom(11)
    const n = 2000
    const K = Float64Array.from({ length: n }, () => 10 + 2 * r.normal())
    const draws: PosteriorDraws = {
      planets: [{ period: new Float64Array(n).fill(5), K, e: new Float64Array(n), omegaDeg: new Float64Array(n), tp: new Float64Array(n).fill(2461000) }],
    }
    const t = new Float64Array([2461000 + 5 * 20]) // whole periods after tp: v = K cos(0) = K
    const sigma = 1.5
    // I = H(y) − H(y | draw); y ~ mixture of N(v_i, σ²) over the draws; H by the trapezoid rule on a fine grid
    let h = 0
    const lo = -10, hi = 30, m = 4000, dy = (hi - lo) / m
    for (let k = 0; k <= m; k++) {
      const y = lo + k * dy
      let p = 0
      for (let i = 0; i < n; i++) p += Math.exp(-0.5 * ((y - K[i]) / sigma) ** 2)
      p /= n * sigma * Math.sqrt(2 * Math.PI)
      if (p > 0) h -= (k === 0 || k === m ? 0.5 : 1) * p * Math.log(p) * dy
    }
    const mutual = h - 0.5 * Math.log(2 * Math.PI * Math.E * sigma * sigma)
    expectClose(expectedInformation(draws, t, sigma)[0], mutual, { rtol: 0.01 })
  })

  it('is zero where every draw predicts the same velocity and grows with the spread', () => {
    expect(informationFromVariance(0, 1)).toBe(0)
    expect(informationFromVariance(4, 1)).toBeGreaterThan(informationFromVariance(1, 1))
    expectClose(informationFromVariance(3, 1), Math.log(2)) // ½ ln 4
  })

  it('the predictive spread and band agree: the 16–84 % band of Gaussian draws spans about two standard deviations', () => {
    const draws = twoPlanetDraws(2000, 3)
    const times = Float64Array.from({ length: 11 }, (_, i) => 2461380 + 3 * i)
    const { mean, variance } = predictiveSpread(draws, times)
    const [lo, mid, hi] = predictiveBand(draws, times)
    for (let j = 0; j < times.length; j++) {
      expect(lo[j]).toBeLessThanOrEqual(mid[j])
      expect(hi[j]).toBeGreaterThanOrEqual(mid[j])
      expectClose((hi[j] - lo[j]) / 2, Math.sqrt(variance[j]), { rtol: 0.25 })
      expectClose(mid[j], mean[j], { atol: 0.3 * Math.sqrt(variance[j]) })
    }
  })

  it('refuses mismatched draws and a non-positive noise, naming them', () => {
    const d = twoPlanetDraws(10, 1)
    const bad = { ...d, offset: new Float64Array(9) }
    expect(() => expectedInformation(bad, new Float64Array([2461000]), 1)).toThrow(/offset has 9 draws/)
    expect(() => expectedInformation(d, new Float64Array([2461000]), 0)).toThrow(/noise/)
    expect(() => expectedInformation({ ...d, epoch: undefined }, new Float64Array([2461000]), 1)).toThrow(/epoch/)
  })

  it('reads draws from a sampling run\'s named columns (Tp, or Tc when Tp is absent)', () => {
    const sample = {
      names: ['P b', 'K b', 'e b', 'ω b', 'Tc b', 'offset SPEC-A', 'ln posterior'],
      columns: [[10, 10.1], [5, 6], [0, 0.1], [90, 100], [2461000, 2461000.2], [1, 2], [0, 0]],
    }
    const d = drawsFromSample(sample, { instrument: 'SPEC-A' })
    expect(d.planets).toHaveLength(1)
    expect(d.offset).toEqual([1, 2])
    // circular orbit with ω = 90°: Tp = Tc (conjunction at ν = 90° − ω = 0)
    expectClose(d.planets[0].tp[0], 2461000, { atol: 1e-9 })
    expect(() => drawsFromSample(sample, { instrument: 'OTHER' })).toThrow(/offset OTHER/)
  })
})

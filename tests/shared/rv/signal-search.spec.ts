import { describe, it, expect } from 'vitest'
import { searchPlanets } from '../../../shared/rv/signal-search.ts'
import { synth, withinSigma } from './orbit-fit-helpers.ts'

const DEG = Math.PI / 180

describe('planet search from the data alone (periodogram → fit → residuals, BIC)', () => {
  it('finds one injected planet and stops', () => {
    const { data } = synth({ seed: 21, n: 120, baseline: 800, planets: [{ period: 23.7, K: 9, e: 0.15, omega: 40 * DEG, tp: 2455005 }] })
    const r = searchPlanets(data)
    expect(r.planets).toBe(1)
    const p = r.fit.planets[0]
    expect(withinSigma(p.period, 23.7, p.uncertainty.period)).toBe(true)
    expect(withinSigma(p.K, 9, p.uncertainty.K)).toBe(true)
    expect(r.fit.converged).toBe(true)
    // steps: 0 and 1 planets, with the FAP of each model's strongest residual peak
    expect(r.steps[0].planets).toBe(0)
    expect(r.steps[0].nextPeakFap!).toBeLessThan(1e-3)
    expect(r.steps[1].bic).toBeLessThan(r.steps[0].bic - 10)
    expect(r.steps[1].nextPeakFap === null || r.steps[1].nextPeakFap > 1e-3).toBe(true)
  })

  it('finds two planets with two instruments of different offsets and jitters', () => {
    const { data } = synth({
      seed: 22, n: 200, baseline: 1400,
      planets: [
        { period: 12.4, K: 9, e: 0.1, omega: 40 * DEG, tp: 2455003.2 },
        { period: 187, K: 14, e: 0.25, omega: 210 * DEG, tp: 2455090 },
      ],
      instruments: [{ name: 'X', offset: 100, jitter: 2, err: [1, 2] }, { name: 'Y', offset: -50, jitter: 3, err: [2, 4] }],
    })
    const r = searchPlanets(data)
    expect(r.planets).toBe(2)
    const ps = [...r.fit.planets].sort((a, b) => a.period - b.period)
    expect(withinSigma(ps[0].period, 12.4, ps[0].uncertainty.period)).toBe(true)
    expect(withinSigma(ps[1].period, 187, ps[1].uncertainty.period)).toBe(true)
    expect(withinSigma(ps[1].K, 14, ps[1].uncertainty.K)).toBe(true)
    expect(withinSigma(ps[1].e, 0.25, ps[1].uncertainty.e)).toBe(true)
    expect(withinSigma(r.fit.instruments[0].offset, 100, r.fit.instruments[0].offsetErr)).toBe(true)
    expect(withinSigma(r.fit.instruments[1].offset, -50, r.fit.instruments[1].offsetErr)).toBe(true)
  })

  it('finds a highly eccentric planet whose periodogram peak is weak', () => {
    const { data } = synth({ seed: 23, n: 60, baseline: 1600, planets: [{ period: 140, K: 40, e: 0.7, omega: 300 * DEG, tp: 2455050 }] })
    const r = searchPlanets(data, { trend: 'none' })
    expect(r.planets).toBe(1)
    const p = r.fit.planets[0]
    expect(withinSigma(p.period, 140, p.uncertainty.period)).toBe(true)
    expect(withinSigma(p.e, 0.7, p.uncertainty.e)).toBe(true)
    expect(withinSigma(p.omegaDeg, 300, p.uncertainty.omegaDeg)).toBe(true)
  })

  it('chooses a linear trend by BIC when one is injected', () => {
    const { data } = synth({ seed: 24, n: 120, baseline: 1500, planets: [{ period: 8.3, K: 12, e: 0, omega: 0, tp: 2455001 }], slope: 0.015 })
    const r = searchPlanets(data)
    expect(r.planets).toBe(1)
    expect(r.trend === 'linear' || r.trend === 'quadratic').toBe(true)
    expect(withinSigma(r.fit.trend!.slope, 0.015, r.fit.trend!.slopeErr)).toBe(true)
  })

  it('finds no planet in pure noise', () => {
    const { data } = synth({ seed: 25, n: 80, baseline: 600, planets: [] })
    const r = searchPlanets(data, { trend: 'none' })
    expect(r.planets).toBe(0)
    expect(r.fit.planets).toHaveLength(0)
    expect(r.steps[0].nextPeakFap!).toBeGreaterThan(1e-3)
  })

  it('fits exactly N planets when asked, and rejects a bad count', () => {
    const { data } = synth({ seed: 26, n: 80, baseline: 600, planets: [{ period: 5.5, K: 20, e: 0, omega: 0, tp: 2455000 }] })
    const r = searchPlanets(data, { planets: 1, trend: 'none' })
    expect(r.fit.planets).toHaveLength(1)
    expect(() => searchPlanets(data, { planets: -1 })).toThrow(/planets/)
    expect(() => searchPlanets(data, { trend: 'cubic' as never })).toThrow(/trend/)
  })
})

import { describe, it, expect } from 'vitest'
import { fitKeplerians } from '../../../shared/rv/orbit-fit.ts'
import { tpToTc } from '../../../shared/rv/model.ts'
import { synth } from './orbit-fit-helpers.ts'

// The fitter at its bounds (orbit-fit-layout.ts `project`, orbit-fit-lm.ts): a planet started half
// an orbit out of phase must pass through K = 0 with ω turned by 180° (the same curve) instead of
// sticking at K = 0 with its other parameters undetermined; a fit resting against e = E_MAX or
// crawling along a flat ridge must stop as converged well before the iteration cap.
const truth = { period: 23.7, K: 15, e: 0.3, omega: 0.8, tp: 2455012 }
const { data } = synth({ seed: 11, n: 80, baseline: 700, planets: [truth], instruments: [{ name: 'A', offset: 0, jitter: 1, err: [1, 2] }] })
const tc = tpToTc(truth.tp, truth.period, truth.e, truth.omega)

describe('the fitter at its bounds', () => {
  for (const [label, start] of [
    ['eccentric, √e cos ω and √e sin ω free', { e: 0.3, omegaDeg: 0.8 * 180 / Math.PI }],
    ['circular start, e and ω free', { e: 0, omegaDeg: 0 }],
  ] as const) {
    it(`recovers a planet started half an orbit out of phase (${label})`, () => {
      const f = fitKeplerians(data, { planets: [{ period: 23.72, K: 8, ...start, tc: tc + truth.period / 2 }] })
      expect(f.status).toBe('converged')
      expect(f.planets[0].K).toBeGreaterThan(12)
      expect(Math.abs(f.planets[0].period - truth.period)).toBeLessThan(0.05)
      expect(Math.abs(f.planets[0].e - truth.e)).toBeLessThan(0.1)
    })
  }

  it('a circular orbit with e and ω held also flips (half a period later)', () => {
    const { data: circ } = synth({ seed: 12, n: 60, baseline: 500, planets: [{ ...truth, e: 0 }] })
    const tcC = tpToTc(truth.tp, truth.period, 0, truth.omega)
    const f = fitKeplerians(circ, { planets: [{ period: 23.7, K: 5, e: 0, omegaDeg: 0, tc: tcC + truth.period / 2, fix: ['e', 'omegaDeg'] }] })
    expect(f.status).toBe('converged')
    expect(f.planets[0].K).toBeGreaterThan(12)
  })

  it('stops as converged against e = E_MAX once the likelihood is flat, before the cap', () => {
    // a spike orbit fitted to noise ends against the eccentricity bound, crawling
    const f = fitKeplerians(data, { planets: [{ period: truth.period, K: truth.K, e: truth.e, omegaDeg: 0.8 * 180 / Math.PI, tc }, { period: 4.249, K: 2.5, e: 0.97, omegaDeg: -45, tc: 2455003 }] })
    expect(f.planets[1].e).toBeGreaterThan(0.98)
    expect(f.status).toBe('converged')
    expect(f.iterations).toBeLessThan(200)
  })
})

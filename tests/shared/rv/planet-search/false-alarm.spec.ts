// The search's false-alarm law (shared/rv/planet-search/significance.ts) against simulated noise:
// fixtures/search/false-alarm-calibration.json holds the one-planet likelihood gains of 400 seeded
// pure-noise data sets (scripts/calibrate-false-alarm.ts; invented instruments). At FAP ≤ α the law
// must let through a fraction α of them (binomial allowance); the nominal χ²₄-over-M law did not.
// A few fresh noise sets (seeds outside the calibration) then go through the whole automatic search.
import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { FALSE_ALARM_LAW, chiSquareTailEven, keplerianFap, searchPlanets, SHORT_ECCENTRIC } from '../../../../shared/rv/index.ts'
import { NOISE_DESIGNS, fractionAtOrBelow, seedOf, CALIBRATION_FILE, type CalibrationRow } from '../../../../scripts/calibrate-false-alarm.ts'
import { makeCase } from './survey.ts'

const cal = JSON.parse(readFileSync(CALIBRATION_FILE, 'utf8')) as { law: typeof FALSE_ALARM_LAW; rows: CalibrationRow[] }

describe('false-alarm law', () => {
  it('χ² tail for even ν is the Poisson sum (ν = 2: e^{−z}; ν = 4: (1 + z)e^{−z})', () => {
    expect(chiSquareTailEven(3, 2)).toBeCloseTo(Math.exp(-3), 15)
    expect(chiSquareTailEven(3, 4)).toBeCloseTo(4 * Math.exp(-3), 15)
    expect(chiSquareTailEven(3, 6)).toBeCloseTo(8.5 * Math.exp(-3), 15)
    expect(chiSquareTailEven(0, 6)).toBe(1)
    expect(() => chiSquareTailEven(1, 5)).toThrow(/even/)
  })

  it('the calibration fixture was made with the law in use, on 400 noise sets', () => {
    expect(cal.law).toEqual(FALSE_ALARM_LAW)
    expect(cal.rows.length).toBe(400)
  })

  it('a fraction α of noise sets reach FAP ≤ α (α = 0.01 … 0.1, 3σ binomial); the nominal χ²₄ law let 5× too many through', () => {
    const n = cal.rows.length
    for (const alpha of [0.01, 0.03, 0.1]) {
      const f = fractionAtOrBelow(cal.rows, alpha, FALSE_ALARM_LAW)
      expect(Math.abs(f - alpha), `α = ${alpha}: fraction ${f}`).toBeLessThanOrEqual(3 * Math.sqrt(alpha * (1 - alpha) / n) + 1 / n)
    }
    expect(fractionAtOrBelow(cal.rows, 0.01, { dof: 4, trialsFactor: 1 })).toBeGreaterThan(0.05)
    // each row's FAP is the law applied to its own gain and frequency count
    const r = cal.rows[0]!
    expect(keplerianFap(r.dLnL, r.m)).toBeCloseTo(-Math.expm1(FALSE_ALARM_LAW.trialsFactor * r.m * Math.log1p(-chiSquareTailEven(r.dLnL, FALSE_ALARM_LAW.dof))), 14)
  })

  it('fresh noise sets keep no planet in automatic mode; the two calibration outliers become flagged candidates', () => {
    for (let d = 0; d < NOISE_DESIGNS.length; d++) {
      const { label: _l, ...design } = NOISE_DESIGNS[d]!
      for (let k = 100; k < 103; k++) {
        const r = searchPlanets(makeCase({ ...design, seed: seedOf(d, k), name: 'noise', what: '' }))
        expect(r.planets, `design ${d} seed ${seedOf(d, k)}: ${r.fit.planets.map((p) => p.period.toFixed(2)).join(', ')}`).toBe(0)
      }
    }
    // the lowest-FAP noise sets of the calibration: short, very eccentric fits to a few points
    const outliers = [...cal.rows].sort((a, b) => keplerianFap(a.dLnL, a.m) - keplerianFap(b.dLnL, b.m)).slice(0, 2)
    for (const o of outliers) {
      const { label: _l, ...design } = NOISE_DESIGNS[o.design]!
      const r = searchPlanets(makeCase({ ...design, seed: o.seed, name: 'noise', what: '' }))
      expect(r.planets, `seed ${o.seed}`).toBe(0)
      const c = r.candidates[0]
      expect(c, `seed ${o.seed}: a flagged candidate`).toBeDefined()
      expect(c!.period).toBeLessThan(SHORT_ECCENTRIC.period)
      expect(c!.flags.map((f) => f.kind)).toContain('candidate-eccentric-short-period')
    }
  }, 60_000)
})

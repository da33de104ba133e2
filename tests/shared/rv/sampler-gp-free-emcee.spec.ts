import { describe, it, expect } from 'vitest'
import { readFileSync } from 'node:fs'
import { createLogPosterior, fitKeplerians, samplePosterior, type RvData } from '../../../shared/rv/index.ts'
import { gpSamplerData, GP_FREE_CASE } from '../../../scripts/reference/sampler_gp_input.ts'
import { expectAgreesWithEmcee, GP_UNITS, type RefParam } from './emcee-agreement.ts'

// One planet + GP (rotation kernel, our O(N) solver) with every hyperparameter sampled — amplitude,
// rotation period, decay time, shape and jitter (GP_FREE_CASE) — on the seeded spotted star, 120 rows
// (at 60 rows the decay time–amplitude ridge and K's tail toward 0 make τ ≈ 1400 steps; at 120, ≈ 360).
// Against emcee driving a dense numpy/scipy GP likelihood on the same data and priors
// (scripts/reference/sampler_gp_emcee.py → fixtures/sampler/gp-all-free-emcee.json, with each median's
// Monte-Carlo error sd / √(N/τ)); and, point by point, against the same script's ln posterior
// (`--log-prob` → fixtures/sampler/gp-all-free-logprob.json), which pins the decay time's moving prior
// normalisation, the shape's support and every Jacobian before any sampling noise enters.
// Agreement of the runs: medians within 4, 16/84 % within 5 combined Monte-Carlo errors.
const fixture = (name: string): unknown => JSON.parse(readFileSync(new URL(`../../../fixtures/sampler/${name}`, import.meta.url), 'utf8'))
const ref = fixture('gp-all-free-emcee.json') as { converged: boolean; steps: number; tauMax: number; parameters: Record<string, RefParam> }
const lp = fixture('gp-all-free-logprob.json') as {
  t: number[]; y: number[]; dy: number[]; tc0: number; prot: { mu: number; sigma: number }; period: { min: number; max: number }
  points: number[][]; logProb: Array<number | null>
}

const NAMES = ['ln P b', 'ln K b', '√e cos ω b', '√e sin ω b', 'Tc b', 'offset North', 'ln jitter North', 'ln GP amplitude', 'ln GP decay time', 'rotation period', 'GP shape']

describe('posterior with every GP hyperparameter free, against a dense numpy GP and emcee', () => {
  it('ln posterior equals the reference script\'s at every point up to one constant, and both refuse the same points', () => {
    expect(lp.prot).toEqual({ mu: GP_FREE_CASE.noise.period.value, sigma: GP_FREE_CASE.noise.period.sigma })
    const n = lp.t.length
    const data: RvData = { t: Float64Array.from(lp.t), y: Float64Array.from(lp.y), dy: Float64Array.from(lp.dy), instrument: new Int32Array(n), instrumentNames: ['North'] }
    const post = createLogPosterior(data, {
      planets: [{ period: 12.3, K: 7, e: 0.1, omegaDeg: 60, tc: lp.tc0 }], noise: GP_FREE_CASE.noise,
      priors: [{ planet: 0, param: 'period', uniform: lp.period }],
    })
    expect(post.names).toEqual(NAMES)
    // the constant: the stated uniform period prior's normalisation, −ln(max − min), which the script leaves out
    const c = -Math.log(lp.period.max - lp.period.min)
    let inside = 0
    lp.points.forEach((x, k) => {
      const ours = post.logProb(Float64Array.from(x))
      const want = lp.logProb[k]
      if (want === null) { expect(ours, `point ${k}`).toBe(-Infinity); return }
      inside++
      expect(Math.abs(ours - (want + c)), `point ${k}: ${ours} vs ${want + c}`).toBeLessThan(1e-9 * Math.abs(want))
    })
    expect(inside).toBeGreaterThanOrEqual(12)
    expect(lp.logProb.filter((v) => v === null).length).toBeGreaterThanOrEqual(4)
  })

  it('samples all of them to convergence; medians and 16/84 % agree with emcee within Monte-Carlo error', () => {
    expect(ref.converged).toBe(true)
    expect(ref.steps * 0.75 / ref.tauMax).toBeGreaterThan(50)
    const data = gpSamplerData(120)
    const white = fitKeplerians(data, { planets: [{ period: 12.3, K: 7, e: 0.1, omegaDeg: 60, tc: 2459003 }] })
    const r = samplePosterior(data, white, { noise: GP_FREE_CASE.noise, priors: [{ planet: 0, param: 'period', uniform: GP_FREE_CASE.periodPrior }], seed: GP_FREE_CASE.seed })
    expect(r.diagnostics.converged, r.diagnostics.warnings.join(' ')).toBe(true)
    expect(r.diagnostics.names).toEqual(NAMES)
    expect(r.noisePriors.join('; ')).toMatch(/GP decay time log-uniform between half the rotation period and 10 × max\(baseline, rotation period\); GP shape factor \(P\/2 harmonic share\) uniform on \[0, 1\]/)
    expect(Object.keys(ref.parameters)).toEqual(expect.arrayContaining(Object.keys(GP_UNITS)))
    expectAgreesWithEmcee(r, ref.parameters, (name, ours) => expect(ours.fixed ?? false, name).toBe(false))
  }, 3_600_000)
})

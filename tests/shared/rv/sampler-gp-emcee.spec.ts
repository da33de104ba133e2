import { describe, it, expect } from 'vitest'
import { readFileSync } from 'node:fs'
import { fitKeplerians, samplePosterior } from '../../../shared/rv/index.ts'
import { gpSamplerData, GP_SAMPLER_CASE } from '../../../scripts/reference/sampler_gp_input.ts'
import { expectAgreesWithEmcee, type RefParam } from './emcee-agreement.ts'

// One planet + GP (rotation kernel, our O(N) solver; amplitude and rotation period sampled, decay time and
// shape held: GP_SAMPLER_CASE) on the seeded spotted star (60 rows), sampled by our
// ensemble sampler until converged, against emcee driving a dense numpy/scipy GP likelihood on the same
// data and priors (scripts/reference/sampler_gp_emcee.py → fixtures/sampler/gp-one-planet-emcee.json;
// the fixture states the emcee run's length in autocorrelation times and each median's Monte-Carlo
// error sd / √(N/τ)). Agreement: medians within 4, 16/84 % within 5 combined Monte-Carlo errors.
const ref = JSON.parse(readFileSync(new URL('../../../fixtures/sampler/gp-one-planet-emcee.json', import.meta.url), 'utf8')) as
  { steps: number; tauMax: number; parameters: Record<string, RefParam> }

describe('posterior with a GP noise model against emcee + a dense numpy GP', () => {
  it('samples the GP hyperparameters to convergence; medians and 16/84 % agree within Monte-Carlo error', () => {
    expect(ref.steps * 0.75 / ref.tauMax).toBeGreaterThan(20)
    const data = gpSamplerData(60)
    const white = fitKeplerians(data, { planets: [{ period: 12.3, K: 7, e: 0.1, omegaDeg: 60, tc: 2459003 }] })
    const r = samplePosterior(data, white, { noise: GP_SAMPLER_CASE.noise, priors: [{ planet: 0, param: 'period', uniform: GP_SAMPLER_CASE.periodPrior }], seed: GP_SAMPLER_CASE.seed })
    expect(r.diagnostics.converged, r.diagnostics.warnings.join(' ')).toBe(true)
    expect(r.diagnostics.names).toEqual(['ln P b', 'ln K b', '√e cos ω b', '√e sin ω b', 'Tc b', 'offset North', 'ln jitter North', 'ln GP amplitude', 'rotation period'])
    expect(r.parameters.find((p) => p.name === 'GP decay time')).toMatchObject({ median: 120, fixed: true, unit: 'd' })
    expect(r.noisePriors[0]).toMatch(/rotation period ~ N\(23.5, 2.00²\) d/)
    expectAgreesWithEmcee(r, ref.parameters)
  }, 3_600_000)
})

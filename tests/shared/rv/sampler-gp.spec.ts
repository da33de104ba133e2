import { describe, it, expect } from 'vitest'
import { createLogPosterior } from '../../../shared/rv/index.ts'
import { gpSamplerData } from '../../../scripts/reference/sampler_gp_input.ts'

// The GP path of the posterior (posterior-gp.ts): coordinates, fixed hyperparameters, the period bound,
// the dense quasi-periodic path. The emcee comparison is in ./sampler-gp-emcee.spec.ts.
const data = gpSamplerData(60)

describe('posterior with a GP noise model', () => {
  it('holds fixed hyperparameters and states them; refuses a decay time below half the rotation period', () => {
    const post = createLogPosterior(data, {
      planets: [{ period: 12.3, K: 6, e: 0.1, omegaDeg: 60, tc: 2459003 }],
      noise: { kernel: 'rotation', period: { value: 23.5, fixed: true }, decayTime: { value: 100, fixed: true }, shape: { value: 0.3 } },
    })
    expect(post.names.slice(7)).toEqual(['ln GP amplitude', 'GP shape'])
    expect(post.noisePriors.join('; ')).toMatch(/rotation period fixed at 23.5 d; GP decay time fixed at 100 d/)
    expect(Number.isFinite(post.logProb(post.centre))).toBe(true)
    const far = Float64Array.from(post.centre); far[0] = Math.log(5000)
    expect(post.logProb(far)).toBe(-Infinity)
    expect(() => createLogPosterior(data, { planets: [{ period: 12.3, K: 6, tc: 2459003 }], noise: { kernel: 'rotation', period: { value: 23.5 }, decayTime: { value: 5 } } })).toThrow(/noise.decayTime.value must exceed half/)
  })

  it('the quasi-periodic kernel takes the dense path with ln Γ as its shape coordinate', () => {
    const post = createLogPosterior(data, { planets: [{ period: 12.3, K: 6, tc: 2459003 }], noise: { kernel: 'quasi-periodic', period: { value: 23.5 }, decayTime: { value: 60 } } })
    expect(post.names.at(-1)).toBe('ln GP Γ')
    expect(Number.isFinite(post.logProb(post.centre))).toBe(true)
  })
})

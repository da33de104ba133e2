import { describe, it, expect } from 'vitest'
import { readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { expectClose } from '../../../helpers/expect-close.ts'
import { fitWithGp } from '../../../../shared/rv/index.ts'

// Reference: fixtures/gp/scipy-gp-fit.json, written by scripts/reference/gp_fit_reference.py — the same
// "planet + GP" posterior (rotation kernel built element by element in numpy, dense scipy Cholesky,
// offset profiled, the stated priors) maximised by scipy.optimize.minimize (Powell, then Nelder–Mead).
const ref = JSON.parse(readFileSync(fileURLToPath(new URL('../../../../fixtures/gp/scipy-gp-fit.json', import.meta.url)), 'utf8'))

describe('planet + GP fit against an independent scipy fit of the same posterior', () => {
  const n = ref.data.t.length
  const data = {
    t: Float64Array.from(ref.data.t as number[]), y: Float64Array.from(ref.data.y as number[]), dy: Float64Array.from(ref.data.dy as number[]),
    instrument: new Int32Array(n), instrumentNames: ['A'],
  }
  const [lnP, lnK, a, b, tc, lnA, lnD, lnR, f] = ref.start as number[]
  const fit = fitWithGp(data, {
    planets: [{ period: Math.exp(lnP), K: Math.exp(lnK), e: a * a + b * b, omegaDeg: (Math.atan2(b, a) * 180) / Math.PI, tc }],
    gp: {
      kernel: 'rotation', period: { value: ref.prior.rotationPeriod, sigma: ref.prior.sigma }, decayTime: { value: Math.exp(lnD) },
      shape: { value: f }, amplitude: { value: [Math.exp(lnA)] },
    },
  })
  void lnR
  const s = ref.solution

  it('reaches the same maximum of the posterior', () => {
    expect(fit.success, fit.message).toBe(true)
    expectClose(fit.stats.lnPosterior, s.lnPosterior, { atol: 0.02 }, 'ln posterior')
  })

  it('gives the same planet (to a tenth of its error) and hyperparameters', () => {
    const p = fit.planets[0]
    expectClose(p.K, s.K, { atol: 0.1 * p.uncertainty.K }, 'K')
    expectClose(p.period, s.period, { atol: 0.1 * p.uncertainty.period }, 'P')
    expectClose(p.tc, s.tc, { atol: 0.1 * p.uncertainty.tc }, 'Tc')
    expectClose(fit.noise.kernel.period, s.rotationPeriod, { atol: 0.1 * fit.noiseUncertainty.period }, 'P_rot')
    expectClose(fit.noise.amplitude[0], s.amplitude, { atol: 0.1 * fit.noiseUncertainty.amplitude[0] }, 'amplitude')
  })

  it('recovers the injected K within its error', () => {
    const p = fit.planets[0]
    expect(Math.abs(p.K - ref.truth.K)).toBeLessThan(2 * p.uncertainty.K)
  })
})

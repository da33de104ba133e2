import { describe, it, expect } from 'vitest'
import { expectClose } from '../../helpers/expect-close.ts'
import { minimumMass, semiAmplitude, semiMajorAxis, derivedPlanet } from '../../../shared/rv/derived.ts'
import { GM_SUN, GM_JUPITER } from '../../../shared/rv/constants.ts'

describe('derived quantities', () => {
  it('mass → K → mass round-trips, from planets to brown dwarfs', () => {
    for (const m of [0.003, 0.1, 1, 13, 60]) {
      for (const e of [0, 0.5, 0.9]) {
        const K = semiAmplitude(123.4, m, e, 0.9)
        expectClose(minimumMass(123.4, K, e, 0.9).msiniMjup, m, { rtol: 1e-10 }, `m(${m}, e=${e})`)
      }
    }
  })

  it('solves the full mass function (no m ≪ M★): a heavy companion differs from the small-mass formula', () => {
    // The small-mass approximation m ≈ K (P/2πG)^{1/3} M★^{2/3} √(1−e²) underestimates m by a
    // factor (1 + m/M★)^{2/3}; for 60 M_Jup around 0.5 M☉ that is ≈ 7.5 %.
    const K = semiAmplitude(100, 60, 0, 0.5)
    const approx = K * Math.cbrt(100 * 86400 / (2 * Math.PI)) * Math.pow(0.5 * GM_SUN, 2 / 3) / GM_JUPITER
    const full = minimumMass(100, K, 0, 0.5).msiniMjup
    expectClose(full, 60, { rtol: 1e-10 }, 'full')
    expectClose(full / approx, Math.pow(1 + (60 * GM_JUPITER) / (0.5 * GM_SUN), 2 / 3), { rtol: 1e-9 }, 'ratio')
  })

  it('carries the stellar-mass error: σm/m = ⅔ σM/M and σa/a = ⅓ σM/M for a small planet', () => {
    // First-order propagation of m ∝ M★^{2/3} and a ∝ M★^{1/3} (Kepler's third law).
    const d = derivedPlanet({ period: 50, K: 10, e: 0.2 }, 1.0, { starMassErr: 0.06 })
    expectClose(d.uncertainty.msiniMjup / d.msiniMjup, (2 / 3) * 0.06, { rtol: 2e-3 }, 'σm/m')
    expectClose(d.uncertainty.aAu / d.aAu, (1 / 3) * 0.06, { rtol: 2e-3 }, 'σa/a')
  })

  it('combines the K error with the stellar-mass error in quadrature', () => {
    const cov = [0, 0, 0, 0, 0.25, 0, 0, 0, 0] // σK = 0.5 m/s
    const d = derivedPlanet({ period: 50, K: 10, e: 0.2 }, 1.0, { starMassErr: 0.06, covariance: cov })
    const expected = Math.hypot(0.5 / 10, (2 / 3) * 0.06)
    expectClose(d.uncertainty.msiniMjup / d.msiniMjup, expected, { rtol: 3e-3 }, 'σm/m')
  })

  it('a from Kepler\'s third law includes the planet mass', () => {
    const a0 = semiMajorAxis(365.25, 1)
    const a1 = semiMajorAxis(365.25, 1, 0.001)
    expectClose(a1 / a0, Math.cbrt(1.001), { rtol: 1e-12 }, 'ratio')
  })

  it('rejects misuse naming the parameter', () => {
    expect(() => minimumMass(0, 1, 0, 1)).toThrow(/period/)
    expect(() => minimumMass(1, 1, 0, -1)).toThrow(/starMass/)
    expect(() => derivedPlanet({ period: 1, K: 1, e: 0 }, 1, { starMassErr: -1 })).toThrow(/starMassErr/)
  })
})

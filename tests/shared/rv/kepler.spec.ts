import { describe, it, expect } from 'vitest'
import { kepler as meeus } from 'astronomia'
import { expectClose } from '../../helpers/expect-close.ts'
import {
  solveKepler, solveKeplerArray, trueAnomaly, trueAnomalyArray, eccentricFromTrue, wrapPi, KEPLER_TOLERANCE,
} from '../../../shared/rv/kepler.ts'

const DEG = Math.PI / 180

describe("Kepler's equation", () => {
  it('reproduces Meeus worked example 30.a (e = 0.1, M = 5° → E = 5.554589°)', () => {
    // Source: J. Meeus, Astronomical Algorithms (2nd ed.), example 30.a.
    expectClose(solveKepler(5 * DEG, 0.1) / DEG, 5.554589, { atol: 5e-7 }, 'E [deg]')
  })

  it('agrees with astronomia kepler3 (bisection) over a grid of e and M', () => {
    // Reference: npm astronomia 4.2.0, kepler.kepler3 (Meeus ch. 30, binary search to 53 bits).
    let worst = 0
    for (let ie = 0; ie <= 99; ie += 3) {
      const e = ie / 100
      for (let k = 0; k < 180; k++) {
        const M = -Math.PI + (2 * Math.PI * (k + 0.37)) / 180
        const ours = solveKepler(M, e)
        const ref = meeus.kepler3(e, M)
        worst = Math.max(worst, Math.abs(wrapPi(ours - ref)))
      }
    }
    expect(worst).toBeLessThan(1e-12)
  })

  it('agrees with astronomia kepler2 (Newton, 12 decimal places) for moderate e', () => {
    // Reference: npm astronomia 4.2.0, kepler.kepler2 (Meeus eq. 30.7).
    for (const e of [0.01, 0.1, 0.3, 0.5, 0.7]) {
      for (const Mdeg of [1, 5, 30, 90, 150, 179]) {
        expectClose(solveKepler(Mdeg * DEG, e), meeus.kepler2(e, Mdeg * DEG, 12), { atol: 2e-12 }, `E(e=${e}, M=${Mdeg}°)`)
      }
    }
  })

  it('leaves |E − e sin E − M| < 1e-12 for 0 ≤ e ≤ 0.99, including M near 0 and π', () => {
    // Requirement of the numerical core (issue 3 §2); checked directly on the equation.
    const Ms: number[] = []
    for (let k = -500; k <= 500; k++) Ms.push((k * Math.PI) / 500)
    Ms.push(1e-12, -1e-9, 1e-6, 3e-4, Math.PI - 1e-9, -Math.PI + 1e-12, 25.1, -1000.3)
    let worst = 0
    for (let ie = 0; ie <= 99; ie++) {
      const e = ie / 100
      for (const M of Ms) {
        const E = solveKepler(M, e)
        worst = Math.max(worst, Math.abs(E - e * Math.sin(E) - M))
      }
    }
    expect(worst).toBeLessThan(KEPLER_TOLERANCE)
  })

  it('keeps the revolution of M (E − M is bounded by e)', () => {
    const E = solveKepler(20 * Math.PI + 0.3, 0.5)
    expect(Math.abs(E - (20 * Math.PI + 0.3))).toBeLessThanOrEqual(0.5)
  })

  it('vectorised form writes into the given array and matches the scalar one', () => {
    const M = Float64Array.from({ length: 50 }, (_, i) => i * 0.37 - 9)
    const out = new Float64Array(50)
    const ret = solveKeplerArray(M, 0.8, out)
    expect(ret).toBe(out)
    expectClose(out, Array.from(M, (m) => solveKepler(m, 0.8)), { atol: 1e-15 }, 'E')
    const nu = trueAnomalyArray(M, 0.8, new Float64Array(50))
    expectClose(Array.from(nu, (v) => Math.cos(v)), Array.from(M, (m) => Math.cos(trueAnomaly(solveKepler(m, 0.8), 0.8))), { atol: 1e-14 }, 'cos ν')
  })

  it('true anomaly agrees with astronomia trueAnomaly and inverts', () => {
    // Reference: npm astronomia 4.2.0, kepler.trueAnomaly (Meeus eq. 30.1).
    for (const e of [0, 0.2, 0.6, 0.95]) {
      for (const E of [-3, -1, 0.1, 1.5, 3]) {
        expectClose(trueAnomaly(E, e), meeus.trueAnomaly(E, e), { atol: 1e-13 }, `ν(E=${E}, e=${e})`)
        expectClose(eccentricFromTrue(trueAnomaly(E, e), e), E, { atol: 1e-13 }, 'E round trip')
      }
    }
  })

  it('throws on an eccentricity outside [0, 1), naming it', () => {
    expect(() => solveKepler(1, 1)).toThrow(/e must be/)
    expect(() => solveKepler(1, -0.1)).toThrow(/e must be/)
    expect(() => solveKepler(NaN, 0.1)).toThrow(/M must be/)
  })
})

import { describe, it, expect } from 'vitest'
import { expectClose } from '../../helpers/expect-close.ts'
import { radialVelocity, radialVelocityAt, tpToTc, tcToTp, type Keplerian } from '../../../shared/rv/model.ts'
import { solveKepler, trueAnomaly } from '../../../shared/rv/kepler.ts'

const DEG = Math.PI / 180

describe('Keplerian model', () => {
  it('is K[cos(ν+ω) + e cos ω] with ν from the Kepler solver', () => {
    // Murray & Dermott 1999, Solar System Dynamics, eq. 2.110 form of the radial velocity.
    const o: Keplerian = { period: 17.3, K: 23, e: 0.45, omega: 2.1, tp: 100.2 }
    const t = Float64Array.from({ length: 40 }, (_, i) => 90 + i * 1.37)
    const v = radialVelocity(t, [o])
    const direct = Array.from(t, (x) => {
      const nu = trueAnomaly(solveKepler((2 * Math.PI * (x - o.tp)) / o.period, o.e), o.e)
      return o.K * (Math.cos(nu + o.omega) + o.e * Math.cos(o.omega))
    })
    expectClose(v, direct, { atol: 1e-11 }, 'v')
    expectClose(radialVelocityAt(t[7], o), direct[7], { atol: 1e-11 }, 'v(t7)')
  })

  it('adds Keplerians linearly and writes into a provided array', () => {
    const a: Keplerian = { period: 5, K: 10, e: 0, omega: 0, tp: 0 }
    const b: Keplerian = { period: 50, K: 3, e: 0.3, omega: 1, tp: 7 }
    const t = Float64Array.from({ length: 30 }, (_, i) => i * 2.1)
    const out = new Float64Array(30).fill(99)
    const sum = radialVelocity(t, [a, b], out)
    expect(sum).toBe(out)
    const sa = radialVelocity(t, [a]), sb = radialVelocity(t, [b])
    expectClose(sum, Array.from(sa, (x, i) => x + sb[i]), { atol: 1e-12 }, 'sum')
  })

  it('has zero mean velocity over an orbit (the e cos ω term makes it so)', () => {
    // Property of the Keplerian RV curve (Murray & Dermott 1999): time average of cos(ν+ω) is −e cos ω.
    const o: Keplerian = { period: 10, K: 5, e: 0.7, omega: 0.4, tp: 0 }
    const n = 20000
    const t = Float64Array.from({ length: n }, (_, i) => (i * o.period) / n)
    const v = radialVelocity(t, [o])
    expectClose(v.reduce((s, x) => s + x, 0) / n, 0, { atol: 1e-6 }, 'mean v')
  })

  it('Tp → Tc → Tp round-trips for any e and ω', () => {
    for (const e of [0, 0.1, 0.5, 0.9, 0.98]) {
      for (const wdeg of [0, 45, 90, 180, 270, 356]) {
        const tc = tpToTc(2454451.52, 380.85, e, wdeg * DEG)
        expectClose(tcToTp(tc, 380.85, e, wdeg * DEG), 2454451.52, { atol: 1e-8 }, `Tp(e=${e}, ω=${wdeg})`)
      }
    }
  })

  it('at Tc the star recedes least fast: ν + ω = π/2 and the velocity is falling', () => {
    // Convention (common practice): inferior conjunction of the planet where ν + ω★ = 90°.
    const o: Keplerian = { period: 30, K: 40, e: 0.4, omega: 1.3, tp: 12 }
    const tc = tpToTc(o.tp, o.period, o.e, o.omega)
    const nu = trueAnomaly(solveKepler((2 * Math.PI * (tc - o.tp)) / o.period, o.e), o.e)
    expectClose(Math.cos(nu + o.omega), 0, { atol: 1e-12 }, 'cos(ν+ω)')
    expect(Math.sin(nu + o.omega)).toBeGreaterThan(0)
    expect(radialVelocityAt(tc + 1e-3, o)).toBeLessThan(radialVelocityAt(tc - 1e-3, o))
  })

  it('circular orbit: Tc is a quarter period after Tp for ω = 0', () => {
    expectClose(tpToTc(0, 8, 0, 0), 2, { atol: 1e-12 }, 'Tc')
  })

  it('rejects bad orbits naming the field', () => {
    expect(() => radialVelocity(new Float64Array(3), [{ period: -1, K: 1, e: 0, omega: 0, tp: 0 }])).toThrow(/period/)
    expect(() => radialVelocity(new Float64Array(3), [{ period: 1, K: 1, e: 1, omega: 0, tp: 0 }])).toThrow(/\.e/)
    expect(() => tpToTc(0, 1, 1.2, 0)).toThrow(/e must be/)
  })
})

import { describe, it, expect } from 'vitest'
import { expectClose } from '../../helpers/expect-close.ts'
import { solveKepler, solveKeplerArray, wrapPi, KEPLER_TOLERANCE } from '../../../shared/rv/kepler.ts'
import { keplerSinCosArray } from '../../../shared/rv/kepler.ts'

// The array solver and the model's fast path use a per-e table of the equation (kepler.ts); these
// tests hold it to the same requirement as the scalar solver (issue 3 §2: |E − e sin E − M| < 1e-12
// for 0 ≤ e ≤ 0.99), checked directly on the equation with Math.sin.

/** Mean anomalies on a fine grid over several revolutions, plus the edges of the reduction. */
function grid(): Float64Array {
  const Ms: number[] = []
  for (let k = -4000; k <= 4000; k++) Ms.push((k * 3 * Math.PI) / 4000)
  for (const m of [0, 1e-300, 1e-15, 1e-12, 1e-9, 1e-6, 3e-4, 0.01]) Ms.push(m, -m, Math.PI - m, -Math.PI + m, 2 * Math.PI + m)
  Ms.push(Math.PI, -Math.PI, 25.1, -1000.3) // larger |M|: the residual's own rounding (ulp of M) exceeds 1e-12
  return Float64Array.from(Ms)
}

describe("Kepler's equation, tabled array form", () => {
  it('leaves |E − e sin E − M| < 1e-12 for 0 ≤ e ≤ 0.99 (every 0.005) and M near 0 and ±π, on M\'s revolution', () => {
    const M = grid()
    const out = new Float64Array(M.length)
    let worst = 0, worstRev = 0
    for (let ie = 0; ie <= 198; ie++) {
      const e = ie / 200
      solveKeplerArray(M, e, out)
      for (let i = 0; i < M.length; i++) {
        worst = Math.max(worst, Math.abs(out[i] - e * Math.sin(out[i]) - M[i]))
        worstRev = Math.max(worstRev, Math.abs(out[i] - M[i]) - e) // E − M = e sin E, so |E − M| ≤ e
      }
    }
    expect(worst).toBeLessThan(KEPLER_TOLERANCE)
    expect(worstRev).toBeLessThanOrEqual(1e-12)
  })

  it('still meets the tolerance above e = 0.99 (where the table hands hard points to the scalar solver)', () => {
    const M = grid()
    const out = new Float64Array(M.length)
    let worst = 0
    for (const e of [0.993, 0.995, 0.999, 0.9999, 0.999999]) {
      solveKeplerArray(M, e, out)
      for (let i = 0; i < M.length; i++) worst = Math.max(worst, Math.abs(out[i] - e * Math.sin(out[i]) - M[i]))
    }
    expect(worst).toBeLessThan(KEPLER_TOLERANCE)
  })

  it('agrees with the scalar solver to 1e-14 rad, for long and short arrays, with e changing between calls', () => {
    const M = grid()
    const out = new Float64Array(M.length)
    for (const e of [0.05, 0.6, 0.05, 0.97, 0.3]) {
      solveKeplerArray(M, e, out)
      let worst = 0
      for (let i = 0; i < M.length; i++) worst = Math.max(worst, Math.abs(out[i] - solveKepler(M[i], e)))
      expect(worst, `e = ${e}`).toBeLessThan(1e-14)
      const short = M.subarray(100, 107) // below the table's minimum length: solved point by point
      const outShort = solveKeplerArray(short, e, new Float64Array(7))
      expectClose(outShort, Array.from(short, (m) => solveKepler(m, e)), { atol: 1e-15 }, `short array, e = ${e}`)
    }
  })

  it('solves in place (out = M) and passes e = 0 through', () => {
    const M = Float64Array.from({ length: 40 }, (_, i) => i * 0.9 - 17)
    const want = Array.from(M, (m) => solveKepler(m, 0.4))
    expect(solveKeplerArray(M, 0.4, M)).toBe(M)
    expectClose(M, want, { atol: 1e-14 }, 'E in place')
    const M0 = Float64Array.from({ length: 40 }, (_, i) => i * 0.9 - 17)
    expectClose(solveKeplerArray(M0, 0, new Float64Array(40)), M0, { atol: 0 }, 'e = 0')
  })

  it('gives NaN for a NaN mean anomaly and finite values around it', () => {
    const M = Float64Array.from({ length: 20 }, (_, i) => (i === 7 ? NaN : i * 0.5))
    const out = solveKeplerArray(M, 0.5, new Float64Array(20))
    expect(Number.isNaN(out[7])).toBe(true)
    for (let i = 0; i < 20; i++) if (i !== 7) expect(Math.abs(out[i] - 0.5 * Math.sin(out[i]) - M[i])).toBeLessThan(KEPLER_TOLERANCE)
  })

  it('gives sin E and cos E for the RV model to 1e-15, for long and short arrays', () => {
    const M = grid()
    const Mr = M.map(wrapPi) // sin and cos of E on M's own revolution would lose digits for large |M|
    const sinE = new Float64Array(M.length), cosE = new Float64Array(M.length)
    for (const e of [0.01, 0.35, 0.8, 0.99]) {
      for (const n of [M.length, 9]) {
        keplerSinCosArray(M, n, e, sinE, cosE)
        const E = solveKeplerArray(Mr.subarray(0, n), e, new Float64Array(n))
        let worst = 0, worstRes = 0
        for (let i = 0; i < n; i++) {
          worst = Math.max(worst, Math.abs(sinE[i] - Math.sin(E[i])), Math.abs(cosE[i] - Math.cos(E[i])))
          worstRes = Math.max(worstRes, Math.abs(E[i] - e * sinE[i] - Mr[i]))
        }
        expect(worst, `e = ${e}, n = ${n}`).toBeLessThan(1e-15)
        expect(worstRes, `residual with the returned sin E, e = ${e}, n = ${n}`).toBeLessThan(KEPLER_TOLERANCE)
      }
    }
  })
})

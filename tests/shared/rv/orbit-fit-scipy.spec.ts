import { describe, it, expect } from 'vitest'
import { readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { expectClose } from '../../helpers/expect-close.ts'
import { fitKeplerians } from '../../../shared/rv/orbit-fit.ts'

// Reference: fixtures/fit/scipy-one-planet.json, written by scripts/reference/fit_reference.py with
// scipy's least_squares (method 'lm'); errors from inv(JᵀJ) of the whitened residuals (no jitter).
const ref = JSON.parse(readFileSync(fileURLToPath(new URL('../../../fixtures/fit/scipy-one-planet.json', import.meta.url)), 'utf8'))

describe('fit against scipy least_squares (fixtures/fit/scipy-one-planet.json)', () => {
  const [P, K, a, b, tc, off] = ref.start as number[]
  const e = a * a + b * b
  const data = {
    t: Float64Array.from(ref.data.t as number[]), y: Float64Array.from(ref.data.y as number[]), dy: Float64Array.from(ref.data.dy as number[]),
    instrument: new Int32Array(ref.data.t.length), instrumentNames: ['A'],
  }
  void off
  const fit = fitKeplerians(data, { planets: [{ period: P, K, e, omegaDeg: (Math.atan2(b, a) * 180) / Math.PI, tc }], jitter: [0] })
  const s = ref.solution

  it('reaches the same minimum χ²', () => {
    expect(fit.success).toBe(true)
    expectClose(fit.stats.chi2, s.chi2, { rtol: 1e-8 }, 'χ²')
  })

  it('gives the same parameters (to 1e-3 of their errors)', () => {
    const p = fit.planets[0]
    const [sP, sK, sa, sb, stc, soff] = s.params as number[]
    const [eP, eK, ea, eb, etc, eoff] = s.errors as number[]
    expectClose(p.period, sP, { atol: 1e-3 * eP }, 'P')
    expectClose(p.K, sK, { atol: 1e-3 * eK }, 'K')
    expectClose(p.secosw, sa, { atol: 1e-3 * ea }, '√e cos ω')
    expectClose(p.sesinw, sb, { atol: 1e-3 * eb }, '√e sin ω')
    const dtc = p.tc - stc - p.period * Math.round((p.tc - stc) / p.period)
    expectClose(dtc, 0, { atol: 1e-3 * etc }, 'Tc')
    expectClose(fit.instruments[0].offset, soff, { atol: 1e-3 * eoff }, 'offset')
  })

  it('gives the same 1σ errors (within 1 %) for P, K, Tc and the offset', () => {
    const [eP, eK, , , etc, eoff] = s.errors as number[]
    const u = fit.planets[0].uncertainty
    expectClose(u.period, eP, { rtol: 0.01 }, 'σP')
    expectClose(u.K, eK, { rtol: 0.01 }, 'σK')
    expectClose(u.tc, etc, { rtol: 0.01 }, 'σTc')
    expectClose(fit.instruments[0].offsetErr, eoff, { rtol: 0.01 }, 'σoffset')
  })
})

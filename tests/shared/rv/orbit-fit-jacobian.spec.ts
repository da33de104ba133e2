import { describe, it, expect } from 'vitest'
import { addKeplerian, type Keplerian } from '../../../shared/rv/model.ts'
import { keplerianPartials, keplerianPartialsBuffers } from '../../../shared/rv/model-partials.ts'
import { buildLayout } from '../../../shared/rv/orbit-fit-layout.ts'
import { createWorkspace, setWeights, residualVector, nGaussianPriors } from '../../../shared/rv/orbit-fit-objective.ts'
import { jacobian, jacobianByDifferences, jacobianScratch } from '../../../shared/rv/orbit-fit-jacobian.ts'
import type { FitOptions } from '../../../shared/rv/orbit-fit-types.ts'
import { synth } from './orbit-fit-helpers.ts'

// The analytic partials of one Keplerian against central differences of its velocity (model.ts, the
// readable reference), and the fitter's analytic Jacobian against its forward-difference reference,
// over every way the free vector can be laid out (both of √e cos ω, √e sin ω free; e or ω held; Tc or
// Tp held; e = 0 exactly; a Gaussian prior row; trends).

const t = Float64Array.from({ length: 40 }, (_, i) => 2455000 + i * 7.3 + 0.3 * Math.sin(i))
const velocity = (o: Keplerian): Float64Array => addKeplerian(t, o, new Float64Array(t.length))

describe('partials of one Keplerian', () => {
  for (const e of [0, 0.05, 0.4, 0.9]) {
    it(`match central differences of the velocity at e = ${e}`, () => {
      const o: Keplerian = { period: 37.2, K: 12, e, omega: 1.1, tp: 2455010 }
      const p = keplerianPartialsBuffers(t.length)
      keplerianPartials(t, o, p)
      const v0 = velocity(o)
      const diff = (key: keyof Keplerian, h: number): Float64Array => {
        const up = velocity({ ...o, [key]: o[key] + h }), dn = velocity({ ...o, [key]: o[key] - h })
        return up.map((u, i) => (u - dn[i]) / (2 * h))
      }
      // Tp ≈ 2.5e6 d: a step below ~1e-4 d is lost to rounding
      const dP = diff('period', 1e-6), dTp = diff('tp', 1e-4), dW = diff('omega', 1e-7)
      const dE = e > 0 ? diff('e', 1e-7) : null
      for (let i = 0; i < t.length; i++) {
        const scale = 12 * (1 + 30 / ((1 - e) ** 1.5))
        expect(Math.abs(p.v[i] - v0[i])).toBeLessThan(1e-9)
        expect(Math.abs(p.dK[i] * o.K - v0[i])).toBeLessThan(1e-9)
        expect(Math.abs(p.dM[i] * (-p.M[i] / o.period) - dP[i]), `∂v/∂P at ${i}`).toBeLessThan(1e-5 * scale * Math.abs(p.M[i]))
        expect(Math.abs(-p.dM[i] * 2 * Math.PI / o.period - dTp[i]), `∂v/∂Tp at ${i}`).toBeLessThan(1e-6 * scale)
        expect(Math.abs(p.dw[i] - dW[i]), `∂v/∂ω at ${i}`).toBeLessThan(1e-5 * scale)
        if (dE) expect(Math.abs(p.de[i] - dE[i]), `∂v/∂e at ${i}`).toBeLessThan(1e-4 * scale)
      }
    })
  }
})

describe('Jacobian of the fit', () => {
  const { data } = synth({
    seed: 5, n: 60, baseline: 900,
    planets: [{ period: 37.2, K: 12, e: 0.3, omega: 1.1, tp: 2455010 }, { period: 211, K: 20, e: 0.6, omega: -2.5, tp: 2455100 }],
    instruments: [{ name: 'A', offset: 0, jitter: 1, err: [1, 2] }, { name: 'B', offset: 30, jitter: 2, err: [2, 3] }],
  })
  const planets = [
    { period: 37.0, K: 11, e: 0.25, omegaDeg: 70, tc: 2455020 },
    { period: 214, K: 18, e: 0.55, omegaDeg: -140, tc: 2455150 },
  ]
  const cases: Array<[string, Partial<FitOptions>, ((p: typeof planets) => unknown[])?]> = [
    ['all free, no trend', {}],
    ['quadratic trend', { trend: 'quadratic' }],
    ['e held', {}, (p) => [{ ...p[0], fix: ['e'] }, p[1]]],
    ['ω held', {}, (p) => [{ ...p[0], fix: ['omegaDeg'] }, p[1]]],
    ['Tp held, P held', {}, (p) => [{ ...p[0], tc: undefined, tp: 2455005, fix: ['tp', 'period'] }, p[1]]],
    ['e = 0 with √e cos ω, √e sin ω free (differenced)', {}, (p) => [{ ...p[0], e: 0, omegaDeg: 0 }, p[1]]],
    ['circular, e and ω held', { trend: 'linear' }, (p) => [{ ...p[0], e: 0, fix: ['e', 'omegaDeg'] }, p[1]]],
    ['Gaussian prior on ω and on P', { priors: [{ planet: 1, param: 'omegaDeg', gaussian: { mu: -150, sigma: 20 } }, { planet: 0, param: 'period', gaussian: { mu: 37.1, sigma: 0.2 } }] }],
  ]
  for (const [name, extra, shape] of cases) {
    it(`analytic columns agree with forward differences: ${name}`, () => {
      const opts = { planets: (shape ? shape(planets) : planets), ...extra } as FitOptions
      const { layout: L, x0 } = buildLayout(data, opts)
      const ws = createWorkspace(L)
      setWeights(L, ws, [1.5, 2.5])
      const m = L.n + nGaussianPriors(L)
      const r = new Float64Array(m), kep = new Float64Array(L.n)
      expect(Number.isFinite(residualVector(L, ws, x0, r, kep))).toBe(true)
      const Ja = new Float64Array(m * L.nFree), Jd = new Float64Array(m * L.nFree)
      jacobian(L, ws, x0, r, Ja, jacobianScratch(L))
      jacobianByDifferences(L, ws, x0, r, Jd, jacobianScratch(L))
      for (let j = 0; j < L.nFree; j++) {
        let norm = 0, err = 0
        for (let i = 0; i < m; i++) { norm += Jd[j * m + i] ** 2; err += (Ja[j * m + i] - Jd[j * m + i]) ** 2 }
        // forward differences with the fitter's steps are good to ~1e-4 of the column
        expect(Math.sqrt(err), `column ${j}`).toBeLessThan(2e-4 * Math.sqrt(norm) + 1e-9)
      }
    })
  }
})

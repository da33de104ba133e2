import { describe, it, expect } from 'vitest'
import { createLogPosterior, specFromFit, samplingScales } from '../../../shared/rv/posterior.ts'
import { runEnsemble } from '../../../shared/rv/sampler.ts'
import { integratedTime } from '../../../shared/rv/diagnostics.ts'
import { fitKeplerians } from '../../../shared/rv/orbit-fit.ts'
import { radialVelocity, tcToTp } from '../../../shared/rv/model.ts'
import { createRandom } from '../../../shared/math/random.ts'
import { expectClose } from '../../helpers/expect-close.ts'
import { synth } from './orbit-fit-helpers.ts'

const DEG = Math.PI / 180

const two = synth({
  seed: 31, n: 120, baseline: 800,
  planets: [{ period: 12.3, K: 15, e: 0.2, omega: 1.1, tp: 2455003 }, { period: 95, K: 9, e: 0.4, omega: 4.0, tp: 2455040 }],
  instruments: [{ name: 'A', offset: 4, jitter: 2, err: [1, 2] }, { name: 'B', offset: -7, jitter: 3, err: [2, 3] }],
  slope: 0.01, curvature: 1e-5,
})

describe('RV log-posterior', () => {
  it('names and orders the sampling coordinates', () => {
    const post = createLogPosterior(two.data, { planets: [{ period: 12.3, K: 15, tc: 2455000 }, { period: 95, K: 9, tc: 2455000 }], trend: 'quadratic' })
    expect(post.names).toEqual([
      'ln P b', 'ln K b', '√e cos ω b', '√e sin ω b', 'Tc b', 'ln P c', 'ln K c', '√e cos ω c', '√e sin ω c', 'Tc c',
      'offset A', 'offset B', 'ln jitter A', 'ln jitter B', 'slope', 'curvature',
    ])
    expect(post.nDim).toBe(16)
  })

  it('leaves out the parameters a model fixes, and gives the same ln posterior at the same point', () => {
    const base = { period: 12.31, K: 14, e: 0.25, omegaDeg: 60, tc: 2455001 }
    const other = { period: 94, K: 10, e: 0.35, omegaDeg: 230, tc: 2455020 }
    const full = createLogPosterior(two.data, { planets: [base, other], offsets: [3, -6], jitters: [1.5, 2.5] })
    const cases = [
      { fix: ['e'] as const, names: ['ln P b', 'ln K b', 'ω b', 'Tc b'] },
      { fix: ['omegaDeg'] as const, names: ['ln P b', 'ln K b', 'e b', 'Tc b'] },
      { fix: ['e', 'omegaDeg', 'tc'] as const, names: ['ln P b', 'ln K b'] },
      { fix: ['period', 'K'] as const, names: ['√e cos ω b', '√e sin ω b', 'Tc b'] },
    ]
    for (const c of cases) {
      const post = createLogPosterior(two.data, { planets: [{ ...base, fix: [...c.fix] }, other], offsets: [3, -6], jitters: [1.5, 2.5] })
      expect(post.names.slice(0, c.names.length)).toEqual(c.names)
      expect(post.nDim).toBe(full.nDim - (5 - c.names.length))
      // the Jacobian terms of fixed ln P, ln K are constants left out: compare the likelihoods, and the priors up to them
      expectClose(post.logLikelihood(post.centre), full.logLikelihood(full.centre), { rtol: 1e-9 }, `ln L with ${c.fix.join(', ')} fixed`)
    }
    // e fixed at 0: no eccentricity coordinate at all (ω means nothing)
    const circ = createLogPosterior(two.data, { planets: [{ ...base, e: 0, fix: ['e'] }, other] })
    expect(circ.names.slice(0, 3)).toEqual(['ln P b', 'ln K b', 'Tc b'])
    // ω sampled alone stays on one turn of the circle around its centre
    const post = createLogPosterior(two.data, { planets: [{ ...base, fix: ['e'] }, other] })
    const x = Float64Array.from(post.centre)
    x[2] = 60 * DEG + Math.PI + 1e-6
    expect(post.logProb(x)).toBe(-Infinity)
    expect(() => createLogPosterior(two.data, { planets: [{ ...base, fix: ['mass' as never] }] })).toThrow(/fix: unknown parameter mass/)
  })

  it('has the Ford 2006 likelihood: equals a direct evaluation with the model code', () => {
    const epoch = 2455400
    const spec = {
      planets: [{ period: 12.31, K: 14, e: 0.25, omegaDeg: 60, tc: 2455001 }, { period: 94, K: 10, e: 0.35, omegaDeg: 230, tc: 2455020 }],
      trend: 'quadratic' as const, epoch, offsets: [3, -6], jitters: [1.5, 2.5], slope: 0.02, curvature: -2e-5,
    }
    const post = createLogPosterior(two.data, spec)
    const orbits = spec.planets.map((p) => ({ period: p.period, K: p.K, e: p.e, omega: p.omegaDeg * DEG, tp: tcToTp(p.tc, p.period, p.e, p.omegaDeg * DEG) }))
    const v = radialVelocity(two.data.t, orbits)
    let ll = 0
    for (let i = 0; i < v.length; i++) {
      const k = two.data.instrument[i]
      const dt = two.data.t[i] - epoch
      const r = two.data.y[i] - v[i] - spec.offsets[k] - spec.slope * dt - spec.curvature * dt * dt
      const V = two.data.dy[i] ** 2 + spec.jitters[k] ** 2
      ll += -0.5 * (r * r / V + Math.log(2 * Math.PI * V))
    }
    // rtol 1e-9: the centre carries Tc shifted by whole periods to the epoch and ω through
    // atan2(√e sin ω, √e cos ω); both round at ~1e-10 of a day/radian
    expectClose(post.logLikelihood(post.centre), ll, { rtol: 1e-9 }, 'ln L')
    // default priors: flat in P, K, s → Jacobian ln P + ln K + ln s per parameter
    const jac = Math.log(12.31) + Math.log(14) + Math.log(94) + Math.log(10) + Math.log(1.5) + Math.log(2.5)
    expectClose(post.logPrior(post.centre), jac, { rtol: 1e-12 }, 'ln prior')
    expectClose(post.logProb(post.centre), ll + jac, { rtol: 1e-9 }, 'ln posterior')
  })

  it("equals the fitter's ln L at its maximum-likelihood point", () => {
    const fit = fitKeplerians(two.data, {
      planets: [{ period: 12.3, K: 15, e: 0.2, omegaDeg: 63, tp: 2455003 }, { period: 95, K: 9, e: 0.4, omegaDeg: 229, tp: 2455040 }],
      trend: 'quadratic',
    })
    expect(fit.success).toBe(true)
    const post = createLogPosterior(two.data, specFromFit(fit))
    expectClose(post.logLikelihood(post.centre), fit.stats.lnL, { rtol: 1e-10 }, 'ln L')
    const sc = samplingScales(fit, post)
    for (const s of sc) expect(s).toBeGreaterThan(0)
    // ln P scale is σ_P / P
    expectClose(sc[0], fit.planets[0].uncertainty.period / fit.planets[0].period, { rtol: 1e-12 }, 'σ ln P')
  })

  it('maps (e, ω) → (√e cos ω, √e sin ω) with the constant Jacobian ½ (finite differences)', () => {
    for (const [e, w] of [[0.1, 0.3], [0.5, 2.5], [0.9, -1.2]]) {
      const h = 1e-6
      const f = (ee: number, ww: number) => [Math.sqrt(ee) * Math.cos(ww), Math.sqrt(ee) * Math.sin(ww)]
      const de = [f(e + h, w), f(e - h, w)], dw = [f(e, w + h), f(e, w - h)]
      const J = [[(de[0][0] - de[1][0]) / (2 * h), (dw[0][0] - dw[1][0]) / (2 * h)], [(de[0][1] - de[1][1]) / (2 * h), (dw[0][1] - dw[1][1]) / (2 * h)]]
      expectClose(J[0][0] * J[1][1] - J[0][1] * J[1][0], 0.5, { rtol: 1e-8 }, `det at e=${e}`)
    }
  })

  it('rejects points outside the bounds and stated uniform priors', () => {
    const post = createLogPosterior(two.data, {
      planets: [{ period: 12.3, K: 15, e: 0.2, omegaDeg: 60, tc: 2455001 }],
      priors: [{ planet: 0, param: 'period', uniform: { min: 12, max: 12.5 } }], eMax: 0.9,
    })
    const x = Float64Array.from(post.centre)
    expect(Number.isFinite(post.logProb(x))).toBe(true)
    x[2] = 0.8; x[3] = 0.6 // e = 1
    expect(post.logProb(x)).toBe(-Infinity)
    x[2] = 0.9; x[3] = 0.2 // e = 0.85 < eMax
    expect(Number.isFinite(post.logProb(x))).toBe(true)
    x[2] = 0.9; x[3] = 0.3 // e = 0.9 = eMax
    expect(post.logProb(x)).toBe(-Infinity)
    const y = Float64Array.from(post.centre)
    y[0] = Math.log(12.6)
    expect(post.logProb(y)).toBe(-Infinity)
    y[0] = NaN
    expect(post.logProb(y)).toBe(-Infinity)
  })

  it('throws on misuse, naming the field', () => {
    const p = { period: 10, K: 5, tc: 2455000 }
    expect(() => createLogPosterior(two.data, { planets: [{ ...p, period: -1 }] })).toThrow(/planets\[0\]\.period/)
    expect(() => createLogPosterior(two.data, { planets: [{ ...p, K: 0 }] })).toThrow(/planets\[0\]\.K/)
    expect(() => createLogPosterior(two.data, { planets: [{ period: 10, K: 5 }] })).toThrow(/tc or tp/)
    expect(() => createLogPosterior(two.data, { planets: [p], jitter: [1] })).toThrow(/jitter/)
    expect(() => createLogPosterior(two.data, { planets: [p], priors: [{ planet: 0, param: 'e', uniform: { min: 0, max: 1 }, gaussian: { mu: 0, sigma: 1 } }] })).toThrow(/priors\[0\]/)
    expect(() => createLogPosterior(two.data, { planets: [p], priors: [{ planet: 3, param: 'e', gaussian: { mu: 0, sigma: 1 } }] })).toThrow(/priors\[0\]\.planet/)
    expect(() => createLogPosterior(two.data, { planets: [p], priors: [{ instrument: 0, param: 'jitter', logUniform: { min: 0, max: 1 } }] })).toThrow(/logUniform/)
    expect(() => createLogPosterior(two.data, { planets: [p], eMax: 1 })).toThrow(/eMax/)
  })
})

describe('priors mean what they say (prior-only sampling in the sampling coordinates)', () => {
  // The sampler explores ln P, ln K, √e cos ω, √e sin ω, ln s; with the Jacobian terms the draws,
  // mapped back, must follow the priors stated on P, K, e, ω and s. Checks: moments of uniform,
  // log-uniform and Gaussian laws (exact formulas), within 5 Monte-Carlo standard errors with
  // N_eff = N/τ.
  const one = synth({ seed: 5, n: 20, baseline: 200, planets: [{ period: 10, K: 5, e: 0, omega: 0, tp: 2455000 }] })
  const run = (priors: Parameters<typeof createLogPosterior>[1]['priors']) => {
    const post = createLogPosterior(one.data, {
      planets: [{ period: 15, K: 5, e: 0.3, omegaDeg: 40, tc: 2455100 }], epoch: 2455100, offsets: [0], jitters: [1.5], eMax: 0.99,
      priors: [...(priors ?? []), { planet: 0, param: 'tc', uniform: { min: 2455095, max: 2455105 } }, { instrument: 0, param: 'offset', uniform: { min: -1, max: 1 } }],
    })
    const nW = 32, d = post.nDim, steps = 2500, burn = 500
    const r = createRandom(77)
    const start = Float64Array.from({ length: nW * d }, (_, i) => post.centre[i % d] + 0.01 * r.normal())
    const res = runEnsemble({ logProb: post.logPrior, nDim: d, nWalkers: nW, start, steps, random: 3 })
    const ch = res.chain.subarray(burn * nW * d)
    const nS = steps - burn
    const tau = integratedTime(ch, { nSteps: nS, nWalkers: nW, nDim: d })
    const col = (f: (x: Float64Array) => number) => {
      const v = new Float64Array(nS * nW)
      for (let i = 0; i < v.length; i++) v[i] = f(ch.subarray(i * d, (i + 1) * d))
      return v
    }
    const nEff = (nS * nW) / Math.max(...tau)
    return { col, nEff }
  }
  const moments = (v: Float64Array) => {
    let m = 0
    for (const x of v) m += x / v.length
    let s = 0
    for (const x of v) s += (x - m) ** 2 / (v.length - 1)
    return { mean: m, sd: Math.sqrt(s) }
  }
  const check = (v: Float64Array, mean: number, sd: number, nEff: number, label: string) => {
    const m = moments(v)
    expectClose(m.mean, mean, { atol: 5 * sd / Math.sqrt(nEff) }, `${label} mean`)
    expectClose(m.sd, sd, { atol: 5 * sd * Math.sqrt(0.5 / nEff) * 1.5 }, `${label} sd`)
  }

  it('uniform P, K, e, ω and jitter come out uniform', () => {
    const { col, nEff } = run([
      { planet: 0, param: 'period', uniform: { min: 10, max: 20 } },
      { planet: 0, param: 'K', uniform: { min: 1, max: 9 } },
      { instrument: 0, param: 'jitter', uniform: { min: 0.5, max: 3 } },
    ])
    const u = (a: number, b: number) => [(a + b) / 2, (b - a) / Math.sqrt(12)] as const
    check(col((x) => Math.exp(x[0])), ...u(10, 20), nEff, 'P')
    check(col((x) => Math.exp(x[1])), ...u(1, 9), nEff, 'K')
    check(col((x) => x[2] * x[2] + x[3] * x[3]), ...u(0, 0.99), nEff, 'e')
    check(col((x) => Math.atan2(x[3], x[2])), ...u(-Math.PI, Math.PI), nEff, 'ω')
    check(col((x) => Math.exp(x[6])), ...u(0.5, 3), nEff, 'jitter')
  })

  it('log-uniform K and Gaussian e come out as stated', () => {
    const { col, nEff } = run([
      { planet: 0, param: 'period', uniform: { min: 10, max: 20 } },
      { planet: 0, param: 'K', logUniform: { min: 1, max: 100 } },
      { planet: 0, param: 'e', gaussian: { mu: 0.3, sigma: 0.05 } },
      { instrument: 0, param: 'jitter', logUniform: { min: 0.1, max: 10 } },
    ])
    const lnU = (a: number, b: number) => [(Math.log(a) + Math.log(b)) / 2, (Math.log(b) - Math.log(a)) / Math.sqrt(12)] as const
    check(col((x) => x[1]), ...lnU(1, 100), nEff, 'ln K')
    check(col((x) => x[6]), ...lnU(0.1, 10), nEff, 'ln s')
    check(col((x) => x[2] * x[2] + x[3] * x[3]), 0.3, 0.05, nEff, 'e')
  })
})

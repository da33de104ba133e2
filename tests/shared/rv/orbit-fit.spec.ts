import { describe, it, expect } from 'vitest'
import { expectClose } from '../../helpers/expect-close.ts'
import { fitKeplerians, jitterMle, E_MAX } from '../../../shared/rv/orbit-fit.ts'
import { tpToTc } from '../../../shared/rv/model.ts'
import { synth, withinSigma } from './orbit-fit-helpers.ts'

const DEG = Math.PI / 180
const truth = { period: 37.3, K: 12, e: 0.35, omega: 65 * DEG, tp: 2455010 }
const start = { period: 37.25, K: 10, e: 0.3, omegaDeg: 60, tc: tpToTc(truth.tp, truth.period, truth.e, truth.omega) + 0.5 }

describe('Keplerian fit (maximum likelihood, jitter in quadrature — Ford 2006)', () => {
  const { data, epoch } = synth({
    seed: 11, n: 200, baseline: 900, planets: [truth],
    instruments: [
      { name: 'A', offset: -10, jitter: 1, err: [1, 2] },
      { name: 'B', offset: 30, jitter: 4, err: [1.5, 3] },
    ],
  })
  const fit = fitKeplerians(data, { planets: [start], epoch })

  it('converges and recovers the injected orbit within 3σ of its own errors', () => {
    expect(fit.success).toBe(true)
    expect(fit.status).toBe('converged')
    const p = fit.planets[0]
    expect(withinSigma(p.period, truth.period, p.uncertainty.period)).toBe(true)
    expect(withinSigma(p.K, truth.K, p.uncertainty.K)).toBe(true)
    expect(withinSigma(p.e, truth.e, p.uncertainty.e)).toBe(true)
    expect(withinSigma(p.omegaDeg, 65, p.uncertainty.omegaDeg)).toBe(true)
    const dtp = p.tp - truth.tp - truth.period * Math.round((p.tp - truth.tp) / truth.period)
    expect(Math.abs(dtp)).toBeLessThan(3 * p.uncertainty.tp)
  })

  it('recovers per-instrument offsets and jitters', () => {
    const [a, b] = fit.instruments
    expect(withinSigma(a.offset, -10, a.offsetErr)).toBe(true)
    expect(withinSigma(b.offset, 30, b.offsetErr)).toBe(true)
    expect(withinSigma(b.jitter, 4, b.jitterErr)).toBe(true)
    expect(a.jitter).toBeLessThan(2.5)
    expect(a.n + b.n).toBe(200)
  })

  it('−2 ln L never rises across accepted steps and jitter updates', () => {
    // Invariant of the optimiser (accept only downhill LM steps; exact 1-D jitter maxima).
    for (let i = 1; i < fit.history.length; i++) expect(fit.history[i]).toBeLessThanOrEqual(fit.history[i - 1] + 1e-9 * Math.abs(fit.history[i - 1]))
    expectClose(fit.history[fit.history.length - 1], -2 * fit.stats.lnL, { rtol: 1e-9 }, 'final −2lnL')
  })

  it('reports the statistics consistently', () => {
    const s = fit.stats
    expect(s.nPoints).toBe(200)
    expect(s.nParams).toBe(5 + 2 + 2)
    expectClose(s.bic, s.nParams * Math.log(200) - 2 * s.lnL, { rtol: 1e-12 }, 'BIC')
    expectClose(s.aic, 2 * s.nParams - 2 * s.lnL, { rtol: 1e-12 }, 'AIC')
    expectClose(s.reducedChi2, s.chi2 / (200 - 9), { rtol: 1e-12 }, 'reduced χ²')
    // with ML jitters χ² is close to N (common practice: the jitter absorbs the excess scatter)
    expect(s.chi2).toBeGreaterThan(150)
    expect(s.chi2).toBeLessThan(250)
    let ss = 0
    for (const r of fit.residuals) ss += r * r
    expectClose(s.rms, Math.sqrt(ss / 200), { rtol: 1e-12 }, 'rms')
  })

  it('the 1-D jitter maximum solves d lnL/ds = 0', () => {
    const r = [3, -2, 4, -5, 1, 0.5], dy = [1, 1, 2, 1, 1.5, 1]
    const s = jitterMle(r, dy, [0, 1, 2, 3, 4, 5])
    const lnL = (j: number): number => r.reduce((acc, ri, i) => acc - 0.5 * (ri * ri / (dy[i] ** 2 + j * j) + Math.log(dy[i] ** 2 + j * j)), 0)
    expect(lnL(s)).toBeGreaterThan(lnL(s * 1.01))
    expect(lnL(s)).toBeGreaterThan(lnL(s * 0.99))
    expect(jitterMle([0.1, -0.1], [1, 1], [0, 1])).toBe(0)
    // the derivative vanishes there, from any start (Newton inside its bracket)
    const g = (j: number): number => r.reduce((acc, ri, i) => { const V = dy[i] ** 2 + j * j; return acc + ri * ri / (V * V) - 1 / V }, 0)
    for (const start of [undefined, 0.01, s, 2.5, 100]) {
      const t = jitterMle(r, dy, [0, 1, 2, 3, 4, 5], start)
      expect(Math.abs(t - s), `start ${start}`).toBeLessThan(1e-9 * s)
      expect(Math.abs(g(t))).toBeLessThan(1e-10)
    }
  })

  it('holds fixed parameters fixed and reports zero error for them', () => {
    const f = fitKeplerians(data, { planets: [{ ...start, period: 37.3, e: 0.35, omegaDeg: 65, fix: ['period', 'e', 'omegaDeg'] }], epoch })
    const p = f.planets[0]
    expect(p.period).toBe(37.3)
    expectClose(p.e, 0.35, { atol: 1e-15 }, 'e')
    expectClose(p.omegaDeg, 65, { atol: 1e-12 }, 'ω')
    expect(p.uncertainty.period).toBe(0)
    expect(f.stats.nParams).toBe(2 + 2 + 2)
  })

  it('a circular fit (e fixed at 0) has no eccentricity parameters', () => {
    const f = fitKeplerians(data, { planets: [{ ...start, e: 0, fix: ['e'] }], epoch })
    expect(f.planets[0].e).toBe(0)
    expect(f.stats.nParams).toBe(3 + 2 + 2)
  })

  it('a tight Gaussian prior pulls the parameter to its mean; a uniform prior bounds it', () => {
    const g = fitKeplerians(data, { planets: [start], epoch, priors: [{ planet: 0, param: 'period', gaussian: { mu: 37.2, sigma: 1e-4 } }] })
    expectClose(g.planets[0].period, 37.2, { atol: 5e-4 }, 'P with prior')
    expect(g.planets[0].uncertainty.period).toBeLessThan(1.1e-4)
    expect(g.stats.lnPosterior).not.toBe(g.stats.lnL)
    const u = fitKeplerians(data, { planets: [{ ...start, K: 9 }], epoch, priors: [{ planet: 0, param: 'K', uniform: { min: 0, max: 10 } }] })
    expect(u.planets[0].K).toBeLessThanOrEqual(10)
    expect(u.planets[0].K).toBeGreaterThan(9.5)
  })

  it('fixed jitters are used as given and not counted as parameters', () => {
    const f = fitKeplerians(data, { planets: [start], epoch, jitter: [1, 4] })
    expect(f.instruments.map((i) => i.jitter)).toEqual([1, 4])
    expect(f.stats.nParams).toBe(7)
  })

  it('keeps e below its bound', () => {
    const f = fitKeplerians(data, { planets: [{ ...start, e: 0.98 }], epoch, maxIterations: 3 })
    expect(f.planets[0].e).toBeLessThanOrEqual(E_MAX + 1e-12)
  })

  it('returns failed (not a guess) when there are fewer points than parameters', () => {
    const small = { ...data, t: data.t.slice(0, 6), y: data.y.slice(0, 6), dy: data.dy.slice(0, 6), instrument: data.instrument.slice(0, 6) }
    const f = fitKeplerians(small, { planets: [start] })
    expect(f.success).toBe(false)
    expect(f.status).toBe('failed')
    expect(f.message).toMatch(/too few points/)
  })

  it('throws on misuse naming the parameter', () => {
    expect(() => fitKeplerians(data, { planets: [{ ...start, period: -1 }] })).toThrow(/planets\[0\]\.period/)
    expect(() => fitKeplerians(data, { planets: [{ period: 3, K: 1 }] })).toThrow(/tc or tp/)
    expect(() => fitKeplerians(data, { planets: [start], jitter: [1] })).toThrow(/jitter/)
    expect(() => fitKeplerians(data, { planets: [start], trend: 'cubic' as never })).toThrow(/trend/)
  })
})

describe('fit with a trend', () => {
  it('recovers a linear and a quadratic trend about the stated epoch', () => {
    const { data, epoch } = synth({ seed: 5, n: 150, baseline: 1500, planets: [{ period: 11.1, K: 8, e: 0, omega: 0, tp: 2455003 }], slope: 0.02, curvature: 1e-5 })
    const f = fitKeplerians(data, { planets: [{ period: 11.1, K: 7, tc: tpToTc(2455003, 11.1, 0, 0) }], trend: 'quadratic', epoch })
    expect(f.success).toBe(true)
    expect(f.trend?.epoch).toBe(epoch)
    expect(withinSigma(f.trend!.slope, 0.02, f.trend!.slopeErr)).toBe(true)
    expect(withinSigma(f.trend!.curvature, 1e-5, f.trend!.curvatureErr)).toBe(true)
  })
})

import { describe, it, expect } from 'vitest'
import { fitKeplerians, fitWithGp, gpLogPosterior, trainGpOnIndicator, indicatorDiagnostics } from '../../../../shared/rv/index.ts'
import { spottedStar, STAR } from './spotted-star.ts'

// The seeded synthetic spotted star (./spotted-star.ts): a 12.3-d planet (K = 7 m/s) and rotational
// activity at 23.5 d in the velocities and in a bisector-like indicator; two instruments.
describe('planets + GP on a spotted star', () => {
  const star = spottedStar(1, 160, 420, true)
  const white = fitKeplerians(star.data, { planets: [{ period: 12.3, K: 5, e: 0.05, omegaDeg: 60, tc: 2459003 }] })
  const bis = indicatorDiagnostics(star.data, { name: 'bisector', value: star.bisector, error: star.bisectorError })
  const prot = bis.peaks[0].period
  const start = { period: white.planets[0].period, K: white.planets[0].K, e: white.planets[0].e, omegaDeg: white.planets[0].omegaDeg, tc: white.planets[0].tc }
  const gp = fitWithGp(star.data, { planets: [start], gp: { kernel: 'rotation', period: { value: prot, source: 'bisector periodogram' }, amplitude: { perInstrument: false } } })

  it('converges and recovers K within its error', () => {
    expect(gp.success, gp.message).toBe(true)
    const p = gp.planets[0]
    expect(Math.abs(p.period - STAR.planet.period)).toBeLessThan(3 * p.uncertainty.period)
    expect(Math.abs(p.K - STAR.planet.K)).toBeLessThan(p.uncertainty.K)
    expect(p.uncertainty.K).toBeLessThan(0.3 * p.K)
  })

  it('finds the rotation period and is preferred over white noise by BIC', () => {
    expect(Math.abs(gp.noise.kernel.period - STAR.rotation.period)).toBeLessThan(1.5)
    expect(gp.stats.bic).toBeLessThan(white.stats.bic - 10)
  })

  it('states its priors and gives the activity at each row', () => {
    expect(gp.priors[0]).toMatch(/rotation period ~ N\(.* \(from bisector periodogram\)/)
    expect(gp.activity.length).toBe(160)
    let r = 0, a2 = 0, b2 = 0
    for (let i = 0; i < 160; i++) { r += gp.activity[i] * star.activity[i]; a2 += gp.activity[i] ** 2; b2 += star.activity[i] ** 2 }
    expect(r / Math.sqrt(a2 * b2)).toBeGreaterThan(0.8)
  })

  it('trains on an indicator first and reuses its kernel for the velocities', () => {
    const trained = trainGpOnIndicator(star.data, star.bisector, star.bisectorError, { kernel: 'rotation', period: { value: prot } })
    expect(trained.success, trained.message).toBe(true)
    expect(Math.abs(trained.noise.kernel.period - STAR.rotation.period)).toBeLessThan(1.5)
    const k = trained.noise.kernel
    if (k.kind !== 'rotation') throw new Error('rotation kernel expected')
    const fixed = fitWithGp(star.data, {
      planets: [start],
      gp: { kernel: 'rotation', period: { value: k.period, fixed: true, source: 'trained on bisector' }, decayTime: { value: k.decayTime, fixed: true }, shape: { value: k.shape, fixed: true } },
    })
    expect(fixed.success, fixed.message).toBe(true)
    expect(Math.abs(fixed.planets[0].K - STAR.planet.K)).toBeLessThan(2 * fixed.planets[0].uncertainty.K)
    expect(fixed.priors[0]).toMatch(/fixed at/)
  })

  it('the same star without indicators still fits with a GP (period from the user)', () => {
    const g = fitWithGp(star.data, { planets: [start], gp: { kernel: 'rotation', period: { value: 25, sigma: 5, source: 'user' } } })
    expect(g.success, g.message).toBe(true)
    expect(Math.abs(g.planets[0].K - STAR.planet.K)).toBeLessThan(2 * g.planets[0].uncertainty.K)
  })

  it('refuses a decay time shorter than half the rotation period, naming it', () => {
    expect(() => fitWithGp(star.data, { planets: [start], gp: { kernel: 'rotation', period: { value: 23 }, decayTime: { value: 5 } } })).toThrow(/gp.decayTime.value must exceed half/)
  })
})

describe('planets + GP with fixed planet parameters and priors on the planet', () => {
  const star = spottedStar(1, 160, 420, true)
  const start = { period: 12.3, K: 6, e: 0.05, omegaDeg: 60, tc: 2459003 }
  const gp = { kernel: 'rotation' as const, period: { value: 23.5 } }
  const free = fitWithGp(star.data, { planets: [start], gp })
  const pf = free.planets[0]

  it('holds a fixed period at its value (error 0, the mark of "fixed"), with K within its error of the free fit', () => {
    const r = fitWithGp(star.data, { planets: [{ ...start, period: STAR.planet.period, fix: ['period'] }], gp })
    expect(r.success, r.message).toBe(true)
    const p = r.planets[0]
    expect(p.period).toBe(STAR.planet.period)
    expect(p.uncertainty.period).toBe(0)
    expect(p.uncertainty.K).toBeGreaterThan(0)
    expect(Math.abs(p.K - pf.K)).toBeLessThan(pf.uncertainty.K)
    expect(r.stats.nParams).toBe(free.stats.nParams - 1)
    expect(r.priors.join('; ')).toMatch(/planet 1 period fixed at 12\.3 d/)
  })

  it('a tight Gaussian prior on P pulls P to the prior centre, and the priors text states it', () => {
    const mu = pf.period + 3 * pf.uncertainty.period, sigma = pf.uncertainty.period / 10
    const r = fitWithGp(star.data, { planets: [start], gp, priors: [{ planet: 0, param: 'period', gaussian: { mu, sigma } }] })
    expect(r.success, r.message).toBe(true)
    const p = r.planets[0]
    expect(Math.abs(p.period - mu)).toBeLessThan(sigma)
    // near a Gaussian likelihood in P the MAP is the precision-weighted mean of the free fit and the prior
    const w = [1 / pf.uncertainty.period ** 2, 1 / sigma ** 2]
    expect(Math.abs(p.period - (w[0] * pf.period + w[1] * mu) / (w[0] + w[1]))).toBeLessThan(0.2 * sigma)
    expect(p.uncertainty.period).toBeCloseTo(1 / Math.sqrt(w[0] + w[1]), 4)
    expect(r.priors[0]).toMatch(/^rotation period/)
    expect(r.priors.join('; ')).toContain(`planet 1 period ~ N(${mu}, ${sigma}²) d`)
  })

  it('a uniform prior on e keeps e inside its box', () => {
    const r = fitWithGp(star.data, { planets: [start], gp, priors: [{ planet: 0, param: 'e', uniform: { min: 0, max: 0.08 } }] })
    expect(r.success, r.message).toBe(true)
    expect(pf.e).toBeGreaterThan(0.08)
    expect(r.planets[0].e).toBeLessThanOrEqual(0.08)
    // e rests on the box's edge: held there for the errors, the other elements keep theirs
    expect(r.planets[0].uncertainty.K).toBeGreaterThan(0)
    expect(r.priors.join('; ')).toContain('planet 1 e uniform on [0, 0.08]')
  })

  it('fixing e = 0 gives a circular orbit (e and ω marked fixed)', () => {
    const r = fitWithGp(star.data, { planets: [{ ...start, e: 0, fix: ['e'] }], gp })
    expect(r.success, r.message).toBe(true)
    const p = r.planets[0]
    expect(p.e).toBe(0)
    expect(p.uncertainty.e).toBe(0)
    expect(p.uncertainty.omegaDeg).toBe(0)
    expect(Math.abs(p.K - pf.K)).toBeLessThan(pf.uncertainty.K)
    expect(r.stats.nParams).toBe(free.stats.nParams - 2)
    const post = gpLogPosterior(star.data, { planets: [{ ...start, e: 0, fix: ['e'] }], gp })
    expect(post.names.slice(0, 3)).toEqual(['ln P1', 'ln K1', 'Tc1'])
  })

  it('holds ω and Tp fixed with e free (√e alone), as the white fitter does', () => {
    const planet = { period: 12.3, K: 6, e: 0.05, omegaDeg: 57, tp: STAR.planet.tp, fix: ['omegaDeg', 'tp'] as Array<'omegaDeg' | 'tp'> }
    const r = fitWithGp(star.data, { planets: [planet], gp })
    expect(r.success, r.message).toBe(true)
    const p = r.planets[0]
    expect(p.omegaDeg).toBeCloseTo(57, 9)
    expect(p.tp).toBe(STAR.planet.tp)
    expect([p.uncertainty.omegaDeg, p.uncertainty.tp]).toEqual([0, 0])
    expect(p.uncertainty.e).toBeGreaterThan(0)
    expect(r.priors.join('; ')).toContain('planet 1 ω fixed at 57°; planet 1 Tp fixed at 2459003.1 d')
    expect(gpLogPosterior(star.data, { planets: [planet], gp }).names.slice(0, 3)).toEqual(['ln P1', 'ln K1', '√e1'])
  })

  it('refuses a prior on an unknown planet, naming it', () => {
    expect(() => fitWithGp(star.data, { planets: [start], gp, priors: [{ planet: 1, param: 'K', gaussian: { mu: 5, sigma: 1 } }] })).toThrow(/priors\[0\]\.planet/)
  })
})

describe('planets + GP: the dense quasi-periodic path and per-instrument amplitudes', () => {
  const star = spottedStar(1, 70, 300, true)
  const start = { period: 12.3, K: 6, e: 0.05, omegaDeg: 60, tc: 2459003 }

  it('fits with the quasi-periodic kernel (dense Cholesky) and states Γ\'s prior', () => {
    const g = fitWithGp(star.data, { planets: [start], gp: { kernel: 'quasi-periodic', period: { value: 23.5, sigma: 2 }, decayTime: { value: 60 } } })
    expect(g.success, g.message).toBe(true)
    expect(g.noise.kernel.kind).toBe('quasi-periodic')
    expect(g.priors.join(' ')).toMatch(/Γ flat in ln/)
    expect(Math.abs(g.planets[0].K - STAR.planet.K)).toBeLessThan(3 * g.planets[0].uncertainty.K)
  })

  it('gives each instrument its own amplitude when asked', () => {
    const g = fitWithGp(star.data, { planets: [start], gp: { kernel: 'rotation', period: { value: 23.5 }, amplitude: { perInstrument: true } } })
    expect(g.success, g.message).toBe(true)
    expect(g.noise.amplitude).toHaveLength(2)
    expect(g.instruments.map((i) => i.name)).toEqual(['North', 'South'])
    expect(g.noiseUncertainty.amplitude).toHaveLength(2)
  })
})

describe('the planets + GP posterior for a sampler', () => {
  const star = spottedStar(1, 100, 300, false)
  const gp = { kernel: 'rotation' as const, period: { value: 23.5 } }
  const fit = fitWithGp(star.data, { planets: [{ period: 12.3, K: 6, e: 0.05, omegaDeg: 60, tc: 2459003 }], gp })

  it('equals the fit\'s ln posterior at the fit\'s optimum, and is −∞ outside the priors', () => {
    const p = fit.planets[0]
    const k = fit.noise.kernel
    if (k.kind !== 'rotation') throw new Error('rotation kernel expected')
    const post = gpLogPosterior(star.data, {
      planets: [{ period: p.period, K: p.K, e: p.e, omegaDeg: p.omegaDeg, tc: p.tc }],
      gp: { ...gp, period: { ...gp.period, start: k.period }, decayTime: { value: k.decayTime }, shape: { value: k.shape }, amplitude: { value: fit.noise.amplitude } },
      jitterStart: fit.noise.jitter,
    })
    expect(post.names).toEqual(['ln P1', 'ln K1', '√e cos ω1', '√e sin ω1', 'Tc1', 'ln amplitude', 'ln decay time', 'ln rotation period', 'shape', 'ln jitter North'])
    // the elements go through degrees and back, and the reported values are rounded by nothing else
    expect(Math.abs(post.logProb(post.start) - fit.stats.lnPosterior)).toBeLessThan(1e-3)
    const bad = Float64Array.from(post.start); bad[8] = 1.5
    expect(post.logProb(bad)).toBe(-Infinity)
  })
})

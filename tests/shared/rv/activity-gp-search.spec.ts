import { describe, it, expect } from 'vitest'
import { createRandom } from '../../../shared/math/random.ts'
import { radialVelocity, searchPlanets, searchWithActivity, type RvData } from '../../../shared/rv/index.ts'
import { spottedStar, STAR } from './gp/spotted-star.ts'

// The case on the seeded spotted star (./gp/spotted-star.ts: 12.3-d planet, K = 7 m/s;
// rotation 23.5 d in the velocities and the bisector): planets + GP finds the planet the white-noise
// search does not reach. Each search takes seconds; they run once at collection.
const star = spottedStar(1, 160, 420, true)
const indicators = [
  { name: 'bisector', value: star.bisector, error: star.bisectorError },
  { name: 'quiet', value: star.quiet },
]
const withIndicators = searchWithActivity(star.data, { indicators })

describe('searchWithActivity on a spotted star', () => {
  it('gives one planet at 12.3 d with K within its error of 7 m/s, and activity candidates', () => {
    const r = withIndicators
    expect(r.preferred).toBe('gp')
    expect(r.planets).toHaveLength(1)
    const p = r.planets[0]
    expect(Math.abs(p.period - STAR.planet.period)).toBeLessThan(0.1)
    expect(Math.abs(p.K - STAR.planet.K)).toBeLessThan(p.uncertainty.K)
    expect(r.activity.length).toBeGreaterThan(0)
    for (const a of r.activity) {
      expect([1, 2].some((harmonic) => Math.abs(1 / a.period - harmonic / STAR.rotation.period) < 2 / 420), `${a.period} d`).toBe(true)
      expect(a.evidence.join(' ')).toMatch(/'bisector'/)
    }
  })

  it('ties the GP to the bisector\'s rotation period and reports its hyperparameters with units', () => {
    const r = withIndicators
    expect(r.rotation!.source).toMatch(/'bisector' periodogram/)
    expect(Math.abs(r.rotation!.period - STAR.rotation.period)).toBeLessThan(1.5)
    const g = r.gp!
    expect(g.kernel).toBe('rotation')
    expect(Math.abs(g.rotationPeriod.value - STAR.rotation.period)).toBeLessThan(1.5)
    expect(g.rotationPeriod.unit).toBe('d')
    expect(g.decayTime.value).toBeGreaterThan(g.rotationPeriod.value / 2)
    expect(g.amplitude[0].unit).toBe('m / s')
    expect(g.priors[0]).toMatch(/rotation period ~ N/)
  })

  it('reports BIC for planets + white noise and planets + GP; the GP is preferred', () => {
    const r = withIndicators
    expect(r.bic.gp!).toBeLessThan(r.bic.white - 10)
    expect(r.whiteFit!.planets).toHaveLength(1)
    expect(r.steps[1].kept).not.toBeNull()
  })

  it('without indicators, the user\'s rotation period still gives a GP fit', () => {
    const r = searchWithActivity(star.data, { rotationPeriod: { value: 23.5, sigma: 2 }, whiteSearch: searchPlanets(star.data, { maxPlanets: 2 }) })
    expect(r.rotation).toEqual({ period: 23.5, sigma: 2, source: 'the user' })
    expect(r.gpFit!.success, r.gpFit!.message).toBe(true)
    expect(r.gp!.rotationPeriod.value).toBeGreaterThan(20)
    expect(r.bic.gp!).toBeLessThan(r.bic.white)
    expect(r.activity.some((a) => a.source === 'user' && a.period === 23.5)).toBe(true)
  })

  it('refuses a bad rotation period, naming it', () => {
    expect(() => searchWithActivity(star.data, { rotationPeriod: { value: -1 }, whiteSearch: withIndicators.whiteSearch })).toThrow(/rotationPeriod.value/)
  })
})

describe('searchWithActivity on a star without activity', () => {
  const rng = createRandom(7)
  const n = 60
  const t = Float64Array.from({ length: n }, () => 2459000 + 300 * rng.next()).sort()
  const y = radialVelocity(t, [{ period: 8.7, K: 12, e: 0, omega: 0, tp: 2459001 }]).map((v) => v + 2 * rng.normal())
  const data: RvData = { t, y, dy: new Float64Array(n).fill(2), instrument: new Int32Array(n), instrumentNames: ['North'] }
  const quiet = Float64Array.from({ length: n }, () => 0.1 + 0.02 * rng.normal())

  it('is the white-noise search, unchanged (no GP)', () => {
    const white = searchPlanets(data, { indicators: [{ name: 'quiet', value: quiet }] })
    const r = searchWithActivity(data, { indicators: [{ name: 'quiet', value: quiet }], whiteSearch: white })
    expect(r.preferred).toBe('white')
    expect(r.gp).toBeNull()
    expect(r.planets.map((p) => p.period)).toEqual(white.activity!.planets.map((k) => white.fit.planets[k].period))
    expect(r.planets).toHaveLength(1)
    expect(r.bic.white).toBe(white.fit.stats.bic)
    expect(r.cautions.join(' ')).toMatch(/white-noise search stands/)
  })
})

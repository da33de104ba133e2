import { describe, it, expect } from 'vitest'
import { searchPlanets, vetOrbits, fitWithGp, fitKeplerians } from '../../../shared/rv/index.ts'
import { spottedStar, STAR } from './gp/spotted-star.ts'

// The case on the seeded synthetic spotted star (tests/shared/rv/gp/spotted-star.ts): the
// white-noise search alone reports several "planets"; vetting its signals against the indicators
// keeps the 12.3-d planet and labels the rotation signals activity candidates; planets + GP then
// recovers the planet and is preferred by BIC. (Computed once at collection; the search takes seconds.)
const star = spottedStar(1, 160, 420, true)
const search = searchPlanets(star.data)
const orbits = search.fit.planets.map((p) => ({ period: p.period, K: p.K, e: p.e, omega: p.omega, tp: p.tp }))
const vetting = vetOrbits(star.data, orbits, [
  { name: 'bisector', value: star.bisector, error: star.bisectorError },
  { name: 'quiet', value: star.quiet },
])

describe('search + activity vetting on a spotted star', () => {
  it('keeps exactly one planet, the 12.3-d one, and labels the rest activity', () => {
    expect(vetting.planets).toHaveLength(1)
    const kept = orbits[vetting.planets[0]]
    expect(Math.abs(kept.period - STAR.planet.period)).toBeLessThan(0.1)
    for (const k of vetting.activity) {
      expect(vetting.candidates[k].cautions.join(' ')).toMatch(/bisector/)
      expect(Math.abs(1 / orbits[k].period - 1 / STAR.rotation.period) < 2 / 420 || Math.abs(1 / orbits[k].period - 2 / STAR.rotation.period) < 2 / 420).toBe(true)
    }
  })

  it('then one planet + GP recovers K within its error and beats one planet + white noise by BIC', () => {
    const kept = orbits[vetting.planets[0]]
    const start = { period: kept.period, K: kept.K, e: kept.e, omegaDeg: (kept.omega * 180) / Math.PI, tp: kept.tp }
    const prot = vetting.indicators[0].peaks[0].period
    const gp = fitWithGp(star.data, { planets: [start], gp: { kernel: 'rotation', period: { value: prot, source: 'bisector periodogram' } } })
    const white = fitKeplerians(star.data, { planets: [start] })
    expect(gp.success, gp.message).toBe(true)
    expect(Math.abs(gp.planets[0].K - STAR.planet.K)).toBeLessThan(gp.planets[0].uncertainty.K)
    expect(gp.stats.bic).toBeLessThan(white.stats.bic - 10)
  })
})

import { describe, it, expect } from 'vitest'
import { searchPlanets } from '../../../shared/rv/index.ts'
import { spottedStar, STAR } from './gp/spotted-star.ts'

// The case on the seeded synthetic spotted star (tests/shared/rv/gp/spotted-star.ts): the
// white-noise search models the rotation (23.5 d and its neighbours and harmonic) as Keplerians; given
// the indicators it vets every signal and counts none of those as a planet. (Computed once at
// collection; the search takes seconds.) The planet itself is then recovered by planets + GP
// (tests/shared/rv/gp/gp-fit.spec.ts): this white-noise search does not reach it under the activity.
const star = spottedStar(1, 160, 420, true)
const search = searchPlanets(star.data, {
  indicators: [
    { name: 'bisector', value: star.bisector, error: star.bisectorError },
    { name: 'quiet', value: star.quiet },
  ],
})

describe('search with activity indicators on a spotted star', () => {
  it('labels every rotation signal an activity candidate, with a caution naming the indicator', () => {
    const v = search.activity!
    expect(v).toBeDefined()
    expect(search.fit.planets.length).toBeGreaterThan(0)
    for (const k of v.activity) {
      const P = search.fit.planets[k].period
      const nearRotation = [1, 2].some((m) => Math.abs(1 / P - m / STAR.rotation.period) < 2 / 420)
      expect(nearRotation, `${P} d`).toBe(true)
      expect(v.candidates[k].cautions.join(' ')).toMatch(/'bisector'/)
    }
  })

  it('counts only the signals that are not activity candidates as planets', () => {
    const v = search.activity!
    expect(search.planets).toBe(v.planets.length)
    expect(v.planets.length + v.activity.length).toBe(search.fit.planets.length)
    for (const k of v.planets) expect(Math.abs(search.fit.planets[k].period - STAR.planet.period)).toBeLessThan(0.1)
  })
})

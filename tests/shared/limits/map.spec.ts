import { describe, it, expect } from 'vitest'
import { createRandom } from '../../../shared/math/index.ts'
import {
  prepareLimits, runChunk, mergeChunks, computeLimitMap, chunkRanges, completenessContour, limitTable, solarSystemGiants,
  injectionOf, trialIndices, makeGrid, limitsDataFromFit, type LimitsProblem, type LimitMap,
} from '../../../shared/limits/index.ts'
import { toRvData, fitBaseline, semiAmplitude, minimumMass } from '../../../shared/rv/index.ts'
import { expectClose } from '../../helpers/expect-close.ts'

function whiteNoiseProblem(seed: number): LimitsProblem {
  const r = createRandom(99)
  const n = 60
  const t = Float64Array.from({ length: n }, () => 2460000 + 400 * r.next()).sort()
  return {
    data: { t, residuals: Float64Array.from({ length: n }, () => 3 * r.normal()), dy: new Float64Array(n).fill(3) },
    starMass: 0.9, seed,
    grid: { periods: 7, masses: 6, phases: 4, eccentricities: [0, 0.4] },
  }
}

describe('the limit map', () => {
  const problem = whiteNoiseProblem(12345)
  const whole = computeLimitMap(problem)

  it('is the same however the grid is cut into chunks and in whatever order they arrive', () => {
    const prep = prepareLimits(problem)
    for (const count of [2, 3, 7, 41]) {
      const chunks = chunkRanges(prep.grid.trials, count).map((c) => runChunk(prep, c.start, c.end)).reverse()
      const merged = mergeChunks(prep.grid, chunks)
      expect(Array.from(merged.recovered), `${count} chunks`).toEqual(Array.from(whole.recovered))
    }
  })

  it('is reproduced by the same seed and changes with another', () => {
    expect(Array.from(computeLimitMap(problem).recovered)).toEqual(Array.from(whole.recovered))
    const prep = prepareLimits(problem), other = prepareLimits(whiteNoiseProblem(54321))
    expect(injectionOf(prep.grid, 5, 12345, 0.9, 0).phase).not.toBe(injectionOf(other.grid, 5, 54321, 0.9, 0).phase)
  })

  it('a stopped chunk covers a prefix that merges with the rest', () => {
    const prep = prepareLimits(problem)
    const part = runChunk(prep, 0, 100, (done) => (done >= 40 ? 'stop' : undefined), 20)
    expect(part.end).toBe(40)
    const rest = runChunk(prep, 40, prep.grid.trials)
    expect(Array.from(mergeChunks(prep.grid, [rest, part]).recovered)).toEqual(Array.from(whole.recovered))
  })

  it('refuses chunks with a gap or an overlap', () => {
    const prep = prepareLimits(problem)
    const a = runChunk(prep, 0, 50), b = runChunk(prep, 60, prep.grid.trials), c = runChunk(prep, 40, 60)
    expect(() => mergeChunks(prep.grid, [a, b])).toThrow(/\[50, 60\) are missing/)
    expect(() => mergeChunks(prep.grid, [a, b, c])).toThrow(/covered twice/)
  })

  it('grows more complete with mass: the 90 % contour lies at or above the 50 % one', () => {
    const c50 = completenessContour(whole, 0.5), c90 = completenessContour(whole, 0.9)
    c50.forEach((p, i) => {
      if (p.massEarth !== null && c90[i].massEarth !== null) expect(c90[i].massEarth!).toBeGreaterThanOrEqual(p.massEarth - 1e-9)
    })
    const nM = whole.grid.massesEarth.length
    const top = Array.from(whole.grid.periods.keys()).map((i) => whole.fraction[i * nM + nM - 1])
    const bottom = Array.from(whole.grid.periods.keys()).map((i) => whole.fraction[i * nM])
    expect(Math.min(...top)).toBeGreaterThan(Math.max(...bottom))
  })

  it('indexes trials period-major with phases fastest', () => {
    const g = makeGrid({ periods: 3, masses: 4, phases: 5, eccentricities: [0, 0.3] }, 100, { minMassEarth: 1, maxMassEarth: 100 })
    expect(g.trials).toBe(120)
    expect(trialIndices(g, 0)).toEqual({ iP: 0, iM: 0, iE: 0, iPhase: 0 })
    expect(trialIndices(g, 119)).toEqual({ iP: 2, iM: 3, iE: 1, iPhase: 4 })
    expect(trialIndices(g, 47)).toEqual({ iP: 1, iM: 0, iE: 1, iPhase: 2 })
    expectClose(g.periods[2], 500)
  })

  it('injects the semi-amplitude of the grid mass (mass → K → mass round trip)', () => {
    const prep = prepareLimits(problem)
    for (const k of [0, 17, 150, prep.grid.trials - 1]) {
      const o = injectionOf(prep.grid, k, problem.seed, problem.starMass, 0)
      expectClose(minimumMass(o.period, o.K, o.e, problem.starMass).msiniMearth, o.massEarth, { rtol: 1e-9 })
      expectClose(o.K, semiAmplitude(o.period, o.massEarth * 3.986004e14 / 1.2668653e17, o.e, problem.starMass), { rtol: 1e-12 })
    }
  })
})

describe('reading the map', () => {
  const grid = makeGrid({ periods: 2, masses: 4, phases: 10 }, 100, { minMassEarth: 1, maxMassEarth: 1000 })
  const map = (fr: number[]): LimitMap => ({ grid, perCell: 10, recovered: Int32Array.from(fr, (f) => f * 10), fraction: Float64Array.from(fr) })

  it('interpolates the contour in ln M between the cells that straddle the level', () => {
    // masses 1, 10, 100, 1000
    const m = map([0, 0.2, 0.8, 1, /* second period */ 0.6, 0.7, 1, 1])
    const c50 = completenessContour(m, 0.5)
    expectClose(c50[0].massEarth!, Math.exp(Math.log(10) + 0.5 * Math.log(10))) // halfway 0.2 → 0.8
    expect(c50[1]).toMatchObject({ flag: 'below-grid', massEarth: 1 })
    const c90 = completenessContour(m, 0.9)
    expectClose(c90[0].massEarth!, Math.exp(Math.log(100) + 0.5 * Math.log(10)))
    expect(completenessContour(map([0, 0, 0.1, 0.4, 0, 0, 0, 0]), 0.5)[0].flag).toBe('not-reached')
  })

  it('does not let a noisy dip hide: the contour sits above the highest cell below the level', () => {
    const c = completenessContour(map([1, 0.3, 1, 1, 1, 1, 1, 1]), 0.5)
    expect(c[0].massEarth!).toBeGreaterThan(10)
  })

  it('tabulates the conservative limit per period range', () => {
    const rows = limitTable(map([0, 0.2, 0.8, 1, 0.6, 0.7, 1, 1]), [0.1, 10, 1000])
    expect(rows).toHaveLength(2)
    expect(rows[0].from).toBe(0.1)
    expect(rows[1].mass50Earth).toBeCloseTo(1, 9)
  })
})

describe('Solar System giants on the chart', () => {
  it('places Jupiter at 11.86 yr and 317.8 Earth masses around a solar-mass star', () => {
    const [j, s] = solarSystemGiants(1)
    expectClose(j.period, 4332.6, { rtol: 2e-3 }) // Jupiter's sidereal period, common knowledge
    expectClose(j.massEarth, 317.83, { rtol: 1e-3 })
    expectClose(s.period, 10759, { rtol: 3e-3 })
    expect(solarSystemGiants(0.5)[0].period).toBeGreaterThan(j.period * 1.4)
  })
})

describe('data for the map from a fit', () => {
  it('keeps the residuals and adds each instrument\'s jitter to its errors', () => {
    const { data } = toRvData({ time: [1, 2, 3, 4, 5, 6], rv: [1, -1, 2, -2, 1, 0], error: [1, 1, 1, 1, 1, 1], instrument: ['A', 'A', 'A', 'B', 'B', 'B'] })
    const fit = fitBaseline(data)
    const d = limitsDataFromFit(data, fit)
    expectClose(d.residuals, fit.residuals)
    d.dy.forEach((v, i) => expectClose(v, Math.hypot(1, fit.instruments[data.instrument[i]].jitter)))
  })
})

// The shared pieces every caller (CLI, server, browser) uses: centring, spec → starts, priors,
// planet elements, the periodogram report's plot copy, the model curve's sampling, coincidences.
import { describe, it, expect } from 'vitest'
import {
  centreByInstrument, fitKeplerians, flattenPriors, startsFromSpec, fitSpec, elementsOfStart, keplerianOf, tcToTp,
  downsampleCurve, curveTimes, modelVelocity, radialVelocity, coincidences, periodogramReport,
} from '../../../shared/rv/index.ts'
import { synth } from './orbit-fit-helpers.ts'

const two = [
  { name: 'A', offset: 20, jitter: 0, err: [1, 2] as [number, number] },
  { name: 'B', offset: -35, jitter: 0, err: [2, 3] as [number, number] },
]

describe('instrument centring', () => {
  it('removes each instrument\'s weighted mean with the quoted errors (the ML offsets of a no-planet model at zero jitter)', () => {
    const { data } = synth({ seed: 3, n: 60, baseline: 400, planets: [{ period: 17, K: 10, e: 0, omega: 0, tp: 2455003 }], instruments: two })
    const y = centreByInstrument(data.y, data.dy, data.instrument)
    // independent path: the fitter with no planet and jitters held at 0
    const f = fitKeplerians(data, { planets: [], jitter: [0, 0], skipUncertainties: true })
    for (let i = 0; i < y.length; i++) expect(y[i]).toBeCloseTo(f.residuals[i]!, 9)
    expect(() => centreByInstrument([1, 2], [1, 0], [0, 0])).toThrow(/dy\[1\]/)
  })
})

describe('model spec → fitter input', () => {
  it('flattens per-planet priors and fills K, e, ω and the phase from the data', () => {
    const truth = { period: 9.3, K: 25, e: 0.2, omega: 1.1, tp: 2455004 }
    const { data } = synth({ seed: 11, n: 80, baseline: 500, planets: [truth] })
    const planets = [{ period: 9.3, priors: [{ param: 'e' as const, uniform: { min: 0, max: 0.5 } }] }]
    expect(flattenPriors(planets)).toEqual([{ planet: 0, param: 'e', uniform: { min: 0, max: 0.5 }, gaussian: undefined }])
    const [s] = startsFromSpec(data, planets, 'none')
    expect(s!.K).toBeGreaterThan(15)
    expect(s!.tc ?? s!.tp).toBeDefined()
    const { fit } = fitSpec(data, planets, { trend: 'none' })
    expect(fit.converged).toBe(true)
    expect(Math.abs(fit.planets[0]!.K - 25)).toBeLessThan(3 * fit.planets[0]!.uncertainty.K)
  })

  it('a held e (or ω) given without the rest of the orbit is kept: the start scan runs at that e and never replaces it', () => {
    // an eccentric planet fitted with e held at 0: the scan alone would start at its best e (≈ 0.5)
    const { data } = synth({ seed: 12, n: 80, baseline: 500, planets: [{ period: 9.3, K: 25, e: 0.5, omega: 1, tp: 2455003 }] })
    const [free] = startsFromSpec(data, [{ period: 9.3 }], 'none')
    expect(free!.e).toBeGreaterThan(0.2)
    const [held] = startsFromSpec(data, [{ period: 9.3, e: 0, fix: ['e'] }], 'none')
    expect(held!.e).toBe(0)
    expect(fitSpec(data, [{ period: 9.3, e: 0, fix: ['e'] }], { trend: 'none' }).fit.planets[0]!.e).toBe(0)
    const [atE] = startsFromSpec(data, [{ period: 9.3, e: 0.3, fix: ['e'] }], 'none')
    expect(atE!.e).toBe(0.3)
    const [om] = startsFromSpec(data, [{ period: 9.3, omegaDeg: 40, fix: ['omegaDeg'] }], 'none')
    expect(om!.omegaDeg).toBe(40)
  })

  it('planet elements: a start with only Tc gets Tp with ω = 0° by default', () => {
    const el = elementsOfStart({ period: 10, K: 5, tc: 100 })!
    expect(el.omegaDeg).toBe(0)
    expect(el.tp).toBeCloseTo(tcToTp(100, 10, 0, 0), 12)
    expect(elementsOfStart({ period: 10, K: NaN, tc: 100 })).toBeNull()
    expect(keplerianOf({ ...el, omegaDeg: 180 }).omega).toBeCloseTo(Math.PI, 15)
  })
})

describe('periodogram report', () => {
  it('plots the whole period range, long-period end included, in ≤ 4000 points', () => {
    const m = 150_000
    const f = new Float64Array(m), p = new Float64Array(m)
    for (let k = 0; k < m; k++) { f[k] = 1 / 7237 + k * 1e-5; p[k] = 0.5 + 0.4 * Math.sin(k / 3) }
    const c = downsampleCurve(f, p)
    expect(c.period.length).toBeLessThanOrEqual(4000)
    expect(c.period[c.period.length - 1]).toBeCloseTo(7237, 6)
    // long periods keep every grid point (bins equal in log period), not one straight segment from 3290 d
    const grid = Array.from(f).filter((x) => 1 / x > 3290).length
    expect(grid).toBeGreaterThan(10)
    expect(c.period.filter((x) => x > 3290).length).toBe(grid)
  })

  it('uses the core grid defaults and centres per instrument', () => {
    const { data } = synth({ seed: 5, n: 70, baseline: 600, planets: [{ period: 0.74, K: 12, e: 0, omega: 0, tp: 2455000.2 }], instruments: two })
    const r = periodogramReport({ t: data.t, y: data.y, dy: data.dy, instrument: data.instrument, peaks: 3 })
    expect(r.settings.minPeriod).toBeLessThanOrEqual(0.5)
    expect(r.settings.maxPeriod).toBeGreaterThan(4.9 * 590)
    expect(r.peaks).toHaveLength(3)
  })
})

describe('model curve sampling', () => {
  const orbit = { period: 4, K: 50, e: 0.3, omegaDeg: 40, tp: 2450001, tc: 2450000 }
  it('a 4-d orbit over 20 years is drawn in segments around the data, each orbit resolved, no line across gaps', () => {
    const times = Array.from({ length: 200 }, (_, i) => 2450000 + i * 36.5 + (i % 3) * 0.2)
    const s = curveTimes(times, times[0]!, times[199]!, 4)
    expect(s.mode).toBe('segments')
    expect(s.time.length).toBeLessThanOrEqual(20000 + 2 * 200 + 400)
    const v = modelVelocity([orbit], null, s.time)
    let breaks = 0
    for (let i = 1; i < s.time.length; i++) {
      if (Number.isNaN(s.time[i]!)) { breaks++; expect(v[i]).toBeNaN(); continue }
      if (!Number.isNaN(s.time[i - 1]!)) expect(s.time[i]! - s.time[i - 1]!).toBeLessThanOrEqual(4 / 8 + 1e-9)
    }
    expect(breaks).toBeGreaterThan(100)
    // every measurement time is a sample, with the model's exact value there
    const set = new Set(Array.from(s.time))
    for (const t of times) expect(set.has(t)).toBe(true)
    const i0 = Array.from(s.time).indexOf(times[17]!)
    expect(v[i0]).toBeCloseTo(radialVelocity(Float64Array.of(times[17]!), [keplerianOf(orbit)])[0]!, 9)
  })

  it('a long orbit gets a regular grid with ≥ 40 samples a period', () => {
    const s = curveTimes([0, 100, 900], 0, 1000, 300)
    expect(s.mode).toBe('regular')
    expect(s.time.length).toBeGreaterThanOrEqual(2000)
    expect(Array.from(s.time).every(Number.isFinite)).toBe(true)
  })
})

describe('shared-indicator coincidences', () => {
  it('marks a velocity peak that an indicator shares within one peak width', () => {
    const rv = [{ period: 23, frequency: 1 / 23 }, { period: 4.2, frequency: 1 / 4.2 }]
    const ind = [{ name: 'bisector', peaks: [{ period: 23.3, frequency: 1 / 23.3, fap: 0.01 }, { period: 4.2, frequency: 1 / 4.2, fap: 0.5 }] }]
    expect(coincidences(rv, ind, 1000)).toEqual([{ period: 23, indicator: 'bisector', indicatorPeriod: 23.3, indicatorFap: 0.01 }])
  })
})

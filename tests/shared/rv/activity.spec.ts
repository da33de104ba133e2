import { describe, it, expect } from 'vitest'
import { activityVetting, indicatorDiagnostics, periodRelation, radialVelocity } from '../../../shared/rv/index.ts'
import { spottedStar, STAR } from './gp/spotted-star.ts'

// A seeded synthetic spotted star (tests/shared/rv/gp/spotted-star.ts): 12.3-d planet, rotation at 23.5 d
// in the velocities and (with the opposite sign) in a bisector-like indicator.
describe('indicator diagnostics on a spotted star', () => {
  const star = spottedStar(1, 160, 420, true)
  const diag = indicatorDiagnostics(star.data, { name: 'bisector', value: star.bisector, error: star.bisectorError })

  it('finds the rotation period as the indicator\'s strongest peak, with a tiny FAP', () => {
    expect(diag.n).toBe(160)
    const top = diag.peaks[0]
    expect(Math.abs(1 / top.period - 1 / STAR.rotation.period)).toBeLessThan(1 / 420)
    expect(top.fap).toBeLessThan(1e-6)
  })

  it('measures the velocity–indicator anticorrelation after centring each instrument', () => {
    expect(diag.rv.pearson).toBeLessThan(-0.5)
    expect(diag.rv.pearsonP).toBeLessThan(1e-6)
    expect(diag.byInstrument.map((b) => b.instrument)).toEqual(['North', 'South'])
  })

  it('says why nothing is measured for a short or constant indicator', () => {
    const few = new Float64Array(160).fill(NaN); few[0] = 1; few[5] = 2
    expect(indicatorDiagnostics(star.data, { name: 'halpha', value: few }).notes.join(' ')).toMatch(/needs at least 8/)
  })
})

describe('activity vetting', () => {
  const star = spottedStar(1, 160, 420, true)
  const indicators = [
    { name: 'bisector', value: star.bisector, error: star.bisectorError },
    { name: 'quiet', value: star.quiet },
  ]
  const planetCurve = radialVelocity(star.data.t, [STAR.planet])

  it('labels the rotation period and a period within the peak width as activity, the planet not', () => {
    const v = activityVetting(star.data, [
      { period: 12.3, signal: planetCurve }, { period: 23.48 }, { period: 24.49 },
    ], indicators)
    expect(v.candidates.map((c) => c.activity)).toEqual([false, true, true])
    expect(v.candidates[1].matches[0]).toMatchObject({ indicator: 'bisector', kind: 'period', relation: 'the same period as' })
    expect(v.candidates[1].cautions[0]).toMatch(/23\.5-d signal has the same period as a peak of 'bisector'/)
    // 12.3 d is within a peak width of half a secondary bisector peak (24.9 d): a caution, no label
    expect(v.candidates[0].matches).toEqual([])
    expect(v.candidates[0].cautions.join(' ')).toMatch(/secondary peak of 'bisector'.*kept/)
  })

  it('labels a harmonic of the strongest indicator peak (the rotation period) as activity', () => {
    const prot = activityVetting(star.data, [], indicators).indicators[0].peaks[0].period
    const v = activityVetting(star.data, [{ period: prot / 2 }], indicators)
    expect(v.candidates[0].activity).toBe(true)
    expect(v.candidates[0].matches[0]).toMatchObject({ kind: 'harmonic', relation: 'half the period of' })
  })

  it('labels a signal that follows the indicator even without a period match', () => {
    const v = activityVetting(star.data, [{ period: 50, signal: star.activity }], indicators)
    expect(v.candidates[0].activity).toBe(true)
    expect(v.candidates[0].matches.some((m) => m.kind === 'correlation' && m.indicator === 'bisector')).toBe(true)
  })

  it('cautions that the velocities, and the residuals of a planet-only model, follow the indicator', () => {
    const residuals = Float64Array.from(star.data.y, (y, i) => y - planetCurve[i])
    const v = activityVetting(star.data, [], indicators, { residuals })
    expect(v.cautions.some((c) => /velocities follow 'bisector'/.test(c))).toBe(true)
    expect(v.cautions.some((c) => /residuals of the model still follow 'bisector'/.test(c))).toBe(true)
    expect(v.cautions.some((c) => /'quiet'/.test(c))).toBe(false)
  })

  it('matches harmonics of an indicator peak within their widths', () => {
    const peaks = [{ period: 23.5, frequency: 1 / 23.5, power: 0.5, fap: 1e-10 }]
    expect(periodRelation(11.75, peaks, 400, 1e-3)?.relation).toBe('half the period of')
    expect(periodRelation(47, peaks, 400, 1e-3)?.relation).toBe('twice the period of')
    expect(periodRelation(12.3, peaks, 400, 1e-3)).toBeNull()
    expect(periodRelation(23.5, [{ ...peaks[0], fap: 0.2 }], 400, 1e-3)).toBeNull()
  })

  it('refuses bad settings, naming them', () => {
    expect(() => activityVetting(star.data, [], indicators, { peakFap: 2 })).toThrow(/peakFap/)
    expect(() => activityVetting(star.data, [{ period: -1 }], indicators)).toThrow(/period must be > 0/)
  })
})

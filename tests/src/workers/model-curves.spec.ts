import { describe, expect, it } from 'vitest'
import { radialVelocityAt } from '@shared/rv/index.ts'
import { computeCurves, phaseOf } from '@/workers/model-curves.ts'

const DEG = Math.PI / 180
// Vela Sorrel b and c as simulated (fixtures/demo/README.md); Tc values are arbitrary reference times here.
const b = { period: 12.4, K: 9, e: 0.1, omegaDeg: 40, tp: 2458003.2, tc: 2458005 }
const c = { period: 187, K: 14, e: 0.25, omegaDeg: 210, tp: 2458090, tc: 2458100 }

describe('model curves for the plots', () => {
  it('sums the planets and the trend over time, resolving the shortest orbit', () => {
    const trend = { slope: 0.01, curvature: 1e-5, epoch: 2458500 }
    const out = computeCurves({ planets: [b, c], trend, points: [], start: 2458000, end: 2459000, samples: 100 })
    expect(out.timeCurve.length).toBeGreaterThanOrEqual(Math.ceil(40 * 1000 / 12.4))
    for (const [t, v] of [out.timeCurve[0]!, out.timeCurve[777]!]) {
      expect(out.sampling).toBe('regular')
      const dt = t - trend.epoch
      const expected = radialVelocityAt(t, { ...b, omega: b.omegaDeg * DEG }) + radialVelocityAt(t, { ...c, omega: c.omegaDeg * DEG })
        + trend.slope * dt + trend.curvature * dt * dt
      expect(v).toBeCloseTo(expected, 9)
    }
  })

  it('folds each planet with the others removed: zero residuals put every point on its own curve', () => {
    const points = Array.from({ length: 30 }, (_, i) => ({ id: i, time: 2458000 + 17.3 * i, residual: 0, instrument: i % 2 ? 'A' : 'B', error: 1 }))
    const out = computeCurves({ planets: [b, c], trend: null, points, start: 2458000, end: 2458600 })
    expect(out.folded).toHaveLength(2)
    out.folded.forEach((f, k) => {
      const planet = [b, c][k]!
      f.points.forEach(([phase, v, error, id], i) => {
        expect(id).toBe(i)
        expect(error).toBe(1)
        expect(phase).toBeGreaterThanOrEqual(-0.5)
        expect(phase).toBeLessThan(0.5)
        expect(phase).toBeCloseTo(phaseOf(points[i]!.time, planet.period, planet.tc), 12)
        expect(v).toBeCloseTo(radialVelocityAt(points[i]!.time, { ...planet, omega: planet.omegaDeg * DEG }), 9)
      })
      expect(f.curve[0]![0]).toBe(-0.5)
      expect(f.curve[f.curve.length - 1]![0]).toBe(0.5)
      expect(f.instruments).toEqual(points.map((p) => p.instrument))
    })
  })

  it('draws a 4-d orbit over 20 years in segments around the data, not as a solid block', () => {
    const short = { period: 4, K: 50, e: 0.2, omegaDeg: 70, tp: 2450001, tc: 2450000 }
    const points = Array.from({ length: 150 }, (_, i) => ({ id: i, time: 2450000 + i * 48.7, residual: 0, instrument: 'A', error: 1 }))
    const out = computeCurves({ planets: [short], trend: null, points, start: 2450000, end: 2450000 + 149 * 48.7 })
    expect(out.sampling).toBe('segments')
    const breaks = out.timeCurve.filter(([, v]) => v === null).length
    expect(breaks).toBe(149) // one break between the windows around consecutive, far-apart measurements
    // within a segment, consecutive samples are at most P/8 apart: every orbit is resolved
    for (let i = 1; i < out.timeCurve.length; i++) {
      const [t0, v0] = out.timeCurve[i - 1]!, [t1, v1] = out.timeCurve[i]!
      if (v0 !== null && v1 !== null) expect(t1 - t0).toBeLessThanOrEqual(4 / 8 + 1e-9)
    }
    // the curve passes through the model at every measurement time
    const at = new Map(out.timeCurve.filter(([, v]) => v !== null).map(([t, v]) => [t, v!]))
    for (const p of points) expect(at.get(p.time)).toBeCloseTo(radialVelocityAt(p.time, { ...short, omega: short.omegaDeg * DEG }), 9)
  })

  it('measures phase from Tc in [−0.5, 0.5)', () => {
    expect(phaseOf(2458005, 12.4, 2458005)).toBe(0)
    expect(phaseOf(2458005 + 6.2, 12.4, 2458005)).toBeCloseTo(-0.5, 9)
    expect(phaseOf(2458005 + 12.4 * 3 + 3.1, 12.4, 2458005)).toBeCloseTo(0.25, 9)
  })
})

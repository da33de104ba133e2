// Our Levenberg–Marquardt fitter against an independent implementation from npm
// (ml-levenberg-marquardt), both minimising χ² of the same one-planet model on the same seeded data
// with equal errors and no jitter: the two optima must agree (ours no worse in χ²).
import { describe, expect, it } from 'vitest'
import { levenbergMarquardt } from 'ml-levenberg-marquardt'
import { fitKeplerians } from '../../../shared/rv/orbit-fit.ts'
import { radialVelocityAt, tpToTc } from '../../../shared/rv/model.ts'
import { synth } from './orbit-fit-helpers.ts'

const DEG = Math.PI / 180
const truth = { period: 23.7, K: 15, e: 0.3, omega: 120 * DEG, tp: 2455012 }

describe('fitter cross-check against ml-levenberg-marquardt', () => {
  const { data, epoch } = synth({ seed: 5, n: 120, baseline: 700, planets: [truth], instruments: [{ name: 'A', offset: 4, jitter: 0, err: [2, 2] }] })
  const t = Array.from(data.t), y = Array.from(data.y), s = data.dy[0]!

  it('reaches the same χ² minimum and the same orbit', () => {
    const ours = fitKeplerians(data, {
      planets: [{ period: 23.6, K: 13, e: 0.25, omegaDeg: 110, tc: tpToTc(truth.tp, truth.period, truth.e, truth.omega) + 0.3 }],
      epoch, jitter: [0],
    })
    expect(ours.success).toBe(true)
    const p = ours.planets[0]!
    // the independent optimiser, started from a nearby point, in (P, K, √e cos ω, √e sin ω, Tp − t0, offset)
    const model = ([P, K, c, d, tp, g]: number[]) => {
      const e = c! * c! + d! * d!, omega = Math.atan2(d!, c!)
      return (i: number) => g! + radialVelocityAt(t[i]!, { period: P!, K: K!, e: Math.min(e, 0.95), omega, tp: tp! + 2455000 })
    }
    const start = [23.6, 13, Math.sqrt(0.25) * Math.cos(110 * DEG), Math.sqrt(0.25) * Math.sin(110 * DEG), 12.5, 0]
    const theirs = levenbergMarquardt({ x: t.map((_, i) => i), y }, model, {
      initialValues: start, damping: 1e-2, maxIterations: 2000, errorTolerance: 1e-12, gradientDifference: 1e-6, centralDifference: true,
    })
    const f = model(theirs.parameterValues)
    const chi2Theirs = y.reduce((acc, v, i) => acc + ((v - f(i)) / s) ** 2, 0)
    const chi2Ours = ours.stats.chi2
    expect(chi2Ours).toBeLessThanOrEqual(chi2Theirs + 1e-6)
    expect(Math.abs(chi2Ours - chi2Theirs) / chi2Ours).toBeLessThan(1e-4)
    const [P, K, c, d] = theirs.parameterValues as number[]
    expect(Math.abs(p.period - P!)).toBeLessThan(0.2 * p.uncertainty.period!)
    expect(Math.abs(p.K - K!)).toBeLessThan(0.2 * p.uncertainty.K!)
    expect(Math.abs(p.e - (c! * c! + d! * d!))).toBeLessThan(0.2 * p.uncertainty.e!)
  })
})

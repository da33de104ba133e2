import { describe, expect, it } from 'vitest'
import type { SamplingRunSummary } from '@shared/api/sampling.ts'
import {
  convergenceNotes, defaultCornerNames, defaultWalkers, estimateFromRuns, formatDuration, formatInterval, plottableNames, sampledParameterCount,
  secondsFromEstimate, validateLauncher,
} from '@/components/sampling/sampling-format.ts'

describe('formatInterval: median with its 16–84 % interval', () => {
  it('rounds to two significant figures of the smaller side (common practice) and keeps the unit', () => {
    expect(formatInterval({ median: 9.8412, lo: 9.5512, hi: 10.1534, unit: 'm/s' }).text).toBe('9.84 +0.31 −0.29 m/s')
    expect(formatInterval({ median: 0.09213, lo: 0.08841, hi: 0.09602, unit: 'M_Jup' }).text).toBe('0.0921 +0.0039 −0.0037 M_Jup')
    expect(formatInterval({ median: 41.3, lo: 12.2, hi: 80.9, unit: 'deg' }).text).toBe('41 +40 −29°')
    expect(formatInterval({ median: 0.0712, lo: 0.0251, hi: 0.1305, unit: '' }).text).toBe('0.071 +0.059 −0.046')
  })
  it('writes a dash for missing numbers', () => {
    expect(formatInterval({ median: Number.NaN, lo: 1, hi: 2, unit: 'd' }).text).toBe('—')
  })
})

describe('launcher settings', () => {
  it('defaults to at least 32 walkers and twice the sampled parameters, even', () => {
    expect(defaultWalkers(7)).toBe(32)
    expect(defaultWalkers(17)).toBe(34)
    expect(defaultWalkers(20)).toBe(40)
  })
  it('counts five parameters per planet, an offset per instrument, fitted jitters and the trend', () => {
    const inst = (jitter: number | null) => ({ name: 'x', n: 10, offset: 0, offsetErr: 1, jitter, jitterErr: null, rms: 1 })
    const planet = {} as never
    expect(sampledParameterCount({ planets: [planet, planet], instruments: [inst(1), inst(null)], trend: { kind: 'quadratic', slope: 0, slopeErr: null, curvature: 0, curvatureErr: null, epoch: 0 } })).toBe(10 + 2 + 1 + 2)
  })
  it('leaves out what the model fixes (errors of exactly 0): a circular orbit has 3, a fixed ω leaves e', () => {
    const inst = { name: 'x', n: 10, offset: 0, offsetErr: 1, jitter: 1, jitterErr: 0.2, rms: 1 }
    const u = (over: object) => ({ period: 0.1, K: 1, e: 0.02, omegaDeg: 3, tc: 0.2, tp: 0.5, ...over })
    const circular = { e: 0, uncertainty: u({ e: 0, omegaDeg: null }) } as never
    const wFixed = { e: 0.3, uncertainty: u({ omegaDeg: 0 }) } as never
    expect(sampledParameterCount({ planets: [circular], instruments: [inst], trend: null })).toBe(3 + 2)
    expect(sampledParameterCount({ planets: [wFixed], instruments: [inst], trend: null })).toBe(4 + 2)
  })
  it('scales the server\'s estimate to the launcher\'s walkers and steps; leaves fixed parameters out of the plots', () => {
    expect(secondsFromEstimate({ seconds: 11.5, walkers: 32, expectedSteps: 5000 }, 64, 5000)).toBeCloseTo(21.5, 10)
    expect(plottableNames(['P b', 'e b', 'M sin i b (Earth masses)'], ['e b'])).toEqual(['P b'])
  })
  it('does not repeat the server\'s "stopped" warning', () => {
    const d = { warnings: ['The run was stopped after 10 of 20 steps; …'], converged: false } as never
    expect(convergenceNotes(d, { stopped: true, stepsDone: 10, steps: 20 } as never)).toHaveLength(1)
  })
  it('names what is wrong: odd or too few walkers, steps ≤ 0, a bad seed', () => {
    expect(validateLauncher({ walkers: '32', steps: '5000', seed: '1', untilConverged: true }, 7)).toEqual({})
    expect(validateLauncher({ walkers: '33', steps: '5000', seed: '', untilConverged: false }, 7).walkers).toMatch(/even/)
    expect(validateLauncher({ walkers: '12', steps: '5000', seed: '', untilConverged: false }, 7).walkers).toMatch(/At least 14 walkers/)
    expect(validateLauncher({ walkers: '32', steps: '0', seed: '', untilConverged: false }, 7).steps).toMatch(/greater than 0/)
    expect(validateLauncher({ walkers: '32', steps: '-5', seed: '', untilConverged: false }, 7).steps).toMatch(/greater than 0/)
    expect(validateLauncher({ walkers: '32', steps: '10', seed: '', untilConverged: false }, 7).steps).toMatch(/At least 20/)
    expect(validateLauncher({ walkers: '32', steps: '100', seed: '1.5', untilConverged: false }, 7).seed).toMatch(/whole number/)
  })
  it('scales an earlier run\'s server estimate to the new settings', () => {
    const earlier = { estimateSeconds: 11.5, settings: { walkers: 32, steps: 5000, burn: 1250, thin: 1, seed: 1 } } as SamplingRunSummary
    expect(estimateFromRuns([earlier], 64, 5000)).toBeCloseTo(21.5, 10)
    expect(estimateFromRuns([], 64, 5000)).toBeNull()
  })
  it('writes durations plainly', () => {
    expect(formatDuration(42.4)).toBe('42 s')
    expect(formatDuration(200)).toBe('3 min 20 s')
    expect(formatDuration(3900)).toBe('1 h 05 min')
    expect(formatDuration(null)).toBe('—')
  })
  it('starts the corner plot with P, K, e and M sin i of the first planet', () => {
    expect(defaultCornerNames(['P b', 'K b', 'e b', 'ω b', 'M sin i b', 'P c', 'ln posterior'])).toEqual(['P b', 'K b', 'e b', 'M sin i b'])
  })
})

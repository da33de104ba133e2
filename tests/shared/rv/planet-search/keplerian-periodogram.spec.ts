import { describe, it, expect } from 'vitest'
import {
  keplerianPeriodogram, keplerianPeriodogramDirect, keplerianPeaks, periodogramDirect, aliasPartners, keplerianFap, independentFrequencies,
} from '../../../../shared/rv/index.ts'
import { synth } from '../orbit-fit-helpers.ts'

const DEG = Math.PI / 180

describe('Keplerian periodogram (offsets per instrument at every period)', () => {
  const { data } = synth({
    seed: 31, n: 45, baseline: 700, planets: [{ period: 120, K: 25, e: 0.6, omega: 70 * DEG, tp: 2455040 }],
    instruments: [{ name: 'A', offset: 30, jitter: 1, err: [1, 2] }, { name: 'B', offset: -20, jitter: 1, err: [2, 3] }],
  })

  it('the fast (tabulated) statistic equals the direct reference (exact Kepler, full normal equations) to 1e-3 of the peak', () => {
    const opts = { minPeriod: 5 }
    const f = keplerianPeriodogram(data, opts), d = keplerianPeriodogramDirect(data, opts)
    expect(f.frequency.length).toBe(d.frequency.length)
    let peak = 0, worst = 0
    for (let k = 0; k < f.dchi2.length; k++) { peak = Math.max(peak, d.dchi2[k]); worst = Math.max(worst, Math.abs(f.dchi2[k] - d.dchi2[k])) }
    expect(worst).toBeLessThan(1e-3 * peak)
    expect(f.chi2Null).toBeCloseTo(d.chi2Null, 9)
  }, 120_000)

  it('peaks at the injected period with an eccentric cell, side lobes merged', () => {
    const r = keplerianPeriodogram(data, { minPeriod: 5 })
    const [top, ...rest] = keplerianPeaks(r, 4, 3)
    expect(Math.abs(top.period - 120)).toBeLessThan(5)
    expect(top.e).toBeGreaterThan(0.2)
    for (const p of rest) expect(Math.abs(p.index - top.index)).toBeGreaterThanOrEqual(3)
  })

  it('with one instrument and only the circular cell it is the floating-mean GLS (Zechmeister & Kürster 2009) times χ²₀', () => {
    const one = { ...data, instrument: new Int32Array(data.t.length), instrumentNames: ['A'] }
    const r = keplerianPeriodogram(one, { minPeriod: 5, cells: [{ e: 0, phases: 1, minPeriod: 0, substeps: 1 }] })
    const m = r.frequency.length
    const g = periodogramDirect(one.t, one.y, one.dy, { minPeriod: 1 / r.frequency[m - 1], maxPeriod: 1 / r.frequency[0], frequencies: m })
    for (let k = 0; k < m; k += 7) expect(Math.abs(r.power[k] - g.power[k])).toBeLessThan(2e-4)
  })

  it('rejects bad options naming them', () => {
    expect(() => keplerianPeriodogram(data, { minPeriod: -1 })).toThrow(/minPeriod/)
    expect(() => keplerianPeriodogram(data, { cells: [{ e: 0.5, phases: 3, minPeriod: 0, substeps: 1 }] })).toThrow(/phases/)
    expect(() => keplerianPeriodogram(data, { jitter: [1] })).toThrow(/jitter/)
  })
})

describe('alias partners and the false-alarm level of a Keplerian gain', () => {
  it('lists the daily, sidereal, yearly and harmonic partners in range (Dawson & Fabrycky 2010)', () => {
    const ps = aliasPartners(1.05, { minPeriod: 0.5, maxPeriod: 5000, minSeparation: 1e-4 })
    const has = (p: number): boolean => ps.some((a) => Math.abs(a.period - p) < 1e-3 * p)
    expect(has(1 / (1 - 1 / 1.05))).toBe(true) // 21 d
    expect(has(1 / (1 / 1.05 + 1))).toBe(true) // 0.512 d
    expect(has(2.1)).toBe(true) // f/2
    for (const a of ps) expect(a.period).toBeGreaterThanOrEqual(0.5)
  })

  it('FAP = 1 − (1 − P(χ²_ν > 2z))^(c·M) (Cumming 2004 form, law calibrated on noise: false-alarm.spec.ts): values, limits, monotone', () => {
    const m = independentFrequencies(1000, 0.5, 5000)
    expect(m).toBeCloseTo(1000 * (2 - 1 / 5000), 9)
    const z = 20, p4 = (1 + z) * Math.exp(-z), p6 = (1 + z + z * z / 2) * Math.exp(-z)
    expect(keplerianFap(z, m, { dof: 4, trialsFactor: 1 })).toBeCloseTo(1 - (1 - p4) ** m, 12)
    expect(keplerianFap(z, m, { dof: 6, trialsFactor: 2 })).toBeCloseTo(1 - (1 - p6) ** (2 * m), 12)
    expect(keplerianFap(0, m)).toBe(1)
    expect(keplerianFap(30, m)).toBeLessThan(keplerianFap(20, m))
  })
})

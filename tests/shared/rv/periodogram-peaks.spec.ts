import { describe, it, expect } from 'vitest'
import { expectClose } from '../../helpers/expect-close.ts'
import { createRandom } from '../../../shared/math/random.ts'
import { periodogram, findPeaks, baluevFap, gls } from '../../../shared/rv/periodogram.ts'
import { loadFixture, f64 } from './periodogram-fixtures.ts'

describe('findPeaks', () => {
  it('nightly 3.5-day signal (fixture "nightly"): top peak at 3.5 d, tiny FAP, its 1-day alias at 1/(1 − 1/3.5) = 1.4 d listed', () => {
    const fx = loadFixture('nightly')
    const t = f64(fx.t), y = f64(fx.y), dy = f64(fx.dy)
    const r = periodogram(t, y, dy)
    const peaks = findPeaks(t, y, dy, r)
    expect(peaks.length).toBe(5)
    for (let i = 1; i < peaks.length; i++) expect(peaks[i].power).toBeLessThanOrEqual(peaks[i - 1].power)
    const top = peaks[0]
    expectClose(top.period, 3.5, { rtol: 0.002 }, 'period')
    // refined power at least the grid maximum (astropy 5.2.1 grid value in the fixture)
    expect(top.power).toBeGreaterThanOrEqual(fx.topPeaks[0].power - 1e-12)
    expect(top.fap).toBeLessThan(1e-10)
    // aliases sit at f ± (the window's peak near 1 c/d), so 1/(1 − 1/3.5) = 1.4 d up to the peak width
    const daily = top.aliases.find((a) => a.source === '1 solar day' && Math.abs(a.period - 1.4) < 0.01)
    expect(daily, JSON.stringify(top.aliases)).toBeDefined()
    expectClose(daily!.period, 1.4, { rtol: 0.002 }, '1-day alias period')
    expect(daily!.windowPower).toBeGreaterThan(0.5)
    expect(top.aliases.some((a) => a.source === '1 sidereal day')).toBe(true)
    expectClose(daily!.power, gls(t, y, dy, daily!.frequency), { rtol: 1e-12 }, 'alias power')
    // its FAP is the Baluev FAP for the grid's top frequency
    const fmax = r.grid.f0 + (r.grid.count - 1) * r.grid.df
    expectClose(top.fap, baluevFap(top.power, t.length, t, fmax, { dy }), { rtol: 1e-12 }, 'fap')
  })

  it('refines a noise-free signal to its true frequency far below the grid step', () => {
    const r = createRandom(9)
    const n = 50
    const t = new Float64Array(n), y = new Float64Array(n), dy = new Float64Array(n).fill(1)
    for (let i = 0; i < n; i++) t[i] = 150 * r.next()
    t.sort()
    const P = 7.77
    for (let i = 0; i < n; i++) y[i] = 3 + 5 * Math.sin(2 * Math.PI * t[i] / P + 0.3)
    const res = periodogram(t, y, dy)
    const [top] = findPeaks(t, y, dy, res, { count: 1 })
    expectClose(top.period, P, { rtol: 1e-7 }, 'period')
    expectClose(top.power, 1, { atol: 1e-9 }, 'power of an exact sinusoid')
    expect(Math.abs(top.frequency - (res.grid.f0 + top.gridIndex * res.grid.df))).toBeLessThan(res.grid.df)
  })

  it('count, options and misuse', () => {
    const fx = loadFixture('sparse')
    const t = f64(fx.t), y = f64(fx.y), dy = f64(fx.dy)
    const r = periodogram(t, y, dy)
    expect(findPeaks(t, y, dy, r, { count: 2 }).length).toBe(2)
    expect(findPeaks(t, y, dy, r, { count: 0 })).toEqual([])
    expect(findPeaks(t, y, dy, r, { minWindowPower: 1.01 })[0].aliases).toEqual([])
    expect(() => findPeaks(t, y, dy, r, { count: -1 })).toThrow(/count/)
    expect(() => findPeaks(t.subarray(1), y.subarray(1), dy.subarray(1), r)).toThrow(/points/)
  })
})

import { describe, it, expect } from 'vitest'
import { expectClose } from '../../helpers/expect-close.ts'
import { createRandom } from '../../../shared/math/random.ts'
import {
  frequencyGrid, periodogram, periodogramDirect, periodogramFast, gls, chooseMethod, MAX_FREQUENCIES,
} from '../../../shared/rv/periodogram.ts'
import { FIXTURE_NAMES, loadFixture, f64, maxAbs, maxAbsDiff, fixtureGrid } from './periodogram-fixtures.ts'

describe('periodogram against astropy and scipy (fixtures/periodogram, scripts/reference/periodogram_reference.py)', () => {
  for (const name of FIXTURE_NAMES) {
    const fx = loadFixture(name)
    const t = f64(fx.t), y = f64(fx.y), dy = f64(fx.dy)
    const fg = fixtureGrid(t)

    it(`${name}: the fixture's grid (1.1 d to the baseline, 10× oversampled) is reproduced`, () => {
      const g = frequencyGrid(t, fg)
      expect(g.count).toBe(fx.grid.count)
      expectClose(g.f0, fx.grid.f0, { rtol: 1e-13 }, 'f0')
      expectClose(g.df, fx.grid.df, { rtol: 1e-13 }, 'df')
    })

    it(`${name}: direct floating-mean power equals astropy 5.2.1 LombScargle (fit_mean, standard) to 1e-9`, () => {
      const r = periodogramDirect(t, y, dy, fg)
      expectClose(r.power, fx.powerFloating, { atol: 1e-9 }, 'power')
    })

    it(`${name}: fast floating-mean power within 1e-4 of the peak of astropy 5.2.1 LombScargle`, () => {
      const r = periodogramFast(t, y, dy, fg)
      expect(r.method).toBe('fast')
      expect(maxAbsDiff(r.power, fx.powerFloating)).toBeLessThanOrEqual(1e-4 * maxAbs(fx.powerFloating))
    })

    it(`${name}: classic (floatingMean false) equals astropy 5.2.1 LombScargle(fit_mean=False, center_data=True) to 1e-9`, () => {
      expectClose(periodogramDirect(t, y, dy, { ...fg, floatingMean: false }).power, fx.powerClassic, { atol: 1e-9 }, 'direct')
      const fast = periodogramFast(t, y, dy, { ...fg, floatingMean: false })
      expect(maxAbsDiff(fast.power, fx.powerClassic)).toBeLessThanOrEqual(1e-4 * maxAbs(fx.powerClassic))
    })

    it(`${name}: classic with equal errors equals scipy 1.10.1 signal.lombscargle(normalize=True) of centred y`, () => {
      // Conversion (documented in the reference script): scipy's normalised power of y − mean(y) is
      // (YC²/CC + YS²/SS)/Σ(y − ȳ)², our floatingMean=false power when every dy is the same.
      const ones = new Float64Array(t.length).fill(2.5)
      expectClose(periodogramDirect(t, y, ones, { ...fg, floatingMean: false }).power, fx.scipyClassicEqualErrors, { atol: 1e-9 }, 'power')
    })

    it(`${name}: the highest grid power is at the injected period (${fx.generator.period} d)`, () => {
      const r = periodogram(t, y, dy, fg)
      let k = 0
      for (let i = 1; i < r.power.length; i++) if (r.power[i] > r.power[k]) k = i
      expect(k).toBe(fx.topPeaks[0].index)
      expectClose(1 / r.frequency[k], fx.generator.period, { rtol: 0.01 }, 'period')
    })

    it(`${name}: gls() at the astropy top peaks equals its grid power`, () => {
      for (const pk of fx.topPeaks) expectClose(gls(t, y, dy, pk.frequency), pk.power, { atol: 1e-10 }, `power at ${pk.frequency}`)
    })
  }
})

describe('periodogram behaviour', () => {
  const r = createRandom(7)
  const n = 80
  const t = new Float64Array(n), y = new Float64Array(n), dy = new Float64Array(n)
  for (let i = 0; i < n; i++) t[i] = 2458000 + 200 * r.next()
  t.sort()
  for (let i = 0; i < n; i++) { dy[i] = 2; y[i] = 4 * Math.cos(2 * Math.PI * t[i] / 9.1) + 2 * r.normal() }

  it('power lies in [0, 1] and the frequency array follows the grid', () => {
    const p = periodogram(t, y, dy)
    expect(p.nPoints).toBe(n)
    for (let k = 0; k < p.power.length; k++) {
      expect(p.power[k]).toBeGreaterThanOrEqual(0)
      expect(p.power[k]).toBeLessThanOrEqual(1)
    }
    expectClose(p.frequency[5], p.grid.f0 + 5 * p.grid.df, { rtol: 1e-15 }, 'f_5')
  })

  it('is unchanged by a shift of time or velocity (only differences matter)', () => {
    const a = periodogramDirect(t, y, dy)
    const t2 = t.map((v) => v - 2458000), y2 = y.map((v) => v + 1000)
    const b = periodogramDirect(t2, y2, dy)
    expectClose(b.power, a.power, { atol: 1e-9 }, 'power')
  })

  it('jitter equals adding it to dy in quadrature', () => {
    const a = periodogramDirect(t, y, dy, { jitter: 3 })
    const b = periodogramDirect(t, y, dy.map((s) => Math.hypot(s, 3)))
    expectClose(a.power, b.power, { atol: 1e-12 }, 'power')
  })

  it('honours minPeriod, maxPeriod, oversample and frequencies', () => {
    const g = frequencyGrid(t, { minPeriod: 2, maxPeriod: 50, oversample: 5 })
    expectClose(g.f0, 1 / 50, { rtol: 1e-15 }, 'f0')
    const base = t[n - 1] - t[0]
    expectClose(g.df, 1 / (5 * base), { rtol: 1e-15 }, 'df')
    expect(g.f0 + (g.count - 1) * g.df).toBeLessThanOrEqual(0.5 + 1e-12)
    const h = frequencyGrid(t, { minPeriod: 2, maxPeriod: 50, frequencies: 1000 })
    expect(h.count).toBe(1000)
    expectClose(h.f0 + 999 * h.df, 0.5, { rtol: 1e-14 }, 'fmax')
  })

  it('auto picks direct for small N·M and fast above', () => {
    expect(chooseMethod(20, 2000)).toBe('direct')
    expect(chooseMethod(50, 5000)).toBe('direct')
    expect(chooseMethod(30, 50_000)).toBe('direct')
    expect(chooseMethod(1000, 100_000)).toBe('fast')
    expect(chooseMethod(20_000, 2000)).toBe('fast')
    expect(() => frequencyGrid(t, { frequencies: MAX_FREQUENCIES + 1 })).toThrow(/frequencies/)
    expect(periodogram(t, y, dy, { method: 'fast' }).method).toBe('fast')
  })

  it('constant velocities give zero power (documented: nothing to remove)', () => {
    const p = periodogram(t, new Float64Array(n).fill(5), dy)
    expect(maxAbs(p.power)).toBe(0)
  })

  it('misuse throws naming the parameter', () => {
    expect(() => periodogram(t, y.subarray(1), dy)).toThrow(/y has/)
    expect(() => periodogram(t, y, dy, { minPeriod: -1 })).toThrow(/minPeriod/)
    expect(() => periodogram(t, y, dy, { minPeriod: 5000 })).toThrow(/maxPeriod/)
    expect(() => periodogram(t, y, dy, { oversample: 0 })).toThrow(/oversample/)
    expect(() => periodogram(t, y, dy, { frequencies: 1.5 })).toThrow(/frequencies/)
    expect(() => periodogram(t, y, dy, { jitter: -1 })).toThrow(/jitter/)
    expect(() => periodogram(t, y, dy, { method: 'slow' as never })).toThrow(/method/)
    const bad = y.slice(); bad[3] = NaN
    expect(() => periodogram(t, bad, dy)).toThrow(/y\[3\]/)
    const zero = dy.slice(); zero[2] = 0
    expect(() => periodogram(t, y, zero)).toThrow(/dy\[2\]/)
    expect(periodogram(t, y, zero, { jitter: 1 }).power.length).toBeGreaterThan(0)
    expect(() => gls(t, y, dy, Number.NaN)).toThrow(/frequency/)
  })
})

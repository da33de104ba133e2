import { describe, it, expect } from 'vitest'
import { expectClose } from '../../helpers/expect-close.ts'
import { createRandom } from '../../../shared/math/random.ts'
import { baluevFap, falseAlarmLevel, bootstrapFap, lnGamma, periodogram } from '../../../shared/rv/periodogram.ts'
import { FIXTURE_NAMES, loadFixture, f64 } from './periodogram-fixtures.ts'

describe('Baluev 2008 FAP against astropy 5.2.1 false_alarm_probability(method="baluev") (fixtures/periodogram)', () => {
  for (const name of FIXTURE_NAMES) {
    const fx = loadFixture(name)
    // astropy applies the Baluev formula at its own rounding of the top frequency (recorded in the
    // fixture) and computes Var(t) as E[t²] − E[t]², which loses ~1e-8 to cancellation: hence rtol 1e-7.
    const t = f64(fx.t), dy = f64(fx.dy), n = fx.t.length

    it(`${name}: FAP of the top peaks (relative 1e-7)`, () => {
      for (const pk of fx.topPeaks) {
        expectClose(baluevFap(pk.power, n, t, fx.astropyFapMaxFrequency, { dy }), pk.fapBaluev, { rtol: 1e-7, atol: 1e-15 }, `FAP at z=${pk.power}`)
      }
    })

    it(`${name}: FAP at fixed power levels`, () => {
      for (const lv of fx.fapAtLevels) {
        expectClose(baluevFap(lv.power, n, t, fx.astropyFapMaxFrequency, { dy }), lv.fapBaluev, { rtol: 1e-7, atol: 1e-15 }, `FAP at z=${lv.power}`)
      }
    })

    it(`${name}: false-alarm levels for 10 %, 1 %, 0.1 % (astropy false_alarm_level, to 1e-8)`, () => {
      for (const lv of fx.falseAlarmLevels) {
        expectClose(falseAlarmLevel(lv.fap, n, t, fx.astropyFapMaxFrequency, { dy }), lv.power, { atol: 1e-8 }, `level for ${lv.fap}`)
      }
    })
  }

  it('FAP falls from 1 to 0 as the power rises, and the level inverts it', () => {
    const fx = loadFixture('long'), t = f64(fx.t)
    let prev = 1
    for (let z = 0.01; z < 1; z += 0.01) {
      const p = baluevFap(z, 300, t, 0.9)
      expect(p).toBeLessThanOrEqual(prev + 1e-15)
      prev = p
    }
    expect(baluevFap(0, 300, t, 0.9)).toBe(1)
    expect(baluevFap(1, 300, t, 0.9)).toBe(0)
    const z = falseAlarmLevel(0.01, 300, t, 0.9)
    expectClose(baluevFap(z, 300, t, 0.9), 0.01, { rtol: 1e-8 }, 'round trip')
  })

  it('misuse throws naming the parameter', () => {
    const t = f64([0, 1, 2, 3, 4])
    expect(() => baluevFap(0.5, 2, t, 1)).toThrow(/nPoints/)
    expect(() => baluevFap(0.5, 5, t, 0)).toThrow(/maxFrequency/)
    expect(() => falseAlarmLevel(1.5, 5, t, 1)).toThrow(/fap/)
  })

  it('lnGamma matches known values (Γ(5) = 24, Γ(1/2) = √π; common practice)', () => {
    expectClose(lnGamma(5), Math.log(24), { rtol: 1e-14 }, 'lnΓ(5)')
    expectClose(lnGamma(0.5), 0.5 * Math.log(Math.PI), { rtol: 1e-14 }, 'lnΓ(1/2)')
    expectClose(lnGamma(150.5), 602.5139548705853, { rtol: 1e-13 }, 'lnΓ(150.5) vs scipy 1.10.1 special.gammaln')
  })
})

describe('bootstrap FAP', () => {
  // pure noise: 40 points over 200 d
  const r = createRandom(2024)
  const n = 40
  const t = new Float64Array(n), y = new Float64Array(n), dy = new Float64Array(n).fill(1.5)
  for (let i = 0; i < n; i++) t[i] = 200 * r.next()
  t.sort()
  for (let i = 0; i < n; i++) y[i] = 1.5 * r.normal()
  const opts = { minPeriod: 2, oversample: 5 }

  it('is deterministic for a fixed seed', () => {
    const p = periodogram(t, y, dy, opts)
    const top = Math.max(...p.power)
    const a = bootstrapFap(t, y, dy, top, { ...opts, samples: 100, random: createRandom(5) })
    const b = bootstrapFap(t, y, dy, top, { ...opts, samples: 100, random: createRandom(5) })
    expect(a).toBe(b)
  })

  it('roughly agrees with Baluev for pure noise (within 0.15 at the 50 % and 10 % levels)', () => {
    const fmax = 0.5
    for (const target of [0.5, 0.1]) {
      const z = falseAlarmLevel(target, n, t, fmax, { dy })
      const boot = bootstrapFap(t, y, dy, z, { ...opts, samples: 300, random: createRandom(11) })
      expect(Math.abs(boot - target), `bootstrap ${boot} vs Baluev ${target}`).toBeLessThan(0.15)
    }
  })

  it('throws without a seeded generator or with bad samples', () => {
    expect(() => bootstrapFap(t, y, dy, 0.3, { ...opts, samples: 0, random: createRandom(1) })).toThrow(/samples/)
    expect(() => bootstrapFap(t, y, dy, 0.3, { ...opts } as never)).toThrow(/random/)
  })
})

import { readFileSync } from 'node:fs'
import { describe, it, expect } from 'vitest'
import { expectClose } from '../../helpers/expect-close.ts'
import {
  toBjdTdb, toBjdTdbDirect, directEphemeris, interpolatedEphemeris, utcToTt, tdbMinusTt, ttToTdb, taiMinusUtc, conversionWarnings, julianDay, SITES, findSite,
  type Site, type Target,
} from '../../../shared/time/index.ts'

/** Reference times from astropy 5.2.1 (scripts/reference/bjd_reference.py), each as [integer JD, fraction]. */
interface Case {
  site: Site & { name: string }; star: Target & { name: string }
  jdUtc: [number, number][]; jdTt: [number, number][]; jdTdb: [number, number][]; bjdTdb: [number, number][]; hjdUtc: [number, number][]
}
const doc = JSON.parse(readFileSync(new URL('../../../fixtures/time/bjd_astropy.json', import.meta.url), 'utf8')) as { cases: Case[] }
const full = (pairs: [number, number][]) => Float64Array.from(pairs.map(([a, b]) => a + b))
/** Seconds between a full JD and a split reference, computed without losing the fraction's precision. */
const secondsFrom = (jd: number, [day, frac]: [number, number]) => ((jd - day) - frac) * 86400

describe('toBjdTdb against astropy (Time.tdb + light_travel_time, builtin ephemeris)', () => {
  it('covers four sites, five sky positions and 1995–2030', () => {
    expect(doc.cases.length).toBe(20)
    const all = doc.cases.flatMap((c) => c.jdUtc.map(([d]) => d))
    expect(Math.min(...all)).toBeLessThan(julianDay(1996, 1, 1))
    expect(Math.max(...all)).toBeGreaterThan(julianDay(2029, 1, 1))
  })

  for (const c of doc.cases) {
    it(`agrees to 0.1 s from UTC at ${c.site.name} for the ${c.star.name} star`, () => {
      const out = toBjdTdb(full(c.jdUtc), 'utc', c.star, c.site)
      // Issue 10's bound is 0.1 s; astronomy-engine's Earth ephemeris gives about 10 ms (see README).
      c.bjdTdb.forEach((ref, i) => expect(Math.abs(secondsFrom(out[i]!, ref)), `time ${i}`).toBeLessThan(0.1))
    })
  }

  it('agrees to 20 ms at worst over all cases (the measured accuracy, kept from slipping)', () => {
    let worst = 0
    for (const c of doc.cases) {
      const out = toBjdTdb(full(c.jdUtc), 'utc', c.star, c.site)
      c.bjdTdb.forEach((ref, i) => { worst = Math.max(worst, Math.abs(secondsFrom(out[i]!, ref))) })
    }
    expect(worst).toBeLessThan(0.02)
  })

  it('undoes heliocentric dates (HJD_UTC) to the same BJD_TDB within 0.1 s', () => {
    for (const c of doc.cases) {
      const out = toBjdTdb(full(c.hjdUtc), 'hjd-utc', c.star, c.site)
      c.bjdTdb.forEach((ref, i) => expect(Math.abs(secondsFrom(out[i]!, ref)), `${c.site.name}/${c.star.name} ${i}`).toBeLessThan(0.1))
    }
  })

  it('needs the proper motion: without it the fast-moving star is off by more than 0.1 s', () => {
    const c = doc.cases.find((x) => x.star.name === 'fast-mover')!
    const still = toBjdTdb(full(c.jdUtc), 'utc', { raDeg: c.star.raDeg, decDeg: c.star.decDeg }, c.site)
    const worst = Math.max(...c.bjdTdb.map((ref, i) => Math.abs(secondsFrom(still[i]!, ref))))
    expect(worst).toBeGreaterThan(0.1)
  })

  it('takes TT input to the same result as UTC input', () => {
    const c = doc.cases[0]!
    const tt = Float64Array.from(full(c.jdUtc), utcToTt)
    expectClose(toBjdTdb(tt, 'tt', c.star, c.site), toBjdTdb(full(c.jdUtc), 'utc', c.star, c.site), { atol: 1e-9, rtol: 0 })
  })
})

describe('time scales against astropy', () => {
  it('UTC → TT matches astropy to 0.1 ms (leap-second table)', () => {
    for (const c of doc.cases) {
      c.jdUtc.forEach(([d, f], i) => expect(Math.abs(secondsFrom(utcToTt(d + f), c.jdTt[i]!))).toBeLessThan(1e-4))
    }
  })

  it('TDB − TT matches astropy to 20 µs (series of USNO Circular 179; astropy adds the ≤ 2 µs site term)', () => {
    for (const c of doc.cases) {
      c.jdTt.forEach((tt, i) => {
        const tdb = c.jdTdb[i]!
        const reference = ((tdb[0] - tt[0]) + (tdb[1] - tt[1])) * 86400
        expect(Math.abs(tdbMinusTt(tt[0] + tt[1]) - reference)).toBeLessThan(2e-5)
      })
    }
  })

  it('TDB − TT stays within its known ±1.7 ms yearly swing', () => {
    for (let jd = 2449718.5; jd < 2462502.5; jd += 9.7) expect(Math.abs(tdbMinusTt(jd))).toBeLessThan(0.0018)
    expect(ttToTdb(2451545)).toBeCloseTo(2451545 + tdbMinusTt(2451545) / 86400, 12)
  })

  it('counts leap seconds: 32 s in 2000, 37 s since 2017 (IERS Bulletin C)', () => {
    expect(taiMinusUtc(julianDay(2000, 1, 1))).toBe(32)
    expect(taiMinusUtc(julianDay(2016, 12, 31) + 0.99)).toBe(36)
    expect(taiMinusUtc(julianDay(2017, 1, 1))).toBe(37)
    expect(taiMinusUtc(julianDay(1972, 1, 1))).toBe(10)
    expect(julianDay(2000, 1, 1)).toBe(2451544.5)
  })
})

describe('toBjdTdb: fast path, misuse and doubts', () => {
  it('the interpolated ephemeris agrees with the direct one to 0.1 ms (a float64 JD resolves 40 µs)', () => {
    for (const c of doc.cases.slice(0, 6)) {
      expectClose(toBjdTdb(full(c.jdUtc), 'utc', c.star, c.site), toBjdTdbDirect(full(c.jdUtc), 'utc', c.star, c.site), { atol: 1e-4 / 86400, rtol: 0 })
    }
  })

  it('the interpolated observer position stays within 10 km of the direct one (1995–2030, every 3.1 d)', () => {
    const site = findSite('mauna-kea')!
    const direct = directEphemeris(site), fast = interpolatedEphemeris(site)
    let worstKm = 0
    for (let i = 0; i < 4000; i++) {
      const t = 2449718.5 + i * 3.1234567
      const p = direct(t), q = fast(t)
      worstKm = Math.max(worstKm, Math.hypot(p.observer[0] - q.observer[0], p.observer[1] - q.observer[1], p.observer[2] - q.observer[2]) * 149597870.7)
      worstKm = Math.max(worstKm, Math.hypot(p.sun[0] - q.sun[0], p.sun[1] - q.sun[1], p.sun[2] - q.sun[2]) * 149597870.7)
    }
    expect(worstKm).toBeLessThan(10)
  })

  it('returns barycentric TDB input unchanged, as a copy', () => {
    const jd = Float64Array.of(2459000.5, 2459001.25)
    const out = toBjdTdb(jd, 'tdb', { raDeg: 10, decDeg: 20 }, SITES[0]!)
    expect(Array.from(out)).toEqual(Array.from(jd))
    expect(out).not.toBe(jd)
  })

  it('refuses reduced dates, UTC before 1972 and impossible coordinates, naming the field', () => {
    const site = findSite('la-silla')!
    expect(() => toBjdTdb(Float64Array.of(59000.5), 'utc', { raDeg: 10, decDeg: 20 }, site)).toThrow(/jd\[0\].*offset/)
    expect(() => toBjdTdb(Float64Array.of(2440000.5), 'utc', { raDeg: 10, decDeg: 20 }, site)).toThrow(/before 1972/)
    expect(() => toBjdTdb(Float64Array.of(2459000.5), 'utc', { raDeg: 360, decDeg: 20 }, site)).toThrow(/raDeg/)
    expect(() => toBjdTdb(Float64Array.of(2459000.5), 'utc', { raDeg: 10, decDeg: 91 }, site)).toThrow(/decDeg/)
    expect(() => toBjdTdb(Float64Array.of(2459000.5), 'utc', { raDeg: 10, decDeg: 0 }, { ...site, latDeg: 95 })).toThrow(/latDeg/)
    expect(() => toBjdTdb(Float64Array.of(2459000.5), 'jd' as never, { raDeg: 10, decDeg: 0 }, site)).toThrow(/scale/)
  })

  it('says when UTC times lie beyond the leap-second table it knows', () => {
    expect(conversionWarnings([2459000.5], 'utc')).toEqual([])
    expect(conversionWarnings([julianDay(2027, 3, 1)], 'utc')[0]).toMatch(/37 s is assumed/)
    expect(conversionWarnings([julianDay(2027, 3, 1)], 'tdb')).toEqual([])
  })

  it('moves a star on the ecliptic by about ±8.3 min over the year (the light time across 1 au)', () => {
    const jd = Float64Array.from({ length: 73 }, (_, i) => 2459000.5 + i * 5)
    const out = toBjdTdb(jd, 'tt', { raDeg: 0, decDeg: 0 }, { lonDeg: 0, latDeg: 0, heightM: 0 })
    const delays = Array.from(out, (b, i) => (b - jd[i]!) * 86400)
    expect(Math.max(...delays)).toBeGreaterThan(480)
    expect(Math.min(...delays)).toBeLessThan(-480)
    expect(Math.max(...delays.map(Math.abs))).toBeLessThan(505)
  })

  it('has a site table with plausible, unique entries', () => {
    expect(new Set(SITES.map((s) => s.id)).size).toBe(SITES.length)
    for (const s of SITES) {
      expect(Math.abs(s.lonDeg)).toBeLessThanOrEqual(180)
      expect(Math.abs(s.latDeg)).toBeLessThan(90)
      expect(s.heightM).toBeGreaterThan(0)
      expect(s.source.length).toBeGreaterThan(5)
    }
  })
})

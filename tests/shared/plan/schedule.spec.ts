import { describe, it, expect } from 'vitest'
import { createRandom } from '../../../shared/math/index.ts'
import { pickSpaced, plan, planToCsv, planToIcs, icsFold, icsEscape, PLAN_CSV_COLUMNS, type PosteriorDraws } from '../../../shared/plan/index.ts'

const site = { lonDeg: -70.73, latDeg: -29.26, heightM: 2400 }
const star = { raDeg: 83.82, decDeg: -5.39 } // up in the evening in December from the site

function draws(n: number): PosteriorDraws {
  const r = createRandom(5)
  const col = (f: () => number): Float64Array => Float64Array.from({ length: n }, f)
  return {
    planets: [{
      period: col(() => 41 + 0.8 * r.normal()), K: col(() => 18 + 2 * r.normal()), e: col(() => 0.1 + 0.02 * r.next()),
      omegaDeg: col(() => 40 + 15 * r.normal()), tp: col(() => 2461300 + 2 * r.normal()),
    }],
  }
}

describe('picking spaced instants', () => {
  it('takes the best first and keeps picks at least the spacing apart', () => {
    const t = [0, 0.2, 0.5, 1.3, 2, 2.4, 3]
    const s = [1, 9, 8, 3, 7, 7.5, 2]
    expect(pickSpaced(t, s, 3, 1)).toEqual([1, 5, 3])
    expect(pickSpaced(t, s, 10, 0)).toHaveLength(7)
    expect(() => pickSpaced(t, s, 0, 1)).toThrow(/count/)
  })
})

describe('the plan', () => {
  const result = plan(draws(200), {
    star, site, grid: { startJd: 2461384.5, endJd: 2461384.5 + 21, stepMinutes: 30 }, noise: 2, count: 8, minSpacingDays: 1.5,
  })

  it('recommends only observable instants, in time order, spaced, and includes the best observable one', () => {
    const recs = result.recommendations
    expect(recs).toHaveLength(8)
    for (const r of recs) {
      expect(r.sunAltDeg).toBeLessThanOrEqual(-18)
      expect(r.starAltDeg).toBeGreaterThanOrEqual(30)
      expect(r.airmass).toBeLessThanOrEqual(2)
    }
    for (let i = 1; i < recs.length; i++) expect(recs[i].jdUtc - recs[i - 1].jdUtc).toBeGreaterThanOrEqual(1.5 - 1e-9)
    const best = Math.max(...result.slots.filter((s) => s.observable).map((s) => s.information))
    expect(recs.some((r) => r.information === best)).toBe(true)
    expect(result.slots.find((s) => !s.observable && s.information > best)).toBeDefined() // daytime would be better: the limits matter
  })

  it('says so when nothing can be observed', () => {
    const r = plan(draws(20), {
      star: { raDeg: 83.82, decDeg: 80 }, site, grid: { startJd: 2461384.5, endJd: 2461386.5, stepMinutes: 60 }, noise: 2,
    })
    expect(r.recommendations).toHaveLength(0)
    expect(r.warnings.join(' ')).toMatch(/cannot be observed/)
  })

  it('exports CSV with one row per recommendation and the named columns', () => {
    const csv = planToCsv(result.recommendations, ['star: demo, site: south'])
    const lines = csv.trimEnd().split('\r\n')
    expect(lines[0]).toBe('# star: demo, site: south')
    expect(lines[1]).toBe(PLAN_CSV_COLUMNS.join(','))
    expect(lines).toHaveLength(2 + 8)
    expect(lines[2]).toMatch(/^2026-12-\d\dT\d\d:\d\d:\d\dZ,2461\d{3}\.\d{6},/)
  })

  it('exports iCalendar (RFC 5545): CRLF lines of at most 75 octets, one event each, UTC times', () => {
    const ics = planToIcs(result.recommendations, { star: 'Demo; star, A', site: 'South mountain', stampJd: 2461384.5 })
    expect(ics.endsWith('\r\n')).toBe(true)
    const physical = ics.slice(0, -2).split('\r\n')
    for (const l of physical) expect(new TextEncoder().encode(l).length).toBeLessThanOrEqual(75)
    const unfolded = ics.replace(/\r\n /g, '').split('\r\n')
    expect(unfolded[0]).toBe('BEGIN:VCALENDAR')
    expect(unfolded.filter((l) => l === 'BEGIN:VEVENT')).toHaveLength(8)
    expect(unfolded).toContain('DTSTAMP:20261210T000000Z')
    expect(unfolded.find((l) => l.startsWith('SUMMARY:'))).toBe('SUMMARY:Observe Demo\\; star\\, A (RV)')
    expect(unfolded.filter((l) => /^DTSTART:\d{8}T\d{6}Z$/.test(l))).toHaveLength(8)
  })

  it('folds without splitting a multi-byte character, and escapes TEXT', () => {
    const line = 'DESCRIPTION:' + 'ω'.repeat(60)
    const folded = icsFold(line)
    expect(folded.replace(/\r\n /g, '')).toBe(line)
    for (const l of folded.split('\r\n')) expect(new TextEncoder().encode(l).length).toBeLessThanOrEqual(75)
    expect(icsEscape('a,b;c\\d\ne')).toBe('a\\,b\\;c\\\\d\\ne')
  })
})

describe('observing limits', () => {
  it('fills defaults for fields given as undefined and refuses out-of-range ones, naming them', async () => {
    const { resolveLimits } = await import('../../../shared/plan/index.ts')
    expect(resolveLimits({ sunMaxAltDeg: undefined, minAltDeg: 40 })).toMatchObject({ sunMaxAltDeg: -18, minAltDeg: 40, maxAirmass: 2, minMoonSeparationDeg: 30 })
    expect(resolveLimits({ minAltDeg: 10, maxAirmass: 1.5 }).effectiveMinAltDeg).toBeGreaterThan(41) // air mass 1.5 is the stricter
    expect(() => resolveLimits({ minMoonSeparationDeg: 200 })).toThrow(/minMoonSeparationDeg/)
  })
})

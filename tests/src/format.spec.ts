// The one formatting home of the screens (src/format): plurals, counts, significant digits, numbers
// by their uncertainty, dates in the locale with the time zone.
import { describe, expect, it } from 'vitest'
import { formatByError, formatCount, formatDate, formatDateTime, formatSig, plural } from '@/format/index.ts'

describe('screen formatting', () => {
  it('writes plurals by number', () => {
    expect(plural(1, 'iteration')).toBe('1 iteration')
    expect(plural(2, 'iteration')).toBe('2 iterations')
    expect(plural(0, 'walker')).toBe('0 walkers')
    expect(plural(1, 'analysis', 'analyses')).toBe('1 analysis')
    expect(plural(40000, 'step')).toBe(`${formatCount(40000)} steps`)
  })

  it('writes numbers without float noise', () => {
    expect(formatSig(1.4649999999999999)).toBe('1.465')
    expect(formatSig(0.1 + 0.2, 3)).toBe('0.300')
    expect(formatSig(2459044.123456, 10)).toBe('2459044.123')
    expect(formatSig(6.2e-9, 2)).toBe('6.2e-9')
    expect(formatSig(null)).toBe('—')
    expect(formatByError(12.30803, 0.0207)).toBe('12.308 ± 0.021')
    expect(formatByError(1.4649999999999999, null)).toBe('1.465')
  })

  it('writes dates in the locale with the time zone named, and a dash for none', () => {
    const iso = '2026-12-02T10:31:00Z'
    const expected = new Intl.DateTimeFormat(undefined, { year: 'numeric', month: 'short', day: 'numeric', hour: '2-digit', minute: '2-digit', timeZoneName: 'short' }).format(new Date(iso))
    expect(formatDateTime(iso)).toBe(expected)
    expect(formatDateTime(iso)).toMatch(/2026/)
    const tz = new Intl.DateTimeFormat(undefined, { timeZoneName: 'short' }).formatToParts(new Date(iso)).find((p) => p.type === 'timeZoneName')!.value
    expect(formatDateTime(iso)).toContain(tz)
    expect(formatDate(iso)).toMatch(/2026/)
    expect(formatDate(null)).toBe('—')
    expect(formatDateTime('not a date')).toBe('—')
  })
})

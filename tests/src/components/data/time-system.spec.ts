import { describe, expect, it } from 'vitest'
import { starTimeSystem } from '@/components/data/time-system.ts'
import { median, removeZeroPoints, zeroPoints } from '@/components/data/zero-points.ts'
import type { Measurement } from '@/api/types.ts'

describe('starTimeSystem', () => {
  it('labels barycentric data without a doubt', () => {
    expect(starTimeSystem([{ timeScale: 'bjd_tdb' }, { timeScale: 'bjd_tdb' }])).toEqual({ label: 'BJD_TDB', scale: 'bjd_tdb', warning: null })
  })

  it('labels UTC data and says what is wrong and what to do', () => {
    const s = starTimeSystem([{ timeScale: 'jd_utc' }])
    expect(s.label).toBe('JD_UTC')
    expect(s.warning).toMatch(/not barycentric.*8\.3 min.*observatory chosen/)
  })

  it('treats a missing scale as not recorded, and several scales as a doubt of their own', () => {
    expect(starTimeSystem([{}]).label).toBe('JD')
    expect(starTimeSystem([{}]).warning).toMatch(/not recorded/)
    const mixed = starTimeSystem([{ timeScale: 'bjd_tdb' }, { timeScale: 'hjd_utc' }])
    expect(mixed.scale).toBe('mixed')
    expect(mixed.warning).toMatch(/BJD_TDB, HJD_UTC/)
  })
})

const point = (id: number, instrument: string, rv: number, excluded = false): Measurement => ({
  id, datasetId: 1, instrument, timeScale: 'bjd_tdb', time: 2459000 + id, rv, error: 1, indicators: {},
  excluded, excludedReason: excluded ? 'x' : null, excludedBy: null, excludedAt: null,
})

describe('zero points', () => {
  // a six-instrument star with a −33 km/s absolute set beside ~0 m/s relative ones is unreadable as stored
  const data = [
    point(1, 'Absolute', -33010), point(2, 'Absolute', -33000), point(3, 'Absolute', -32990), point(4, 'Absolute', 5000, true),
    point(5, 'Relative', 2), point(6, 'Relative', -2),
  ]

  it('removes each instrument\'s median of the points in use (an excluded outlier does not move it)', () => {
    const zp = zeroPoints(data)
    expect(zp).toEqual([
      { instrument: 'Absolute', value: -33000, source: 'median', n: 3 },
      { instrument: 'Relative', value: 0, source: 'median', n: 2 },
    ])
    const corrected = removeZeroPoints(data, zp)
    expect(corrected.map((m) => m.rv)).toEqual([-10, 0, 10, 38000, 2, -2])
    expect(corrected.map((m) => m.error)).toEqual(data.map((m) => m.error))
  })

  it('uses a fitted model\'s offsets where it has them and the median elsewhere', () => {
    const zp = zeroPoints(data, { modelName: 'one planet', offsets: { Absolute: -33003.5 } })
    expect(zp[0]).toMatchObject({ instrument: 'Absolute', value: -33003.5, source: 'fitted' })
    expect(zp[1]).toMatchObject({ instrument: 'Relative', value: 0, source: 'median' })
  })

  it('median of even and odd counts', () => {
    expect(median([3, 1, 2])).toBe(2)
    expect(median([4, 1, 3, 2])).toBe(2.5)
  })
})

import { describe, it, expect } from 'vitest'
import {
  timeSystemLabel, timeSystemOffset, formatTime, timeAxisTitle, timeScaleName, timeScaleWarning, displayOffset, groupDigits, isBarycentricTdb,
} from '../../../shared/time/index.ts'

describe('time system labels', () => {
  it('names the scale and the offset', () => {
    expect(timeSystemLabel({ scale: 'bjd_tdb', format: 'jd-2457000' })).toBe('BJD_TDB − 2 457 000')
    expect(timeSystemLabel({ scale: 'bjd_tdb', offset: 2450000 })).toBe('BJD_TDB − 2 450 000')
    expect(timeSystemLabel({ scale: 'jd_utc', format: 'jd' })).toBe('JD_UTC')
    expect(timeSystemLabel({ scale: 'jd_utc', format: 'mjd' })).toBe('MJD_UTC')
    expect(timeSystemLabel({ scale: 'bjd_tdb', format: 'mjd' })).toBe('BJD_TDB − 2 400 000.5')
    expect(timeSystemLabel({ scale: 'hjd_utc', offset: 2400000 })).toBe('HJD_UTC − 2 400 000')
    expect(timeSystemLabel({ scale: 'jd_tt' })).toBe('JD_TT')
    expect(timeSystemLabel({ scale: null })).toBe('JD')
    expect(timeSystemLabel({ format: 'bjd' })).toBe('BJD_TDB')
    expect(timeSystemLabel({ format: 'days', scale: 'bjd_tdb' })).toBe('days (no zero point)')
  })

  it('reads the conversion and report spellings of scales', () => {
    expect(timeScaleName('tdb')).toBe('bjd_tdb')
    expect(timeScaleName('hjd-utc')).toBe('hjd_utc')
    expect(timeScaleName('UTC')).toBe('jd_utc')
    expect(timeScaleName('nonsense')).toBe('unknown')
    expect(isBarycentricTdb('BJD_TDB')).toBe(true)
    expect(isBarycentricTdb('jd_utc')).toBe(false)
  })

  it('formats values in the system and titles axes with the unit', () => {
    expect(timeSystemOffset({ format: 'jd-2457000' })).toBe(2457000)
    expect(formatTime(2459123.456789, { scale: 'bjd_tdb', offset: 2457000 })).toBe('2123.45679')
    expect(formatTime(Number.NaN, { scale: 'bjd_tdb' })).toBe('—')
    expect(timeAxisTitle({ scale: 'bjd_tdb', offset: 2450000 })).toBe('Time (BJD_TDB − 2 450 000, d)')
    expect(groupDigits(2400000.5)).toBe('2 400 000.5')
    expect(displayOffset([2459123.4, 2455001.2])).toBe(2450000)
    expect(displayOffset([12.5])).toBe(0)
  })

  it('warns wherever non-barycentric times are analysed, and not for BJD_TDB', () => {
    expect(timeScaleWarning('bjd_tdb')).toBeNull()
    expect(timeScaleWarning('jd_utc')).toMatch(/8\.3 min/)
    expect(timeScaleWarning('hjd_utc')).toMatch(/heliocentric/)
    expect(timeScaleWarning(undefined)).toMatch(/not recorded/)
  })
})

import { describe, expect, it } from 'vitest'
import { readName, timeFromName, unitFromName } from '../../../shared/ingest/names.ts'

// Header spellings seen in published tables and lab exports (common practice), read one by one.
describe('header names', () => {
  const roles: Array<[string, string | null, string?]> = [
    ['time', 'time'], ['t', 'time'], ['JD', 'time'], ['BJD_TDB', 'time'], ['HJD', 'time'], ['MJD', 'time'],
    ['rjd', 'time'], ['Date', 'time'], ['epoch', 'time'], ['Time (BJD-2450000)', 'time'], ['t_bjd', 'time'],
    ['rv', 'rv'], ['RV [m/s]', 'rv'], ['vrad', 'rv'], ['Vr', 'rv'], ['v', 'rv'],
    ['velocity', 'rv'], ['rv_kms', 'rv'], ['RV (km s-1)', 'rv'],
    ['err', 'error'], ['error', 'error'], ['sigma', 'error'], ['sig', 'error'], ['e', 'error'], ['e_rv', 'error'],
    ['eRV', 'error'], ['sRV', 'error'], ['sigma_RV [m/s]', 'error'], ['σRV', 'error'], ['rv_err', 'error'],
    ['RVerror', 'error'], ['svrad', 'error'], ['uncertainty', 'error'], ['err_kms', 'error'], ['dRV', 'error'],
    ['instrument', 'instrument'], ['inst', 'instrument'], ['set', 'instrument'], ['Telescope', 'instrument'],
    ['spectrograph', 'instrument'],
    ['bis', 'indicator', 'bisector_span'], ['BIS_span', 'indicator', 'bisector_span'], ['bisector', 'indicator', 'bisector_span'],
    ['FWHM', 'indicator', 'fwhm'], ['fwhm [km/s]', 'indicator', 'fwhm'], ['FWHM_err', 'indicator', 'fwhm_err'],
    ['e_fwhm', 'indicator', 'fwhm_err'], ['S_MW', 'indicator', 's_index'], ['sindex', 'indicator', 's_index'],
    ['S', 'indicator', 's_index'], ['logRhk', 'indicator', 'log_rhk'], ["log R'HK", 'indicator', 'log_rhk'],
    ['Halpha', 'indicator', 'h_alpha'], ['H_alpha', 'indicator', 'h_alpha'], ['ha', 'indicator', 'h_alpha'],
    ['sig_bis', 'indicator', 'bisector_span_err'], ['contrast_err', 'indicator', 'contrast_err'],
    ['snr', null], ['airmass', null], ['', null],
  ]
  for (const [name, role, indicator] of roles) {
    it(`reads '${name}' as ${role ?? 'unknown'}${indicator ? ` (${indicator})` : ''}`, () => {
      const r = readName(name)
      expect(r.role).toBe(role)
      if (indicator) expect(r.indicator).toBe(indicator)
    })
  }

  const units: Array<[string, string | undefined]> = [
    ['rv [km/s]', 'km/s'], ['rv_kms', 'km/s'], ['RV (km s-1)', 'km/s'], ['vrad km.s^-1', 'km/s'], ['kmps', 'km/s'],
    ['rv [m/s]', 'm/s'], ['rv_ms', 'm/s'], ['RV (m s-1)', 'm/s'], ['rv mps', 'm/s'],
    ['rv', undefined], ['rms', undefined], ['forms', undefined],
  ]
  for (const [name, unit] of units) {
    it(`reads the unit of '${name}' as ${unit ?? 'none'}`, () => expect(unitFromName(name)).toBe(unit))
  }

  const times: Array<[string, string | undefined]> = [
    ['BJD', 'bjd'], ['bjd_tdb', 'bjd'], ['JD', 'jd'], ['HJD', 'jd'], ['MJD', 'mjd'], ['JD-2400000.5', 'mjd'],
    ['rjd', 'jd-2400000'], ['JD - 2400000', 'jd-2400000'], ['BJD-2450000', 'jd-2450000'], ['t [days]', 'days'], ['time', undefined],
  ]
  for (const [name, time] of times) {
    it(`reads the time format of '${name}' as ${time ?? 'none'}`, () => expect(timeFromName(name)).toBe(time))
  }
})

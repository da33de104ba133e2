import { describe, expect, it } from 'vitest'
import { detectTable, type Detection } from '../../../shared/ingest/index.ts'
import { fixture } from './helpers.ts'

/** Role of each column, in order ('indicator:key' for indicators). */
function roles(d: Detection): string[] {
  return d.mapping.columns.map(c => (c.role === 'indicator' ? `indicator:${c.indicator}` : c.role))
}

describe('delimiter', () => {
  const body = [[2450001.5, 10.5, 1.2], [2450002.5, -3.1, 1.1], [2450003.5, 4.0, 1.3]]
  const cases: Array<[string, string, string]> = [
    ['comma', ',', ','],
    ['tab', '\t', '\t'],
    ['semicolon', ';', ';'],
    ['spaces', '   ', 'whitespace'],
    ['comma and space', ', ', ','],
  ]
  for (const [label, sep, expected] of cases) {
    it(`detects ${label}`, () => {
      const text = body.map(r => r.join(sep)).join('\n') + '\n'
      const d = detectTable(text)
      expect(d.mapping.delimiter).toBe(expected)
      expect(d.columnCount).toBe(3)
      expect(roles(d)).toEqual(['time', 'rv', 'error'])
    })
  }

  it('reads mixed tabs and spaces as whitespace', () => {
    const d = detectTable('2450001.5 \t10.5  1.2\n2450002.5\t-3.1 1.1\n2450003.5  4.0\t1.3\n')
    expect(d.mapping.delimiter).toBe('whitespace')
    expect(d.columnCount).toBe(3)
  })

  it('keeps tab as the delimiter when instrument names contain spaces', () => {
    const d = detectTable('time\trv\terr\tinst\n2450001\t1\t1\tHARPS N\n2450002\t2\t1\tHARPS N\n2450003\t2\t1\tHARPS\n')
    expect(d.mapping.delimiter).toBe('\t')
    expect(roles(d)).toEqual(['time', 'rv', 'error', 'instrument'])
  })

  it('reads a trailing delimiter as an empty, ignored column', () => {
    const d = detectTable('time,rv,err\n2450001,1,1,\n2450002,2,1,\n2450003,3,1,\n')
    expect(d.columnCount).toBe(4)
    expect(roles(d)).toEqual(['time', 'rv', 'error', 'ignore'])
  })

  it('recognises decimal commas with semicolons', () => {
    const d = detectTable(fixture('ingest/semicolon-decimal-comma.txt'))
    expect(d.mapping.delimiter).toBe(';')
    expect(d.mapping.decimalComma).toBe(true)
    expect(d.mapping.timeFormat).toBe('mjd')
  })

  it('reads quoted CSV headers and cells', () => {
    const d = detectTable('"time","rv","err","instrument"\n2450001,1,1,"HARPS N"\n2450002,2,1,"HARPS N"\n')
    expect(d.headerNames).toEqual(['time', 'rv', 'err', 'instrument'])
    expect(d.preview[0]!.cells).toEqual(['2450001', '1', '1', 'HARPS N'])
  })

  it('follows a delimiter hint', () => {
    const d = detectTable('2450001 1 1\n2450002 2 1\n', { delimiter: 'whitespace' })
    expect(d.mapping.delimiter).toBe('whitespace')
    expect(d.notes[0]).toMatch(/as given/)
  })
})

describe('header', () => {
  it('finds a header row', () => {
    const d = detectTable('time rv err\n2450001 1 1\n2450002 2 1\n')
    expect(d.mapping.hasHeader).toBe(true)
    expect(d.headerFromComment).toBe(false)
    expect(d.headerLine).toBe(1)
    expect(d.headerNames).toEqual(['time', 'rv', 'err'])
    expect(d.rowCount).toBe(2)
  })

  it('reads a table without a header by position', () => {
    const d = detectTable('2450001 1 1\n2450002 2 1\n')
    expect(d.mapping.hasHeader).toBe(false)
    expect(d.headerNames).toBeNull()
    expect(d.mapping.columns.map(c => c.name)).toEqual(['column 1', 'column 2', 'column 3'])
    expect(roles(d)).toEqual(['time', 'rv', 'error'])
  })

  it('takes a commented name line just before the data as the header', () => {
    const d = detectTable('# star X, observed 2010\n# bjd rv err\n\n2455001 1 1\n2455002 2 1\n')
    expect(d.mapping.hasHeader).toBe(false)
    expect(d.headerFromComment).toBe(true)
    expect(d.headerLine).toBe(2)
    expect(d.headerNames).toEqual(['bjd', 'rv', 'err'])
    expect(d.commentLines).toBe(2)
    expect(d.mapping.timeFormat).toBe('bjd')
  })

  it('does not take a comment of plain words as the header', () => {
    const d = detectTable('# HARPS data below\n2455001 1 1\n2455002 2 1\n')
    expect(d.headerNames).toBeNull()
  })

  it('does not take a comment with numbers in it as the header', () => {
    const d = detectTable('# observed 2010 to 2012\n2455001 1 1\n2455002 2 1\n')
    expect(d.headerNames).toBeNull()
    expect(d.headerFromComment).toBe(false)
  })

  it('accepts `!` and `%` comment lines', () => {
    const d = detectTable('! produced by hand\n% jd vrad svrad\n2455001 1 1\n2455002 2 1\n')
    expect(d.headerNames).toEqual(['jd', 'vrad', 'svrad'])
    expect(roles(d)).toEqual(['time', 'rv', 'error'])
  })

  it('accepts a commented header naming only the first columns', () => {
    const d = detectTable('# time rv err\n2455001 1 1 HARPS\n2455002 2 1 HARPS\n')
    expect(d.headerNames).toEqual(['time', 'rv', 'err', 'column 4'])
    expect(roles(d)).toEqual(['time', 'rv', 'error', 'instrument'])
  })

  it('folds bracketed units into whitespace header names', () => {
    const d = detectTable('# time rv [km/s] err [km/s]\n2455001 1.001 0.001\n2455002 1.002 0.001\n')
    expect(d.headerNames).toEqual(['time', 'rv [km/s]', 'err [km/s]'])
    expect(d.mapping.unit).toBe('km/s')
  })

  it('skips a units row under the header and reads the unit from it', () => {
    const d = detectTable('time rv err\n(d) (km/s) (km/s)\n2450001 1.01 0.001\n2450002 1.02 0.001\n')
    expect(d.mapping.skipRows).toBe(1)
    expect(d.mapping.unit).toBe('km/s')
    expect(d.rowCount).toBe(2)
    expect(d.preview[0]!.line).toBe(3)
  })

  it('reads a header row that follows comment lines', () => {
    const d = detectTable(fixture('ingest/two-instruments.csv'))
    expect(d.mapping.hasHeader).toBe(true)
    expect(d.headerLine).toBe(3)
    expect(d.commentLines).toBe(2)
    expect(d.rowCount).toBe(6)
  })

  it('follows hasHeader: false even when the first row has text', () => {
    const d = detectTable('2450001 1 1 A\n2450002 2 1 A\n', { hasHeader: false })
    expect(d.mapping.hasHeader).toBe(false)
  })
})

describe('column roles', () => {
  const byName: Array<[string, string[]]> = [
    ['BJD RV eRV', ['time', 'rv', 'error']],
    ['bjd_tdb vrad e_vrad', ['time', 'rv', 'error']],
    ['JD radialvel sigma_rv', ['time', 'rv', 'error']],
    ['date velocity uncertainty', ['time', 'rv', 'error']],
    ['t v e', ['time', 'rv', 'error']],
    ['time_jd rv_kms err_kms', ['time', 'rv', 'error']],
    ['rjd vrad svrad', ['time', 'rv', 'error']],
    ['Time RV RV_err Telescope', ['time', 'rv', 'error', 'instrument']],
    ['err rv time', ['error', 'rv', 'time']],
    ['BJD RV sig inst', ['time', 'rv', 'error', 'instrument']],
  ]
  for (const [header, expected] of byName) {
    it(`reads roles from the header '${header}'`, () => {
      // values go where the header says, so the check is on the names alone
      const cols = header.split(' ')
      const rowFor = (i: number): string => cols.map(c => {
        const r = c.toLowerCase()
        if (/^(err|sig|e$|uncertainty|sigma_rv|e_vrad|svrad|err_kms|rv_err|erv)/.test(r)) return '1.5'
        if (/^(time|t$|bjd|jd|date|rjd)/.test(r)) return String(2455001 + i)
        if (/^(inst|telescope)/.test(r)) return 'A'
        return String(1 + i)
      }).join(' ')
      const d = detectTable(`${header}\n${rowFor(0)}\n${rowFor(1)}\n${rowFor(2)}\n`)
      expect(roles(d)).toEqual(expected)
    })
  }

  it('names activity indicators with canonical keys', () => {
    const d = detectTable('BJD RV eRV FWHM BIS S_MW Halpha logRhk contrast\n2456001 1 1 7.1 0.01 0.15 0.05 -4.9 40\n2456002 2 1 7.2 nan 0.16 0.051 -4.95 41\n')
    expect(roles(d)).toEqual(['time', 'rv', 'error', 'indicator:fwhm', 'indicator:bisector_span', 'indicator:s_index',
      'indicator:h_alpha', 'indicator:log_rhk', 'indicator:contrast'])
  })

  it('keeps indicator uncertainties under <indicator>_err', () => {
    const d = detectTable('time rv err fwhm fwhm_err bis sig_bis\n2456001 1 1 7.1 0.01 3 1\n2456002 2 1 7.2 0.01 3 1\n')
    expect(roles(d)).toEqual(['time', 'rv', 'error', 'indicator:fwhm', 'indicator:fwhm_err', 'indicator:bisector_span', 'indicator:bisector_span_err'])
  })

  it('gives velocity-like indicators a unit (header unit, else the table unit)', () => {
    const d = detectTable(fixture('ingest/two-instruments.csv'))
    const fwhm = d.mapping.columns.find(c => c.indicator === 'fwhm')!
    const bis = d.mapping.columns.find(c => c.indicator === 'bisector_span')!
    const s = d.mapping.columns.find(c => c.indicator === 's_index')!
    expect(fwhm.unit).toBe('km/s')
    expect(bis.unit).toBe('m/s')
    expect(s.unit).toBeUndefined()
  })

  it('finds the instrument as a text column whose values repeat', () => {
    const d = detectTable('2450001 1 1 HARPS\n2450002 2 1 HARPS\n2450003 2 1 HIRES\n2450004 2 1 HIRES\n')
    expect(roles(d)).toEqual(['time', 'rv', 'error', 'instrument'])
  })

  it('ignores a text column whose values are all different', () => {
    const d = detectTable('2450001 1 1 a.fits\n2450002 2 1 b.fits\n2450003 2 1 c.fits\n2450004 2 1 d.fits\n')
    expect(roles(d)).toEqual(['time', 'rv', 'error', 'ignore'])
  })

  it('keeps extra unnamed numeric columns as indicators column_N', () => {
    const d = detectTable('2450001 1 1 7.1\n2450002 2 1 7.2\n')
    expect(roles(d)).toEqual(['time', 'rv', 'error', 'indicator:column_4'])
  })

  it('takes a column of full Julian days as the time even when it is not first', () => {
    const d = detectTable('12.1 2450001.5 1.1\n-3.4 2450002.5 1.2\n')
    expect(roles(d)).toEqual(['rv', 'time', 'error'])
  })

  it('does not take a third column with negative values as the error', () => {
    const d = detectTable('2450001 1 -0.2\n2450002 2 0.3\n2450003 2 -0.1\n')
    expect(d.mapping.columns.some(c => c.role === 'error')).toBe(false)
    expect(d.notes.join(' ')).toMatch(/not taken as the error column/)
    expect(d.notes.join(' ')).toMatch(/defaultError/)
  })

  it('returns a mapping without an error column when there is none', () => {
    const d = detectTable('jd rv\n2450001 10\n2450002 12\n')
    expect(roles(d)).toEqual(['time', 'rv'])
  })

  it('follows column hints by name and by 1-based position', () => {
    const d = detectTable('a b c d\n2450001 1 1 0.5\n2450002 2 1 0.6\n', { rv: 'C', error: 4 })
    expect(roles(d)).toEqual(['time', 'indicator:b', 'rv', 'error'])
  })

  it('follows a hint that there is no error column', () => {
    const d = detectTable('2450001 1 1\n2450002 2 1\n', { error: null, defaultError: 2 })
    expect(d.mapping.columns.some(c => c.role === 'error')).toBe(false)
    expect(d.mapping.defaultError).toBe(2)
  })

  it('passes instrument name and split dates from hints into the mapping', () => {
    const splitDates = [{ before: 2457100, instrument: 'Spec-old' }]
    const d = detectTable('2457000 1 1\n2457200 2 1\n', { instrumentName: 'Spec', splitDates })
    expect(d.mapping.instrument).toBe('Spec')
    expect(d.mapping.splitDates).toEqual(splitDates)
  })
})

describe('unit', () => {
  const byHeader: Array<[string, string]> = [
    ['time rv_kms err_kms', 'km/s'],
    ['time rv[km/s] err[km/s]', 'km/s'],
    ['time "rv (km s-1)" err', 'km/s'],
    ['time vrad_ms err_ms', 'm/s'],
    ['time rv[m/s] err[m/s]', 'm/s'],
    ['time rv kms', 'km/s'],
  ]
  for (const [header, unit] of byHeader) {
    it(`reads ${unit} from the header '${header}'`, () => {
      // values chosen to point the other way, so the header must win
      const v = unit === 'km/s' ? '10 5' : '0.01 0.001'
      const text = header === 'time rv kms' ? `time rv kms\n2450001 ${v}\n2450002 ${v}\n` : `${header}\n2450001 ${v}\n2450003 ${v}\n`
      const d = detectTable(text)
      expect(d.mapping.unit).toBe(unit)
    })
  }

  it('takes km/s from values when the median error is below 0.05', () => {
    const d = detectTable('2450001.1 -10.123 0.0021\n2450002.1 -10.130 0.0022\n2450003.1 -10.110 0.0019\n')
    expect(d.mapping.unit).toBe('km/s')
    expect(d.notes.join(' ')).toMatch(/median error 0\.0021/)
  })

  it('takes m/s from values when errors are a few m/s', () => {
    const d = detectTable('2450001.1 -10.1 2.1\n2450002.1 -13.0 2.2\n')
    expect(d.mapping.unit).toBe('m/s')
  })

  it('takes km/s when there is no error column and the velocities span less than 0.5', () => {
    const d = detectTable('jd rv\n2450001 46.2\n2450002 46.3\n2450003 46.25\n')
    expect(d.mapping.unit).toBe('km/s')
  })

  it('takes m/s when there is no error column and the span is large', () => {
    const d = detectTable('jd rv\n2450001 46.2\n2450002 -30\n2450003 12\n')
    expect(d.mapping.unit).toBe('m/s')
  })

  it('follows a unit hint', () => {
    expect(detectTable('2450001 1 0.001\n2450002 2 0.001\n', { unit: 'm/s' }).mapping.unit).toBe('m/s')
  })
})

describe('time format', () => {
  const cases: Array<[string, number[], string]> = [
    ['jd', [2455001.5, 2455010.25], 'jd'],
    ['bjd', [2455001.5, 2455010.25], 'bjd'],
    ['bjd_tdb', [2455001.5, 2455010.25], 'bjd'],
    ['hjd', [2455001.5, 2455010.25], 'jd'],
    ['time', [2455001.5, 2455010.25], 'jd'],
    ['mjd', [55001.5, 55010.25], 'mjd'],
    ['jd-2400000.5', [55001.5, 55010.25], 'mjd'],
    ['rjd', [55001.5, 55010.25], 'jd-2400000'],
    ['jd', [55001.5, 55010.25], 'jd-2400000'],
    ['time', [55001.5, 55010.25], 'jd-2400000'],
    ['bjd-2450000', [5001.5, 5010.25], 'jd-2450000'],
    ['time', [-390.5, 5010.25], 'jd-2450000'],
    ['time', [10500.5, 10600.25], 'jd-2450000'],
    ['t_days', [0, 12.5], 'days'],
    ['time', [200000, 200010], 'days'],
  ]
  for (const [name, times, format] of cases) {
    it(`reads '${name}' with values near ${times[0]} as ${format}`, () => {
      const d = detectTable(`${name} rv err\n${times.map((t, i) => `${t} ${i} 1`).join('\n')}\n`)
      expect(d.mapping.timeFormat).toBe(format)
    })
  }

  it('reads full Julian days without a header as jd', () => {
    expect(detectTable('2455001.5 1 1\n2455002.5 2 1\n').mapping.timeFormat).toBe('jd')
  })

  it('reads reduced dates without a header as JD − 2450000', () => {
    expect(detectTable('5001.5 1 1\n5002.5 2 1\n').mapping.timeFormat).toBe('jd-2450000')
  })

  it('follows a time-format hint', () => {
    expect(detectTable('55001.5 1 1\n55002.5 2 1\n', { timeFormat: 'mjd' }).mapping.timeFormat).toBe('mjd')
  })
})

describe('preview and counts', () => {
  it('returns the first rows raw with their line numbers', () => {
    const d = detectTable('# c\ntime rv err\n2450001 1 1\n\n2450002 2 1\n')
    expect(d.preview).toEqual([{ line: 3, cells: ['2450001', '1', '1'] }, { line: 5, cells: ['2450002', '2', '1'] }])
    expect(d.rowCount).toBe(2)
  })

  it('keeps at most PREVIEW_ROWS preview rows', () => {
    const text = Array.from({ length: 50 }, (_, i) => `${2450000 + i} ${i} 1`).join('\n')
    expect(detectTable(text).preview).toHaveLength(20)
  })

  it('explains every choice in notes', () => {
    const d = detectTable('2450001 1 1\n2450002 2 1\n')
    const notes = d.notes.join('\n')
    for (const word of ['whitespace', 'time column', 'velocity column', 'error column', 'm/s', 'Julian']) expect(notes).toContain(word)
  })

  it('strips a byte-order mark', () => {
    const d = detectTable('\ufefftime,rv,err\n2450001,1,1\n2450002,2,1\n')
    expect(d.headerNames).toEqual(['time', 'rv', 'err'])
  })

  it('reads CRLF and CR line ends', () => {
    expect(detectTable('time\trv\terr\r\n2450001\t1\t1\r\n2450002\t2\t1\r\n').rowCount).toBe(2)
    expect(detectTable('time rv err\r2450001 1 1\r2450002 2 1\r').rowCount).toBe(2)
  })

  it('drops a trailing # remark on a data line', () => {
    const d = detectTable('2450001 1 1 # cloudy\n2450002 2 1\n')
    expect(d.columnCount).toBe(3)
  })
})

describe('awkward tables', () => {
  it('ignores a leading row-counter column', () => {
    const d = detectTable('1 2450001.5 10 1\n2 2450002.5 11 1\n3 2450003.5 12 1\n4 2450004.5 9 1\n')
    expect(roles(d)).toEqual(['ignore', 'time', 'rv', 'error'])
  })

  it('keeps whole-number days as the time when there is no other time column', () => {
    const d = detectTable('1 10.5 1.2\n2 11.0 1.2\n3 9.5 1.2\n4 9.0 1.1\n')
    expect(roles(d)).toEqual(['time', 'rv', 'error'])
  })

  it('picks the header among a title row and a units row', () => {
    const d = detectTable('Velocities of HD 1\ntime rv err\n(d) (km/s) (km/s)\n2450001 1.01 0.001\n2450002 1.02 0.001\n2450003 1.03 0.001\n')
    expect(d.headerNames).toEqual(['time', 'rv', 'err'])
    expect(d.headerLine).toBe(2)
    expect(d.mapping.skipRows).toBe(2)
    expect(d.mapping.unit).toBe('km/s')
    expect(d.rowCount).toBe(3)
  })

  it('says so when times are calendar dates', () => {
    expect(() => detectTable('2019-05-01 10.5 1.2\n2019-05-02 11.5 1.2\n2019-05-03 9.5 1.2\n')).toThrow(/calendar dates.*Julian days/)
  })

  it('takes a numeric instrument column when the header names it', () => {
    const d = detectTable('jd rv err inst\n2450001 1 1 1\n2450002 1 1 2\n2450003 1 1 1\n')
    expect(roles(d)).toEqual(['time', 'rv', 'error', 'instrument'])
  })

  it('skips a text time column named like one and uses the numeric one', () => {
    const d = detectTable('date,bjd,rv,err\n2019-05-01,2458605.1,1,1\n2019-05-02,2458606.1,2,1\n')
    expect(roles(d)).toEqual(['ignore', 'time', 'rv', 'error'])
    expect(d.notes.join(' ')).toMatch(/'date' looks like the time column by its name but does not hold numbers/)
  })

  it('keeps a second velocity-like column as an indicator', () => {
    const d = detectTable('jd rv rv_raw err\n2450001 1 1.1 1\n2450002 2 2.1 1\n')
    expect(roles(d)).toEqual(['time', 'rv', 'indicator:rv_raw', 'error'])
  })
})

describe('more hints and corner cases', () => {
  it('follows hasHeader: true', () => {
    const d = detectTable('a b c\n2450001 1 1\n', { hasHeader: true })
    expect(d.mapping.hasHeader).toBe(true)
    expect(d.headerNames).toEqual(['a', 'b', 'c'])
    expect(roles(d)).toEqual(['time', 'rv', 'error'])
  })

  it('follows a hint that there is no instrument column', () => {
    const d = detectTable('2450001 1 1 A\n2450002 1 1 A\n', { instrument: null, instrumentName: 'Spec' })
    expect(roles(d)).toEqual(['time', 'rv', 'error', 'ignore'])
    expect(d.mapping.instrument).toBe('Spec')
  })

  it('accepts a 1-based position written as text (as a command line passes it)', () => {
    const d = detectTable('a b c\n2450001 1 1\n2450002 1 1\n', { rv: '3', error: '2' })
    expect(roles(d)).toEqual(['time', 'error', 'rv'])
  })

  it('reads decimal commas with a whitespace delimiter', () => {
    const d = detectTable('2450001,5 12,5 1,5\n2450002,5 13,5 1,5\n')
    expect(d.mapping).toMatchObject({ delimiter: 'whitespace', decimalComma: true })
  })

  it('makes indicator keys unique', () => {
    const d = detectTable('time rv err x x\n2450001 1 1 2 3\n2450002 1 1 2 3\n')
    expect(roles(d)).toEqual(['time', 'rv', 'error', 'indicator:x', 'indicator:x_2'])
  })

  it('reads a header with more names than fields, ignoring the extra names', () => {
    const d = detectTable('time,rv,err,inst\n2450001,1,1\n2450002,1,1\n2450003,2,1\n')
    expect(d.columnCount).toBe(3)
    expect(d.headerNames).toEqual(['time', 'rv', 'err'])
    expect(d.notes.join(' ')).toMatch(/extra names ignored/)
  })
})

describe('time plausibility', () => {
  it('warns when a given time format puts the times outside the JD range of modern data', () => {
    // JD 2400000 is 1858-11-16 12:00 and JD 2500000 is 2132-08-31 12:00 (astropy 5.2.1, Time(jd, format='jd').iso).
    const d = detectTable('5001.5 1 1\n5002.5 2 1\n', { timeFormat: 'jd' })
    expect(d.notes.join(' ')).toMatch(/check the time format/)
    expect(detectTable('5001.5 1 1\n5002.5 2 1\n').notes.join(' ')).not.toMatch(/check the time format/)
  })
})

describe('instrument names with spaces in whitespace tables', () => {
  it('reads trailing unnamed words as one instrument column', () => {
    const d = detectTable('# time rv err inst\n2450001 1 1 HARPS N\n2450002 2 1 HARPS N\n2450003 3 1 CORALIE\n')
    expect(d.columnCount).toBe(4)
    expect(roles(d)).toEqual(['time', 'rv', 'error', 'instrument'])
  })

  it('keeps two named text columns apart', () => {
    const d = detectTable('time rv err inst note\n2450001 1 1 HARPS ok\n2450002 2 1 HARPS ok\n2450003 3 1 HIRES bad\n')
    expect(d.columnCount).toBe(5)
  })
})

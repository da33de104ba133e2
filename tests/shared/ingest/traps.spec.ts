import { describe, expect, it } from 'vitest'
import { detectTable, parseTable, readTimeWords, type Detection, type ParseResult } from '../../../shared/ingest/index.ts'
import { fixture } from './helpers.ts'

// The traps that used to be read wrong without a word (fixtures/ingest/traps, hand-written):
// each is now read right or refused, naming the row.
function read(path: string): { d: Detection; r: ParseResult; text: string } {
  const text = fixture(`ingest/traps/${path}`)
  const d = detectTable(text, { fileName: path })
  const { questions: _q, ...answered } = d.mapping
  return { d, r: parseTable(text, answered), text }
}

describe('time formats and scales', () => {
  it('BJD_TDB-2457000 is read with that zero point (not 2450000) and scale barycentric TDB', () => {
    const { d, r } = read('bjd-tdb-2457000.csv')
    expect(d.mapping.timeFormat).toBe('jd-2457000')
    expect(d.mapping.timeScale).toBe('bjd_tdb')
    expect(d.mapping.questions).toBeUndefined()
    expect(r.rows[0]!.time).toBe(2459316.19784)
    expect(r.rows).toHaveLength(12)
  })

  it.each([
    ['BJD_TDB-2457000', 2457000, 'bjd_tdb'], ['BJD − 2 450 000', 2450000, 'bjd_tdb'], ['JD-2400000', 2400000, undefined],
    ['HJD-2,450,000', 2450000, 'hjd_utc'], ['time (BJD_TDB - 2457000)', 2457000, 'bjd_tdb'], ['BTJD', 2457000, 'bjd_tdb'],
    ['MJD', 2400000.5, undefined], ['RJD', 2400000, undefined], ['JD_UTC', undefined, 'jd_utc'], ['bjd_utc', undefined, 'bjd_utc'],
    ['t [d] TT', undefined, 'jd_tt'], ['time', undefined, undefined],
  ])('reads %s as offset %s, scale %s', (text, offset, scale) => {
    const w = readTimeWords(text)
    expect(w.offset).toBe(offset)
    expect(w.scale).toBe(scale)
  })

  it('MJD and JD − 2400000 are asked, never guessed, when the header does not say', () => {
    const { d } = read('reduced-58000-no-header.txt')
    expect(d.mapping.questions).toHaveLength(1)
    expect(d.mapping.questions![0]!.choices.map((c) => c.value)).toEqual(['jd-2400000', 'mjd'])
    expect(() => parseTable(fixture('ingest/traps/reduced-58000-no-header.txt'), d.mapping))
      .toThrow('Times near 59346: are they MJD (JD − 2400000.5) or JD − 2400000? They differ by half a day and the header does not say. Choose one of: JD − 2400000; modified Julian days (JD − 2400000.5).')
  })

  it('a header saying MJD is read as MJD without a question', () => {
    const { d, r } = read('mjd-header.txt')
    expect(d.mapping.timeFormat).toBe('mjd')
    expect(d.mapping.questions).toBeUndefined()
    expect(r.rows[0]!.time).toBe(2459316.19784)
  })

  it('reduced dates without a zero point offer JD − 2450000, JD − 2457000 and plain days', () => {
    const d = detectTable('2501.3 1 1\n2502.4 2 1\n2510.2 3 1\n')
    expect(d.mapping.questions![0]!.choices.map((c) => c.value)).toEqual(['jd-2450000', 'jd-2457000', 'days'])
    expect(d.mapping.questions![0]!.message).toBe('Times near 2502: which zero point? JD − 2450000 puts them in 2003, JD − 2457000 in 2022.')
  })

  it('HJD (UTC) is detected as such', () => {
    const { d } = read('hjd-utc.txt')
    expect(d.mapping.timeFormat).toBe('jd')
    expect(d.mapping.timeScale).toBe('hjd_utc')
  })

  it('a column mixing full and reduced dates refuses the odd row with its line', () => {
    const { r } = read('mixed-full-reduced.txt')
    expect(r.problems).toEqual([{ line: 6, message: 'time 59328.33406 looks like a reduced date in a column of full Julian days: the column mixes full and reduced dates; write every row the same way, or skip this row' }])
    expect(r.rows).toHaveLength(11)
  })

  it('a time outside 1850–2100 is refused with its line', () => {
    const r = parseTable('jd rv err\n2450001 1 1\n2300001 1 1\n', detectTable('jd rv err\n2450001 1 1\n2300001 1 1\n').mapping)
    expect(r.problems).toEqual([{ line: 3, message: 'time 2300001 is JD 2300001, outside 1850–2100: check the time format' }])
  })
})

describe('units per column', () => {
  it('RV[km/s] eRV[m/s]: each column in its own unit, errors not 1000× too large', () => {
    const { d, r } = read('rv-kms-erv-ms.txt')
    expect(d.mapping.unit).toBe('km/s')
    expect(d.mapping.columns.find((c) => c.role === 'error')!.unit).toBe('m/s')
    expect(r.rows[0]).toMatchObject({ rv: -12348.44, error: 2.43, instrument: 'Kestrel-S' })
    expect(r.instruments).toEqual([{ name: 'Kestrel-S', count: 4 }, { name: 'Kestrel-N', count: 8 }])
  })

  it('a user may give any velocity unit mathjs reads (cm/s), applied exactly in decimal', () => {
    const d = detectTable('time rv err\n2450001 150 30\n2450002 250 40\n', { unit: 'cm/s' })
    const r = parseTable('time rv err\n2450001 150 30\n2450002 250 40\n', d.mapping)
    expect(r.rows.map((x) => [x.rv, x.error])).toEqual([[1.5, 0.3], [2.5, 0.4]])
  })

  it('a km/s value among m/s values (a ~1000× jump) is refused with its line', () => {
    const { r } = read('kms-row-in-ms.csv')
    expect(r.problems).toEqual([{ line: 8, column: 'rv', message: "velocity -12.35034 m/s is ~1000× smaller than the column's typical -12353.25552 m/s (a km/s value among m/s?): fix it, or skip this row" }])
  })
})

describe('plausibility', () => {
  it('rv = 1e308 is refused with its line', () => {
    const { r } = read('rv-1e308.csv')
    expect(r.problems).toEqual([{ line: 4, message: 'velocity 1.000e+308 m/s is beyond ±1000 km/s: check the velocity unit, or skip this row' }])
  })

  it('an error below 1 mm/s is refused with its line', () => {
    const { r } = read('error-below-1mm.csv')
    expect(r.problems).toEqual([{ line: 6, message: 'error 4.000e-4 m/s is below 1 mm/s: check the error unit, or skip this row' }])
  })

  it('an error larger than the whole velocity spread is a warning with its line', () => {
    const text = 'time rv err\n2450001 1 1\n2450002 2 1\n2450003 3 1\n2450004 2 1\n2450005 1 9\n'
    const r = parseTable(text, detectTable(text).mapping)
    expect(r.problemCount).toBe(0)
    expect(r.warnings).toEqual([{ line: 6, column: 'err', message: 'error 9 m/s is larger than the whole velocity spread (2 m/s): check the error column and its unit' }])
  })
})

describe('flags and instruments', () => {
  it('a text quality column (good/cloudy) becomes exclusion reasons, not two instruments', () => {
    const { d, r } = read('quality-flag.csv')
    const flag = d.mapping.columns.find((c) => c.name === 'quality')!
    expect(flag.role).toBe('flag')
    expect(flag.keep).toEqual(['good'])
    expect(r.instruments).toEqual([{ name: 'quality-flag', count: 12 }])
    expect(r.rows.filter((x) => x.excludedReason).map((x) => [x.line, x.excludedReason])).toEqual([[6, 'quality: cloudy'], [10, 'quality: cloudy']])
  })

  it('files without an instrument column are named after the file, so two files are not merged', () => {
    const a = detectTable('time rv err\n2450001 1 1\n', { fileName: 'night-a.csv' })
    const b = detectTable('time rv err\n2450001 1 1\n', { fileName: 'night-b.txt' })
    expect([a.mapping.instrument, b.mapping.instrument]).toEqual(['night-a', 'night-b'])
  })
})

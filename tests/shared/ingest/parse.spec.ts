import { describe, expect, it } from 'vitest'
import {
  DEFAULT_INSTRUMENT, IngestError, calendarToJd, detectTable, formatProblems, parseTable, previewTable, toFullJd,
  type TableMapping,
} from '../../../shared/ingest/index.ts'
import { fixture } from './helpers.ts'

const basic = (over: Partial<TableMapping> = {}): TableMapping => ({
  delimiter: 'whitespace',
  hasHeader: false,
  columns: [
    { index: 0, name: 'time', role: 'time' },
    { index: 1, name: 'rv', role: 'rv' },
    { index: 2, name: 'err', role: 'error' },
  ],
  unit: 'm/s',
  timeFormat: 'jd',
  ...over,
})

describe('conversion to full JD and m/s', () => {
  // Offsets are the definitions of the formats (common practice): MJD = JD − 2400000.5.
  const cases: Array<[TableMapping['timeFormat'], number, number]> = [
    ['jd', 2455001.25, 2455001.25],
    ['bjd', 2455001.25, 2455001.25],
    ['mjd', 55001.25, 2455001.75],
    ['jd-2400000', 55001.25, 2455001.25],
    ['jd-2450000', 5001.25, 2455001.25],
    ['jd-2450000', -390.5, 2449609.5],
    ['days', 12.5, 12.5],
  ]
  for (const [format, written, full] of cases) {
    it(`turns ${format} ${written} into ${full}`, () => {
      const r = parseTable(`${written} 1 1\n`, basic({ timeFormat: format }))
      expect(r.rows[0]!.time).toBe(full)
      expect(toFullJd(written, format)).toBe(full)
    })
  }

  it('multiplies km/s velocities and errors by 1000 exactly in decimal', () => {
    const r = parseTable('2452944.759761 46.30911 0.00255\n2452945 -1.5e-2 2.5E-3\n', basic({ unit: 'km/s' }))
    expect(r.rows[0]!.rv).toBe(46309.11)
    expect(r.rows[0]!.error).toBe(2.55)
    expect(r.rows[1]!.rv).toBe(-15)
    expect(r.rows[1]!.error).toBe(2.5)
  })

  it('converts a default error given in km/s', () => {
    const m = basic({ unit: 'km/s', defaultError: 0.002, columns: basic().columns.slice(0, 2) })
    expect(parseTable('2450001 1.0\n', m).rows[0]!.error).toBe(2)
  })

  it('reads decimal commas when the mapping says so', () => {
    const d = detectTable(fixture('ingest/semicolon-decimal-comma.txt'))
    const r = parseTable(fixture('ingest/semicolon-decimal-comma.txt'), d.mapping)
    expect(r.problems).toEqual([])
    // MJD + 2400000.5 (the definition of MJD, common practice), added in floating point
    expect(r.rows.map(x => [x.time, x.rv, x.error])).toEqual([[55001.25 + 2400000.5, 12.5, 1.5], [55002.3 + 2400000.5, 13.5, 1.4], [55003.2 + 2400000.5, -2.25, 1.6]])
  })

  it('reads the tab-separated reduced-date km/s fixture', () => {
    const text = fixture('ingest/reduced-dates.tsv')
    const d = detectTable(text)
    expect(d.mapping).toMatchObject({ delimiter: '\t', hasHeader: true, unit: 'km/s', timeFormat: 'jd-2450000' })
    const r = parseTable(text, d.mapping)
    expect(r.rows[0]).toEqual({ line: 2, time: 2455001.50111, rv: -12345.12, error: 1.1, instrument: DEFAULT_INSTRUMENT, indicators: {} })
  })
})

describe('instruments', () => {
  it('reads an instrument column, quoted names with spaces included', () => {
    const text = fixture('ingest/two-instruments.csv')
    const r = parseTable(text, detectTable(text).mapping)
    expect(r.problems).toEqual([])
    expect(r.instruments).toEqual([{ name: 'Alpha Spec', count: 3 }, { name: 'BetaGraph', count: 3 }])
  })

  it('reads a last-column instrument name with spaces in a whitespace-separated table', () => {
    const text = '2450001 1 1 HARPS\n2450002 2 1 HARPS N\n2450003 3 1 HARPS  N\n2450004 3 1 HARPS N\n'
    const r = parseTable(text, detectTable(text).mapping)
    expect(r.problems).toEqual([])
    expect(r.instruments).toEqual([{ name: 'HARPS', count: 1 }, { name: 'HARPS N', count: 3 }])
  })

  it('names all rows after mapping.instrument when there is no instrument column', () => {
    const r = parseTable('2450001 1 1\n2450002 2 1\n', basic({ instrument: 'HARPS' }))
    expect(r.instruments).toEqual([{ name: 'HARPS', count: 2 }])
  })

  it(`uses '${DEFAULT_INSTRUMENT}' when no name is given`, () => {
    expect(parseTable('2450001 1 1\n', basic()).rows[0]!.instrument).toBe(DEFAULT_INSTRUMENT)
  })

  it('splits one instrument at a date', () => {
    const text = fixture('ingest/upgrade-split.txt')
    const d = detectTable(text, { instrumentName: 'Spec', splitDates: [{ before: 2457050, instrument: 'Spec-1' }] })
    const r = parseTable(text, d.mapping)
    expect(r.instruments).toEqual([{ name: 'Spec-1', count: 3 }, { name: 'Spec', count: 2 }])
  })

  it('splits at several dates, the earliest boundary first', () => {
    const text = fixture('ingest/upgrade-split.txt')
    const splitDates = [{ before: 2457175, instrument: 'S2' }, { before: 2456960, instrument: 'S1' }]
    const r = parseTable(text, { ...detectTable(text).mapping, instrument: 'S3', splitDates })
    expect(r.rows.map(x => x.instrument)).toEqual(['S1', 'S1', 'S2', 'S2', 'S3'])
  })

  it('splits only the named source instrument', () => {
    const text = '2456900 1 1 A\n2456900 1 1 B\n2457200 1 1 A\n2457200 2 1 B\n'
    const d = detectTable(text, { splitDates: [{ before: 2457000, instrument: 'A-old', source: 'A' }] })
    const r = parseTable(text, d.mapping)
    expect(r.rows.map(x => x.instrument)).toEqual(['A-old', 'B', 'A', 'B'])
  })

  it('takes split dates typed as calendar dates', () => {
    // JD of 2000-01-01T12:00 UTC is 2451545.0 (astropy 5.2.1: Time('2000-01-01T12:00:00', scale='utc').jd).
    expect(calendarToJd('2000-01-01T12:00:00Z')).toBe(2451545)
    expect(calendarToJd('2000-01-01')).toBe(2451544.5)
    expect(() => calendarToJd('soon')).toThrow(/date/)
  })
})

describe('activity indicators', () => {
  it('stores indicators by key, velocity-like ones in m/s, and skips empty cells', () => {
    const text = fixture('ingest/two-instruments.csv')
    const r = parseTable(text, detectTable(text).mapping)
    expect(r.rows[0]!.indicators).toEqual({ fwhm: 7102.1, bisector_span: -3.2, s_index: 0.161 })
    expect(r.rows[3]!.indicators).toEqual({ fwhm: 7210, s_index: 0.17 })
    expect(r.rows[4]!.indicators).toEqual({ fwhm: 7208.5, bisector_span: 0.4 })
  })

  it('treats NaN, NA and null indicator cells as absent', () => {
    const m = basic({ columns: [...basic().columns, { index: 3, name: 'S', role: 'indicator', indicator: 's_index' }] })
    const r = parseTable('2450001 1 1 nan\n2450002 1 1 NA\n2450003 1 1 null\n2450004 1 1 0.2\n', m)
    expect(r.problems).toEqual([])
    expect(r.rows.map(x => x.indicators)).toEqual([{}, {}, {}, { s_index: 0.2 }])
  })

  it('reports text in an indicator cell', () => {
    const m = basic({ columns: [...basic().columns, { index: 3, name: 'S', role: 'indicator', indicator: 's_index' }] })
    const r = parseTable('2450001 1 1 high\n', m)
    expect(r.problems).toEqual([{ line: 1, column: 'S', message: "s_index 'high' is not a number" }])
  })

  it('ignores columns marked ignore', () => {
    const m = basic({ columns: [...basic().columns, { index: 3, name: 'file', role: 'ignore' }] })
    expect(parseTable('2450001 1 1 x.fits\n', m).rows[0]!.indicators).toEqual({})
  })
})

describe('row problems', () => {
  it('reports each bad row with its line and column and keeps the good ones', () => {
    const text = fixture('ingest/bad-rows.txt')
    const d = detectTable(text)
    const r = parseTable(text, d.mapping)
    expect(r.rows.map(x => x.line)).toEqual([2, 10])
    expect(r.problems).toEqual([
      { line: 3, column: 'rv', message: "velocity 'abc' is not a number" },
      { line: 4, column: 'err', message: 'error must be positive (found -1.0)' },
      { line: 5, message: 'too few fields: found 2, expected 3' },
      { line: 6, message: 'duplicate of line 2 (same time, velocity and instrument)' },
      { line: 7, column: 'err', message: 'error must be positive (found 0)' },
      { line: 8, column: 'rv', message: "velocity 'NaN' is not a number" },
      { line: 9, message: 'too many fields: found 4, expected 3 (a stray delimiter, or a name with a space?)' },
    ])
    expect(r.problemCount).toBe(7)
    expect(r.rowsRead).toBe(9)
  })

  it('reports a missing cell in a delimited row', () => {
    const m = basic({ delimiter: ',' })
    expect(parseTable('2450001,,1\n', m).problems).toEqual([{ line: 1, column: 'rv', message: 'missing velocity' }])
  })

  it('reports a missing instrument name', () => {
    const m = basic({ delimiter: ',', columns: [...basic().columns, { index: 3, name: 'inst', role: 'instrument' }] })
    expect(parseTable('2450001,1,1,\n2450002,1,1,"" \n', m).problems.map(p => p.message)).toContain('missing instrument name')
  })

  it('does not call rows with the same time in different instruments duplicates', () => {
    const m = basic({ columns: [...basic().columns, { index: 3, name: 'inst', role: 'instrument' }] })
    const r = parseTable('2450001 1 1 A\n2450001 1 1 B\n', m)
    expect(r.problems).toEqual([])
  })

  it('compares duplicates after conversion (1.0 and 1 are the same velocity)', () => {
    const r = parseTable('2450001 1 1\n2450001.0 1.0 2\n', basic())
    expect(r.problems).toEqual([{ line: 2, message: 'duplicate of line 1 (same time, velocity and instrument)' }])
  })

  it('finds duplicates in a file out of time order and lists problems in line order', () => {
    const r = parseTable('2450003 1 1\n2450001 2 1\n2450003 1 2\n2450002 x 1\n2450001 2 1\n', basic())
    expect(r.problems).toEqual([
      { line: 3, message: 'duplicate of line 1 (same time, velocity and instrument)' },
      { line: 4, column: 'rv', message: "velocity 'x' is not a number" },
      { line: 5, message: 'duplicate of line 2 (same time, velocity and instrument)' },
    ])
    expect(r.rows.map(x => x.line)).toEqual([1, 2])
  })

  it('handles many rows sharing one time without slowing down', () => {
    const text = Array.from({ length: 20_000 }, (_, i) => `0 ${i} 1`).join('\n')
    const r = parseTable(text + '\n0 7 1\n', basic({ timeFormat: 'days' }))
    expect(r.rows).toHaveLength(20_000)
    expect(r.problems).toEqual([{ line: 20_001, message: 'duplicate of line 8 (same time, velocity and instrument)' }])
  })

  it('caps the problems list but counts all', () => {
    const text = Array.from({ length: 30 }, (_, i) => `${2450000 + i} x 1`).join('\n')
    const r = parseTable(text, basic(), { maxProblems: 5 })
    expect(r.problems).toHaveLength(5)
    expect(r.problemCount).toBe(30)
  })

  it('formats problems for a message', () => {
    const text = fixture('ingest/bad-rows.txt')
    const r = parseTable(text, detectTable(text).mapping)
    const msg = formatProblems(r.problems, 2, r.problemCount)
    expect(msg).toBe("line 3, column 'rv': velocity 'abc' is not a number\nline 4, column 'err': error must be positive (found -1.0)\n… and 5 more")
  })
})

describe('reading options', () => {
  it('stops after maxRows and says so', () => {
    const text = Array.from({ length: 30 }, (_, i) => `${2450000 + i} 1 1`).join('\n')
    const r = parseTable(text, basic(), { maxRows: 10 })
    expect(r.rows).toHaveLength(10)
    expect(r.truncated).toBe(true)
    expect(parseTable(text, basic()).truncated).toBe(false)
  })

  it('skips the header row and units rows the mapping names', () => {
    const r = parseTable('# note\ntime rv err\n(d) (m/s) (m/s)\n2450001 1 1\n', basic({ hasHeader: true, skipRows: 1 }))
    expect(r.rows.map(x => x.line)).toEqual([4])
  })

  it('throws on misuse, naming the option', () => {
    expect(() => parseTable('2450001 1 1', basic(), { maxRows: 0 })).toThrow(/maxRows/)
    expect(() => parseTable(42 as unknown as string, basic())).toThrow(/text/)
  })
})

describe('mapping checks', () => {
  const expectIngest = (f: () => unknown, code: string, field: string | undefined, message: RegExp): void => {
    try { f() } catch (e) {
      expect(e).toBeInstanceOf(IngestError)
      const err = e as IngestError
      expect(err.code).toBe(code)
      expect(err.field).toBe(field)
      expect(err.message).toMatch(message)
      return
    }
    throw new Error('expected an IngestError')
  }
  const cols = basic().columns

  it('refuses a mapping without a time column', () => {
    expectIngest(() => parseTable('1 1 1', basic({ columns: cols.map(c => (c.role === 'time' ? { ...c, role: 'ignore' } : c)) })),
      'no_time_column', 'columns', /time column/)
  })

  it('refuses a mapping without a velocity column', () => {
    expectIngest(() => parseTable('1 1 1', basic({ columns: cols.map(c => (c.role === 'rv' ? { ...c, role: 'ignore' } : c)) })),
      'no_velocity_column', 'columns', /velocity column/)
  })

  it('refuses a missing error column without a default error', () => {
    expectIngest(() => parseTable('2450001 1', basic({ columns: cols.slice(0, 2) })), 'missing_error', 'defaultError', /error column.*one error/)
  })

  it('refuses a default error of zero or less', () => {
    expectIngest(() => parseTable('2450001 1', basic({ columns: cols.slice(0, 2), defaultError: 0 })), 'bad_mapping', 'defaultError', /positive/)
  })

  it('refuses two time columns', () => {
    expectIngest(() => parseTable('1 1 1', basic({ columns: cols.map(c => (c.role === 'error' ? { ...c, role: 'time' } : c)) })),
      'bad_mapping', 'columns', /only one column can be the time column/)
  })

  it('refuses unknown units, time formats and delimiters', () => {
    expectIngest(() => parseTable('1 1 1', basic({ unit: 'kg' as never })), 'bad_mapping', 'unit', /unit/)
    expectIngest(() => parseTable('1 1 1', basic({ timeFormat: 'hjd' as never })), 'bad_mapping', 'timeFormat', /timeFormat/)
    expectIngest(() => parseTable('1 1 1', basic({ delimiter: '|' as never })), 'bad_mapping', 'delimiter', /delimiter/)
  })

  it('refuses malformed split dates', () => {
    expectIngest(() => parseTable('1 1 1', basic({ splitDates: [{ before: NaN, instrument: 'A' }] })), 'bad_mapping', 'splitDates', /before/)
    expectIngest(() => parseTable('1 1 1', basic({ splitDates: [{ before: 2450000, instrument: ' ' }] })), 'bad_mapping', 'splitDates', /instrument/)
  })
})

describe('previewTable', () => {
  it('detects and parses in one call', () => {
    const p = previewTable('time rv err\n2450001 1 1\n2450002 x 1\n')
    expect(p.mappingError).toBeNull()
    expect(p.result!.rows).toHaveLength(1)
    expect(p.result!.problems).toHaveLength(1)
  })

  it('returns an incomplete mapping as mappingError instead of throwing', () => {
    const p = previewTable('jd rv\n2450001 10\n2450002 12\n')
    expect(p.result).toBeNull()
    expect(p.mappingError).toMatchObject({ code: 'missing_error', field: 'defaultError' })
  })

  it('lays a correction over the detected mapping', () => {
    const p = previewTable('jd rv\n2450001 10\n2450002 12\n', {}, { defaultError: 3, instrument: 'X' })
    expect(p.result!.rows[0]).toMatchObject({ error: 3, instrument: 'X' })
  })
})

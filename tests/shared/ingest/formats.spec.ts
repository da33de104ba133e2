import { describe, expect, it } from 'vitest'
import { IngestError, detectTable, parseTable, readByteDescriptions, type Detection, type ParseResult } from '../../../shared/ingest/index.ts'
import { fixture } from './helpers.ts'

// Archive layouts, one hand-written fixture each (fixtures/ingest/formats, see its README): every
// test asserts the detected layout, time format and scale, the unit of each column, the
// instruments and the row count, and the first stored values (full JD, m/s).
function read(path: string, hints: Parameters<typeof detectTable>[1] = {}): { d: Detection; r: ParseResult } {
  const text = fixture(`ingest/formats/${path}`)
  const d = detectTable(text, { fileName: path.split('/').pop(), ...hints })
  return { d, r: parseTable(text, d.mapping) }
}
const unitOf = (d: Detection, role: string) => d.mapping.columns.find((c) => c.role === role)?.unit ?? d.mapping.unit
const KESTREL = [{ name: 'Kestrel-S', count: 4 }, { name: 'Kestrel-N', count: 8 }]

describe('archive table formats', () => {
  it('astropy ECSV: YAML header units per column (rv km / s, rv_err m / s) and time_scale tdb honoured', () => {
    const { d, r } = read('ecsv-rv.ecsv')
    expect(d.format).toBe('ecsv')
    expect(d.mapping.timeFormat).toBe('bjd')
    expect(d.mapping.timeScale).toBe('bjd_tdb')
    expect(unitOf(d, 'rv')).toBe('km/s')
    expect(unitOf(d, 'error')).toBe('m/s')
    expect(r.instruments).toEqual(KESTREL)
    expect(r.rows).toHaveLength(12)
    expect(r.rows[0]).toMatchObject({ line: 13, time: 2459316.19784, rv: -12348.44, error: 2.43 })
  })

  it('IPAC .tbl: columns at the | positions, units from the third header line, TIMESYS = TDB', () => {
    const { d, r } = read('ipac-rv.tbl')
    expect(d.format).toBe('ipac')
    expect(d.mapping.delimiter).toBe('fixed')
    expect(d.mapping.firstLine).toBe(9)
    expect(d.mapping.timeFormat).toBe('bjd')
    expect(d.mapping.timeScale).toBe('bjd_tdb')
    expect(unitOf(d, 'rv')).toBe('m/s')
    expect(r.instruments).toEqual(KESTREL)
    expect(r.rows[0]).toMatchObject({ line: 9, time: 2459316.19784, rv: -2.84, error: 2.43, instrument: 'Kestrel-S' })
  })

  it('AAS MRT: byte-by-byte positions, units, and "BJD (TDB) - 2450000" from the explanation', () => {
    const { d, r } = read('mrt-rv.txt')
    expect(d.format).toBe('mrt')
    expect(d.mapping.timeFormat).toBe('jd-2450000')
    expect(d.mapping.timeScale).toBe('bjd_tdb')
    expect(d.mapping.firstLine).toBe(17)
    expect(unitOf(d, 'rv')).toBe('m/s')
    expect(r.instruments).toEqual(KESTREL)
    expect(r.problemCount).toBe(0)
    expect(r.rows[0]).toMatchObject({ line: 17, time: 2459316.19784, rv: -2.84, error: 2.43 })
  })

  it('CDS .dat with its ReadMe: byte-by-byte positions, km/s for RV and e_RV, BJD (TDB)', () => {
    const readme = readByteDescriptions(fixture('ingest/formats/cds/ReadMe').split('\n'))
    expect([...readme.keys()]).toEqual(['rv.dat'])
    const { d, r } = read('cds/rv.dat', { layout: readme.get('rv.dat')!.specs })
    expect(d.format).toBe('cds')
    expect(d.mapping.timeScale).toBe('bjd_tdb')
    expect(unitOf(d, 'rv')).toBe('km/s')
    expect(unitOf(d, 'error')).toBe('km/s')
    expect(r.instruments).toEqual(KESTREL)
    expect(r.rows[0]).toMatchObject({ line: 1, time: 2459316.19784, rv: -12348.44, error: 2.43 })
  })

  it('CDS .dat alone (no header): the first row is data, not a header', () => {
    const { d, r } = read('cds/rv.dat')
    expect(d.mapping.hasHeader).toBe(false)
    expect(d.rowCount).toBe(12)
    expect(r.rows).toHaveLength(12)
    expect(unitOf(d, 'rv')).toBe('km/s')
  })

  it('.rdb: the dashed line under the names is skipped; rjd is JD − 2400000; km/s by value, FWHM and bisector in km/s', () => {
    const { d, r } = read('rv.rdb')
    expect(d.format).toBe('rdb')
    expect(d.mapping.delimiter).toBe('\t')
    expect(d.mapping.skipRows).toBe(1)
    expect(d.mapping.timeFormat).toBe('jd-2400000')
    expect(d.mapping.unit).toBe('km/s')
    expect(d.mapping.columns.map((c) => c.unit)).toEqual([undefined, undefined, undefined, 'km/s', 'km/s'])
    expect(r.instruments).toEqual([{ name: 'rv', count: 12 }])
    expect(r.rows[0]).toMatchObject({ time: 2459316.19784, rv: -12348.44, error: 2.43, indicators: { fwhm: 7108.72, bisector_span: -8.7 } })
  })

  it('fixed-width: read by column positions, an empty cell is a missing error on its line, no data row lost', () => {
    const { d, r } = read('fixed-width.txt')
    expect(d.format).toBe('fixed-width')
    expect(d.mapping.delimiter).toBe('fixed')
    expect(d.headerLine).toBe(3)
    expect(d.rowCount).toBe(12)
    expect(d.mapping.columns.slice(0, 4).map((c) => [c.name, c.role])).toEqual([['BJD', 'time'], ['RV', 'rv'], ['eRV', 'error'], ['Instrument', 'instrument']])
    expect(r.problems).toEqual([{ line: 5, column: 'eRV', message: 'missing error' }])
    expect(r.instruments).toEqual([{ name: 'Kestrel S', count: 4 }, { name: 'Kestrel N', count: 7 }])
    expect(r.rows[0]).toMatchObject({ line: 4, time: 2459316.19784, rv: -2.84, error: 2.43 })
  })

  it('refuses LaTeX by name and by content, and spreadsheets by name, saying what to upload', () => {
    const tex = fixture('ingest/formats/table.tex')
    expect(() => detectTable(tex, { fileName: 'table.tex' })).toThrow(/table\.tex is a LaTeX file\. Upload the table's data as plain text/)
    try { detectTable(tex, { fileName: 'rv.txt' }); throw new Error('not refused') } catch (e) {
      expect(e).toBeInstanceOf(IngestError)
      expect((e as IngestError).code).toBe('unsupported_format')
      expect((e as IngestError).message).toBe('This is a LaTeX table. Upload the data as plain text: one row per measurement, columns separated by commas, tabs or spaces (no &, \\\\ or \\hline).')
    }
    expect(() => detectTable('a,b\n1,2\n', { fileName: 'rv.xlsx' })).toThrow('rv.xlsx is an Excel workbook. Save the sheet as CSV (File → Save as / Download → .csv) and upload that file.')
    expect(() => detectTable('a,b\n1,2\n', { fileName: 'rv.ods' })).toThrow(/OpenDocument spreadsheet\. Save the sheet as CSV/)
  })
})

import { describe, expect, it } from 'vitest'
import { detectTable, parseTable } from '../../../shared/ingest/index.ts'
import { fixture } from './helpers.ts'

// Both tables: fixtures/published/README.md (VizieR, CC BY 4.0; original papers cited there).

describe('51 Peg, six instrument set-ups (Birkby et al. 2017, AJ 153, 138, Table 1)', () => {
  const text = fixture('published/51peg-six-instruments.txt')
  const detection = detectTable(text)
  const result = parseTable(text, detection.mapping)

  it('is read as whitespace-separated time, velocity, error, instrument without a header', () => {
    expect(detection.mapping.delimiter).toBe('whitespace')
    expect(detection.mapping.hasHeader).toBe(false)
    expect(detection.mapping.columns.map(c => c.role)).toEqual(['time', 'rv', 'error', 'instrument'])
    expect(detection.mapping.unit).toBe('m/s')
    // Full Julian days; the table has no header to say they are BJD_TDB, so they stay as written.
    expect(detection.mapping.timeFormat).toBe('jd')
  })

  it('gives 639 rows with no problems', () => {
    expect(detection.rowCount).toBe(639)
    expect(result.problems).toEqual([])
    expect(result.rows).toHaveLength(639)
  })

  it('finds the six set-ups with the published counts', () => {
    // Counts from the dataset description (fixtures/published/README.md).
    const counts = Object.fromEntries(result.instruments.map(i => [i.name, i.count]))
    expect(counts).toEqual({ ELODIE: 153, HARPS: 91, HIRES: 41, Lick6: 45, Lick8: 129, Lick13: 180 })
  })

  it('keeps the values as written (already full JD and m/s)', () => {
    expect(result.rows[0]).toEqual({ line: 1, time: 2449610.532755, rv: -33258, error: 9, instrument: 'ELODIE', indicators: {} })
    const last = result.rows[result.rows.length - 1]!
    expect(last).toMatchObject({ line: 639, time: 2456544.67396419, rv: -33163.2359482, error: 0.41983695, instrument: 'HARPS' })
  })

  it('reads as BJD when told so', () => {
    expect(detectTable(text, { timeFormat: 'bjd' }).mapping.timeFormat).toBe('bjd')
  })
})

describe('HD 20868, HARPS in km/s (Moutou et al. 2009, A&A 496, 513, Table 4)', () => {
  const text = fixture('published/hd20868-harps.txt')
  const detection = detectTable(text)
  const result = parseTable(text, { ...detection.mapping, instrument: 'HARPS' })

  it('takes the commented first line as the header', () => {
    expect(detection.headerFromComment).toBe(true)
    expect(detection.headerNames).toEqual(['time_jd', 'rv_kms', 'err_kms'])
    expect(detection.mapping.columns.map(c => c.role)).toEqual(['time', 'rv', 'error'])
  })

  it('detects km/s and full JD', () => {
    expect(detection.mapping.unit).toBe('km/s')
    expect(detection.mapping.timeFormat).toBe('jd')
  })

  it('converts to m/s: first row 46.30911 ± 0.00255 km/s → 46309.11 ± 2.55 m/s', () => {
    expect(result.problems).toEqual([])
    expect(result.rows).toHaveLength(48)
    expect(result.rows[0]).toEqual({ line: 2, time: 2452944.759761, rv: 46309.11, error: 2.55, instrument: 'HARPS', indicators: {} })
    expect(result.instruments).toEqual([{ name: 'HARPS', count: 48 }])
  })

  it('detects km/s from the values alone when the header is removed', () => {
    const bare = text.split('\n').slice(1).join('\n')
    const d = detectTable(bare)
    expect(d.headerNames).toBeNull()
    expect(d.mapping.unit).toBe('km/s')
    expect(parseTable(bare, d.mapping).rows[0]!.rv).toBe(46309.11)
  })
})

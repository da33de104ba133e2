import { describe, expect, it } from 'vitest'
import { convertTimes, isDescription, uploadParseTask, uploadPreviewTask } from '../../server/uploads/tasks.ts'
import { toBjdTdb, ttToTdb, utcToTt } from '../../shared/time/index.ts'
import { detectTable } from '../../shared/ingest/index.ts'

// The upload work the worker pool runs, called directly (no database): refusals come back as data,
// conversions are shared/time's, ReadMe files are recognised as descriptions.
const bytes = (s: string) => new TextEncoder().encode(s)

describe('upload tasks', () => {
  it('return whole-file refusals as data for a 4xx, not as a thrown error', () => {
    const out = uploadPreviewTask({ bytes: bytes('a,b\n1,2\n'), fileName: 'rv.xlsx', maxBytes: 1e6, hints: {}, descriptions: [] })
    expect(out).toEqual({ ok: false, error: { code: 'unsupported_format', message: 'rv.xlsx is an Excel workbook. Save the sheet as CSV (File → Save as / Download → .csv) and upload that file.' } })
  })

  it('read the rows into columns, flags as exclusion reasons', () => {
    const text = 'bjd,rv,err,quality\n2459000.5,1.5,1.0,good\n2459001.5,2.5,1.0,cloudy\n'
    const mapping = detectTable(text, { fileName: 'q.csv' }).mapping
    const out = uploadParseTask({ bytes: bytes(text), fileName: 'q.csv', maxBytes: 1e6, mapping })
    if (!out.ok) throw new Error(out.error.message)
    expect(Array.from(out.time)).toEqual([2459000.5, 2459001.5])
    expect(out.excludedReason).toEqual([null, 'quality: cloudy'])
    expect(out.instrumentNames).toEqual(['q'])
  })

  it('convert JD_UTC with toBjdTdb and BJD_UTC by the clock change only (Eastman et al. 2010 §4)', () => {
    const t = Float64Array.from([2455000.5, 2459000.25])
    const target = { raDeg: 10, decDeg: 20 }
    const site = { lonDeg: -17.88, latDeg: 28.76, heightM: 2396 }
    expect(Array.from(convertTimes(t, { from: 'jd_utc', target, site }))).toEqual(Array.from(toBjdTdb(t, 'utc', target, site)))
    expect(Array.from(convertTimes(t, { from: 'bjd_utc', target, site }))).toEqual(Array.from(t, (x) => ttToTdb(utcToTt(x))))
    // BJD_UTC → BJD_TDB is 66.184 s + (TDB − TT) in 2009 (34 leap seconds + 32.184 s)
    expect((convertTimes(t, { from: 'bjd_utc', target, site })[0]! - t[0]!) * 86400).toBeCloseTo(66.184, 2)
  })

  it('know a CDS ReadMe from a table', () => {
    expect(isDescription('ReadMe', bytes('Byte-by-byte Description of file: rv.dat\n'))).toBe(true)
    expect(isDescription('readme.txt', bytes('time rv err\n'))).toBe(false)
    expect(isDescription('rv.dat', bytes('Byte-by-byte Description of file: rv.dat\n'))).toBe(false)
  })
})

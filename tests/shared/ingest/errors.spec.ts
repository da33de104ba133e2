import { describe, expect, it } from 'vitest'
import {
  IngestError, MAX_FILE_BYTES, MAX_ROWS, decodeTableBytes, detectTable, parseTable, type IngestErrorCode,
} from '../../../shared/ingest/index.ts'

/** Run f, expect an IngestError with this code, and return it for more checks. */
function ingestError(f: () => unknown, code: IngestErrorCode): IngestError {
  try { f() } catch (e) {
    expect(e).toBeInstanceOf(IngestError)
    expect((e as IngestError).code).toBe(code)
    return e as IngestError
  }
  throw new Error(`expected IngestError '${code}'`)
}

const bytes = (s: string): Uint8Array => new TextEncoder().encode(s)

describe('empty files', () => {
  it('refuses zero bytes', () => {
    expect(ingestError(() => decodeTableBytes(new Uint8Array()), 'empty').message).toMatch(/empty.*one row per measurement/)
  })

  it('refuses text with only blank lines', () => {
    expect(ingestError(() => detectTable('\n  \n\t\n'), 'empty').message).toMatch(/empty/)
  })

  it('refuses text with only comments', () => {
    expect(ingestError(() => detectTable('# time rv err\n# nothing yet\n'), 'empty').message).toMatch(/only comment lines/)
  })

  it('refuses a header without rows', () => {
    expect(ingestError(() => detectTable('time rv err\n'), 'empty').message).toMatch(/header line but no data rows/)
  })
})

describe('binary files', () => {
  it('refuses NUL bytes', () => {
    const b = bytes('2450001 1 1\n')
    const withNul = new Uint8Array([...b, 0, 0, 1, 2])
    expect(ingestError(() => decodeTableBytes(withNul), 'binary').message).toMatch(/binary file.*CSV/)
  })

  it('refuses NUL characters in text', () => {
    ingestError(() => detectTable('2450001 1 1\u0000\n'), 'binary')
  })

  it('refuses text full of control characters', () => {
    const junk = Array.from({ length: 400 }, (_, i) => String.fromCharCode((i * 7) % 31 + 1)).join('')
    ingestError(() => detectTable(`2450001 1 1\n${junk}\n`), 'binary')
  })

  const signatures: Array<[string, number[], RegExp]> = [
    ['a spreadsheet', [0x50, 0x4b, 0x03, 0x04, 1, 2, 3], /spreadsheet.*CSV/],
    ['an old Excel file', [0xd0, 0xcf, 0x11, 0xe0, 1, 2], /Excel/],
    ['a gzip file', [0x1f, 0x8b, 8, 0], /uncompressed/],
    ['a PDF', [...bytes('%PDF-1.7\n')], /PDF/],
  ]
  for (const [what, sig, message] of signatures) {
    it(`names ${what}`, () => {
      expect(ingestError(() => decodeTableBytes(new Uint8Array(sig)), 'binary').message).toMatch(message)
    })
  }
})

describe('text encodings', () => {
  it('reads UTF-8 and strips its byte-order mark', () => {
    expect(decodeTableBytes(new Uint8Array([0xef, 0xbb, 0xbf, ...bytes('σ_rv\n')]))).toBe('σ_rv\n')
  })

  it('reads UTF-16 little-endian with a byte-order mark (spreadsheet "Unicode text")', () => {
    const text = 'time\trv\terr\n2450001\t1\t1\n'
    const le = new Uint8Array(2 + text.length * 2)
    le[0] = 0xff; le[1] = 0xfe
    for (let i = 0; i < text.length; i++) { le[2 + 2 * i] = text.charCodeAt(i); le[3 + 2 * i] = 0 }
    expect(decodeTableBytes(le)).toBe(text)
  })

  it('reads UTF-16 without a byte-order mark', () => {
    const text = '2450001\t1\t1\n2450002\t2\t1\n'
    const le = new Uint8Array(text.length * 2)
    const be = new Uint8Array(text.length * 2)
    for (let i = 0; i < text.length; i++) { le[2 * i] = text.charCodeAt(i); be[2 * i + 1] = text.charCodeAt(i) }
    expect(decodeTableBytes(le)).toBe(text)
    expect(decodeTableBytes(be)).toBe(text)
  })

  it('falls back to Latin-1 for bytes that are not UTF-8', () => {
    expect(decodeTableBytes(new Uint8Array([0x73, 0xb1, 0x0a]))).toBe('s±\n')
  })
})

describe('limits', () => {
  it('refuses bytes over the size limit', () => {
    const e = ingestError(() => decodeTableBytes(new Uint8Array(2048), 1024), 'too_large')
    expect(e.message).toMatch(/limit is 0 MB|limit/)
  })

  it('refuses text over MAX_FILE_BYTES', () => {
    ingestError(() => detectTable(' '.repeat(MAX_FILE_BYTES + 1)), 'too_large')
  })

  it(`refuses more than MAX_ROWS (${MAX_ROWS}) rows, in detection and in parsing`, () => {
    const text = '1 2 3\n'.repeat(MAX_ROWS + 1)
    expect(ingestError(() => detectTable(text), 'too_many_rows').message).toMatch(/200000.*Split/)
    const mapping = { delimiter: 'whitespace' as const, hasHeader: false, unit: 'm/s' as const, timeFormat: 'days' as const,
      columns: [{ index: 0, name: 'a', role: 'time' as const }, { index: 1, name: 'b', role: 'rv' as const }, { index: 2, name: 'c', role: 'error' as const }] }
    ingestError(() => parseTable(text, mapping), 'too_many_rows')
  })
})

describe('unusable columns', () => {
  it('refuses a table with no numeric column', () => {
    const e = ingestError(() => detectTable('a b c\nd e f\ng h i\n'), 'no_numeric_columns')
    expect(e.message).toMatch(/No column holds numbers/)
  })

  it('refuses a table with a single numeric column', () => {
    const e = ingestError(() => detectTable('2450001\n2450002\n2450003\n'), 'no_velocity_column')
    expect(e.message).toMatch(/Only one numeric column/)
    expect(e.field).toBe('rv')
  })

  it('refuses a table whose only numeric column is beside text', () => {
    ingestError(() => detectTable('2450001 HARPS\n2450002 HARPS\n'), 'no_velocity_column')
  })

  it('refuses a time hint naming a text column', () => {
    const e = ingestError(() => detectTable('t rv err inst\n2450001 1 1 A\n2450002 1 1 A\n', { time: 'inst' }), 'bad_hint')
    expect(e.field).toBe('time')
  })

  it('refuses hints naming columns that do not exist', () => {
    expect(ingestError(() => detectTable('t rv err\n2450001 1 1\n', { rv: 'vel' }), 'bad_hint').message).toMatch(/'vel' is not in the header/)
    expect(ingestError(() => detectTable('2450001 1 1\n2450002 1 1\n', { error: 7 }), 'bad_hint').message).toMatch(/column 7 does not exist/)
  })

  it('refuses malformed hints', () => {
    expect(ingestError(() => detectTable('2450001 1 1\n', { unit: 'kg' as never }), 'bad_hint').field).toBe('unit')
    expect(ingestError(() => detectTable('2450001 1 1\n', { defaultError: -1 }), 'bad_hint').field).toBe('defaultError')
  })
})

describe('IngestError', () => {
  it('serialises to code, message and field', () => {
    const e = new IngestError('missing_error', 'give one error', 'defaultError')
    expect(JSON.parse(JSON.stringify(e))).toEqual({ code: 'missing_error', message: 'give one error', field: 'defaultError' })
    expect(e.name).toBe('IngestError')
    expect(e).toBeInstanceOf(Error)
  })
})

describe('hostile input', () => {
  it('reads a huge non-numeric cell as text without slowing down', () => {
    const long = `${'9'.repeat(200_000)}x`
    const r = parseTable(`2450001 ${long} 1\n2450002 1 1\n`, {
      delimiter: 'whitespace', hasHeader: false, unit: 'm/s', timeFormat: 'jd',
      columns: [{ index: 0, name: 't', role: 'time' }, { index: 1, name: 'rv', role: 'rv' }, { index: 2, name: 'e', role: 'error' }],
    })
    expect(r.problems).toHaveLength(1)
    expect(r.problems[0]!.message).toMatch(/is not a number/)
    expect(r.problems[0]!.message.length).toBeLessThan(100)
  })

  it('reads a huge header name without slowing down', () => {
    const d = detectTable(`time ${'['.repeat(100_000)} err\n2450001 1 1\n2450002 2 1\n`)
    expect(d.mapping.columns.map(c => c.role)).toEqual(['time', 'rv', 'error'])
  })
})

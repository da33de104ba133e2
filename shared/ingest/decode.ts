import { IngestError } from './errors.ts'
import { MAX_FILE_BYTES } from './limits.ts'

const SIGNATURES: Array<{ bytes: number[]; what: string }> = [
  { bytes: [0x50, 0x4b, 0x03, 0x04], what: 'a ZIP archive or a spreadsheet (.xlsx/.ods); export the sheet as CSV or tab-separated text' },
  { bytes: [0xd0, 0xcf, 0x11, 0xe0], what: 'an old Excel/Office file (.xls); export the sheet as CSV or tab-separated text' },
  { bytes: [0x1f, 0x8b], what: 'a gzip-compressed file; upload the uncompressed table' },
  { bytes: [0x25, 0x50, 0x44, 0x46], what: 'a PDF; upload the table as plain text' },
  { bytes: [0x53, 0x49, 0x4d, 0x50, 0x4c, 0x45, 0x20, 0x20], what: 'a FITS file; export the table as plain text' },
]

function startsWith(bytes: Uint8Array, sig: number[]): boolean {
  if (bytes.length < sig.length) return false
  return sig.every((b, i) => bytes[i] === b)
}

/**
 * Turn uploaded bytes into table text: refuses files over MAX_FILE_BYTES and binary files,
 * reads UTF-8 (or UTF-16 with a byte-order mark, as spreadsheets write "Unicode text"),
 * falls back to Latin-1 for bytes that are not UTF-8, and strips a byte-order mark.
 */
export function decodeTableBytes(bytes: Uint8Array, maxBytes: number = MAX_FILE_BYTES): string {
  if (bytes.length > maxBytes) {
    throw new IngestError('too_large',
      `The file is ${(bytes.length / 1048576).toFixed(1)} MB; the limit is ${(maxBytes / 1048576).toFixed(0)} MB. Split the table into smaller files.`)
  }
  if (bytes.length === 0) throw new IngestError('empty', 'The file is empty. Upload a table with one row per measurement.')
  for (const { bytes: sig, what } of SIGNATURES) {
    if (startsWith(bytes, sig)) throw new IngestError('binary', `This is not a text table: it looks like ${what}.`)
  }
  let text: string
  if (startsWith(bytes, [0xff, 0xfe])) text = new TextDecoder('utf-16le').decode(bytes)
  else if (startsWith(bytes, [0xfe, 0xff])) text = new TextDecoder('utf-16be').decode(bytes)
  else if (looksUtf16(bytes, 1)) text = new TextDecoder('utf-16le').decode(bytes)
  else if (looksUtf16(bytes, 0)) text = new TextDecoder('utf-16be').decode(bytes)
  else {
    const head = bytes.subarray(0, 65536)
    if (head.includes(0)) throw binaryError()
    try {
      text = new TextDecoder('utf-8', { fatal: true }).decode(bytes)
    } catch {
      text = new TextDecoder('latin1').decode(bytes)
    }
  }
  assertText(text)
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text
}

/** UTF-16 without a byte-order mark: in the first 1000 bytes every other byte (from `zeroAt`: 1 little-endian, 0 big-endian) is 0 and the rest are ASCII. */
function looksUtf16(bytes: Uint8Array, zeroAt: 0 | 1): boolean {
  const n = Math.min(bytes.length, 1000) & ~1
  if (n < 4) return false
  for (let i = 0; i < n; i += 2) {
    const hi = bytes[i + zeroAt]!
    const lo = bytes[i + 1 - zeroAt]!
    if (hi !== 0 || lo === 0 || lo > 127) return false
  }
  return true
}

function binaryError(): IngestError {
  return new IngestError('binary', 'This is a binary file, not a text table. Upload the velocities as CSV, tab-separated or whitespace-separated text.')
}

/**
 * Refuse text that is really binary: a NUL character, or more than 1% control characters
 * (other than tab, newline, carriage return, form feed) or replacement characters in the first 64 k.
 */
export function assertText(text: string): void {
  const n = Math.min(text.length, 65536)
  let bad = 0
  for (let i = 0; i < n; i++) {
    const c = text.charCodeAt(i)
    if (c === 0) throw binaryError()
    if ((c < 32 && c !== 9 && c !== 10 && c !== 13 && c !== 12) || c === 0xfffd || c === 127) bad++
  }
  if (n > 0 && bad > Math.max(2, n * 0.01)) throw binaryError()
}

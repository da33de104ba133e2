import { detectTable } from './detect.ts'
import { IngestError } from './errors.ts'
import { parseTable } from './parse.ts'
import type { Detection, DetectHints, ParseOptions, ParseResult, TableMapping } from './types.ts'

export interface TablePreview {
  detection: Detection
  /** The mapping used: the detected one with `override` laid over it. */
  mapping: TableMapping
  /** Rows and problems with that mapping; null when the mapping itself is unusable. */
  result: ParseResult | null
  /** Why the mapping is unusable (e.g. 'missing_error' until a defaultError is given), else null. */
  mappingError: { code: IngestError['code']; message: string; field?: string } | null
}

/**
 * Detect and parse in one call, for a preview step: whole-file problems throw IngestError as in
 * detectTable; an incomplete mapping (no error column and no defaultError, …) does not throw but
 * comes back as `mappingError`, so the caller can show the detection and ask for the missing piece.
 * `override` replaces fields of the detected mapping (e.g. a user's corrected columns).
 */
export function previewTable(text: string, hints: DetectHints = {}, override: Partial<TableMapping> = {}, opts: ParseOptions = {}): TablePreview {
  const detection = detectTable(text, hints)
  const mapping: TableMapping = { ...detection.mapping, ...override }
  try {
    return { detection, mapping, result: parseTable(text, mapping, opts), mappingError: null }
  } catch (e) {
    if (e instanceof IngestError && e.code !== 'too_many_rows' && e.code !== 'too_large' && e.code !== 'binary') {
      return { detection, mapping, result: null, mappingError: e.toJSON() }
    }
    throw e
  }
}

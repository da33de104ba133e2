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
  /**
   * Why the mapping cannot be committed yet (e.g. 'missing_error' until a defaultError is given,
   * 'needs_answer' while a question is open), else null. With only open questions the rows are
   * still read, with the detected defaults, for the user to judge.
   */
  mappingError: { code: IngestError['code']; message: string; field?: string } | null
}

/**
 * Parse for a preview with a mapping as it stands: an unusable mapping comes back as
 * `mappingError` (not thrown); open questions are reported there too but the rows are read with
 * the default answers, so the user sees what each choice gives.
 */
export function parseForPreview(text: string, mapping: TableMapping, opts: ParseOptions = {}): Pick<TablePreview, 'result' | 'mappingError'> {
  try {
    if (mapping.questions?.length) {
      const q = mapping.questions[0]!
      const { questions: _open, ...answered } = mapping
      return {
        result: parseTable(text, answered, opts),
        mappingError: { code: 'needs_answer', message: `${q.message} Choose one of: ${q.choices.map((c) => c.label).join('; ')}.`, field: q.field },
      }
    }
    return { result: parseTable(text, mapping, opts), mappingError: null }
  } catch (e) {
    if (e instanceof IngestError && e.code !== 'too_many_rows' && e.code !== 'too_large' && e.code !== 'binary') {
      return { result: null, mappingError: e.toJSON() }
    }
    throw e
  }
}

/**
 * Detect and parse in one call, for a preview step: whole-file problems throw IngestError as in
 * detectTable; an incomplete mapping (no error column and no defaultError, an open question …)
 * does not throw but comes back as `mappingError`, so the caller can show the detection and ask
 * for the missing piece. `override` replaces fields of the detected mapping.
 */
export function previewTable(text: string, hints: DetectHints = {}, override: Partial<TableMapping> = {}, opts: ParseOptions = {}): TablePreview {
  const detection = detectTable(text, hints)
  const mapping: TableMapping = { ...detection.mapping, ...override }
  return { detection, mapping, ...parseForPreview(text, mapping, opts) }
}

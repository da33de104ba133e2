import type { DetectContext } from './rules/context.ts'
import { finish } from './rules/columns.ts'
import { RULES } from './rules/index.ts'
import { parseNumber, splitCells } from './text.ts'
import type { Detection, DetectHints } from './types.ts'

function newContext(text: string, hints: DetectHints): DetectContext {
  return {
    hints, text, notes: [], questions: [], lines: [], layout: null, format: 'delimited', dataIdx: [], commentLines: 0,
    delimiter: 'whitespace', fields: null, split: (l) => splitCells(l, 'whitespace'), sampleIdx: [], sample: [],
    decimalComma: false, num: (c) => parseNumber(c), hasHeader: false, skipRows: 0, firstData: 0, dataSample: [],
    columnCount: 0, headerNames: null, headerFromComment: false, headerLine: null, unitsText: [], names: [], stats: [],
    isNumeric: [], readings: [], roles: [], indicatorKeys: [], units: [], keep: [], unit: 'm/s', timeFormat: 'jd',
    timeScale: 'unknown', columns: [],
  }
}

/**
 * Look at a velocity table and propose how to read it: the rules of rules/index.ts in order (see
 * README.md). Throws IngestError for whole-file problems: 'empty', 'binary', 'too_large',
 * 'too_many_rows', 'no_numeric_columns', 'no_velocity_column', 'no_time_column', 'bad_hint',
 * 'unsupported_format'. What it cannot decide (MJD or JD − 2400000, a zero point) comes back as
 * `mapping.questions`; a missing error column comes back without one and a note says a
 * defaultError is needed.
 */
export function detectTable(text: string, hints: DetectHints = {}): Detection {
  if (typeof text !== 'string') throw new TypeError('text must be a string')
  const ctx = newContext(text, hints)
  for (const [, rule] of RULES) rule(ctx)
  return finish(ctx)
}

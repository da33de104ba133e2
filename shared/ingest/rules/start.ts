import { assertText } from '../decode.ts'
import { IngestError } from '../errors.ts'
import { refuseByName, refuseLatex } from '../formats/refuse.ts'
import { MAX_FILE_BYTES } from '../limits.ts'
import { DELIMITERS } from '../mapping.ts'
import { isVelocityUnit } from '../units.ts'
import { TIME_SCALES, isTimeFormat } from '../time.ts'
import { splitLines } from '../text.ts'
import type { DetectHints } from '../types.ts'
import type { Rule } from './context.ts'

function checkHints(h: DetectHints): void {
  if (h.delimiter !== undefined && !DELIMITERS.includes(h.delimiter)) throw new IngestError('bad_hint', `delimiter must be one of ',', tab, ';', 'whitespace', 'fixed'`, 'delimiter')
  if (h.unit !== undefined && !(typeof h.unit === 'string' && isVelocityUnit(h.unit))) throw new IngestError('bad_hint', `unit must be a velocity unit such as 'm/s' or 'km/s' (got ${JSON.stringify(h.unit)})`, 'unit')
  if (h.timeFormat !== undefined && !isTimeFormat(h.timeFormat)) throw new IngestError('bad_hint', `timeFormat must be 'jd', 'bjd', 'mjd', 'days' or 'jd-N' (got ${JSON.stringify(h.timeFormat)})`, 'timeFormat')
  if (h.timeScale !== undefined && !TIME_SCALES.includes(h.timeScale)) throw new IngestError('bad_hint', `timeScale must be one of ${TIME_SCALES.join(', ')}`, 'timeScale')
  if (h.defaultError !== undefined && !(typeof h.defaultError === 'number' && h.defaultError > 0 && Number.isFinite(h.defaultError))) {
    throw new IngestError('bad_hint', 'defaultError must be a positive number', 'defaultError')
  }
}

/** Hints are valid; the text is text, not too large, not a spreadsheet or LaTeX; split into lines. */
export const start: Rule = (ctx) => {
  checkHints(ctx.hints)
  refuseByName(ctx.hints.fileName)
  let text = ctx.text
  if (text.length > MAX_FILE_BYTES) {
    throw new IngestError('too_large', `The table is over the ${(MAX_FILE_BYTES / 1048576).toFixed(0)} MB limit. Split it into smaller files.`)
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1)
  assertText(text)
  ctx.text = text
  ctx.lines = splitLines(text)
  refuseLatex(ctx.lines)
}

export type {
  ColumnMapping, ColumnRef, ColumnRole, DateSplit, Delimiter, Detection, DetectHints, FieldSpec, KnownIndicator,
  ParseOptions, ParseResult, ParsedRow, PreviewRow, Question, RowProblem, TableFormat, TableMapping, TimeFormat, TimeScale, VelocityUnit,
} from './types.ts'
export { IngestError, type IngestErrorCode } from './errors.ts'
export { COMMENT_PREFIXES, DEFAULT_INSTRUMENT, MAX_FILE_BYTES, MAX_PROBLEMS, MAX_ROWS, PREVIEW_ROWS } from './limits.ts'
export { COLUMN_ROLES, DELIMITERS, TIME_FORMATS, VELOCITY_UNITS, validateMapping } from './mapping.ts'
export { decodeTableBytes } from './decode.ts'
export { detectTable } from './detect.ts'
export { formatProblems, parseTable } from './parse.ts'
export { parseForPreview, previewTable, type TablePreview } from './preview.ts'
export {
  PLAUSIBLE_JD, TIME_OFFSETS, TIME_SCALES, calendarToJd, describeTimeFormat, describeTimeScale, formatForOffset, isTimeFormat,
  timeOffset, toFullJd,
} from './time.ts'
export { readTimeWords, type TimeWords } from './time-words.ts'
export { canonicalUnit, isVelocityUnit, unitInText, velocityFactor } from './units.ts'
export { readByteDescriptions } from './formats/byte-by-byte.ts'
export { refuseByName } from './formats/refuse.ts'
export { instrumentFromFileName } from './rules/instrument.ts'
export { MAX_ABS_RV, MIN_ERROR } from './plausibility.ts'

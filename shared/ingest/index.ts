export type {
  ColumnMapping, ColumnRef, ColumnRole, DateSplit, Delimiter, Detection, DetectHints, KnownIndicator,
  ParseOptions, ParseResult, ParsedRow, PreviewRow, RowProblem, TableMapping, TimeFormat, VelocityUnit,
} from './types.ts'
export { IngestError, type IngestErrorCode } from './errors.ts'
export { COMMENT_PREFIXES, DEFAULT_INSTRUMENT, MAX_FILE_BYTES, MAX_PROBLEMS, MAX_ROWS, PREVIEW_ROWS } from './limits.ts'
export { COLUMN_ROLES, DELIMITERS, TIME_FORMATS, VELOCITY_UNITS, validateMapping } from './mapping.ts'
export { decodeTableBytes } from './decode.ts'
export { detectTable } from './detect.ts'
export { formatProblems, parseTable } from './parse.ts'
export { previewTable, type TablePreview } from './preview.ts'
export { TIME_OFFSETS, calendarToJd, toFullJd } from './time.ts'

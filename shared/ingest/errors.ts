/** Codes of whole-file problems; callers map them to replies (see README). */
export type IngestErrorCode =
  | 'empty'
  | 'binary'
  | 'too_large'
  | 'too_many_rows'
  | 'no_numeric_columns'
  | 'no_time_column'
  | 'no_velocity_column'
  | 'missing_error'
  | 'bad_mapping'
  | 'bad_hint'
  | 'unsupported_format'
  | 'needs_answer'

/**
 * A problem with the whole file or with the mapping, never with one row (rows get RowProblems).
 * The message says what to fix; `field` names the mapping or hint field at fault, if any.
 */
export class IngestError extends Error {
  readonly code: IngestErrorCode
  readonly field?: string

  constructor(code: IngestErrorCode, message: string, field?: string) {
    super(message)
    this.name = 'IngestError'
    this.code = code
    if (field !== undefined) this.field = field
  }

  toJSON(): { code: IngestErrorCode; message: string; field?: string } {
    return this.field === undefined
      ? { code: this.code, message: this.message }
      : { code: this.code, message: this.message, field: this.field }
  }
}

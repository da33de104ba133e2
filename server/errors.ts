import type { ErrorRequestHandler } from 'express'
import { randomUUID } from 'node:crypto'
import multer from 'multer'
import { BaseError, ConnectionError, DatabaseError, UniqueConstraintError, ValidationError as ModelValidationError } from 'sequelize'
import { ZodError } from 'zod'
import type { ErrorCode, ErrorBody } from '../shared/api/errors.ts'

/** Base of every error a service may throw on purpose; the error middleware renders it. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCode,
    message: string,
    readonly field?: string,
    readonly details?: unknown,
  ) {
    super(message)
  }
}
export class ValidationError extends HttpError {
  constructor(message: string, field?: string, details?: unknown) { super(400, 'validation', message, field, details) }
}
export class UnauthorizedError extends HttpError {
  constructor(message = 'Sign in first.') { super(401, 'unauthorized', message) }
}
export class ForbiddenError extends HttpError {
  constructor(message = 'Your role in this team does not allow this.') { super(403, 'forbidden', message) }
}
export class NotFoundError extends HttpError {
  constructor(what = 'Resource') { super(404, 'not_found', `${what} not found.`) }
}
export class ConflictError extends HttpError {
  constructor(message: string, field?: string) { super(409, 'conflict', message, field) }
}
export class TooLargeError extends HttpError {
  constructor(message: string, details?: unknown) { super(413, 'too_large', message, undefined, details) }
}
/** The database (or another dependency) cannot answer now: 503 with Retry-After, never counted as a wrong password. */
export class UnavailableError extends HttpError {
  constructor(message = 'The database is not reachable right now: try again in a few seconds.', readonly retryAfterSeconds = 10) {
    super(503, 'unavailable', message)
  }
}

/** PostgreSQL SQLSTATEs (PostgreSQL manual, appendix A) of an outage: connection exceptions (08…), shutdown, too many connections. */
const OUTAGE_STATES = /^(08...|57P01|57P02|57P03|53300)$/
const OUTAGE_MESSAGES = /Connection terminated|connection error and is not queryable|ECONNREFUSED|ECONNRESET|the database system is (starting up|shutting down)/i
/** Bad values that reached the database (the schemas should have refused them first: this is the backstop). */
const BAD_VALUE: Record<string, string> = {
  '22001': 'A text value is longer than its field allows: shorten it.',
  '22003': 'A number is out of the range its field allows.',
  '22021': 'A text value contains a character that cannot be stored (such as NUL): remove it.',
  '22P05': 'A text value contains a character that cannot be stored (such as a lone surrogate or NUL): remove it.',
  '22P02': 'A value has the wrong form for its field.',
  '22007': 'A date or time value has the wrong form.',
  '22008': 'A date or time value is out of range.',
}

function sqlState(err: BaseError): string | undefined {
  const original = (err as { original?: { code?: unknown } }).original ?? (err as { parent?: { code?: unknown } }).parent
  return typeof original?.code === 'string' ? original.code : undefined
}

/** Maps Sequelize errors to what the caller can act on; undefined leaves a 500. */
export function databaseError(err: unknown): HttpError | undefined {
  if (!(err instanceof BaseError)) return undefined
  if (err instanceof ConnectionError) return new UnavailableError()
  const state = sqlState(err)
  if (state && OUTAGE_STATES.test(state)) return new UnavailableError()
  if (OUTAGE_MESSAGES.test(err.message)) return new UnavailableError()
  if (err instanceof UniqueConstraintError) {
    const field = Object.keys(err.fields ?? {})[0]
    return new ConflictError('This already exists: choose another value.', field)
  }
  if (err instanceof ModelValidationError) return new ValidationError(`Invalid value${err.errors[0]?.path ? ` for ${err.errors[0].path}` : ''}.`, err.errors[0]?.path ?? undefined)
  if (err instanceof DatabaseError && state) {
    if (BAD_VALUE[state]) return new ValidationError(BAD_VALUE[state]!)
    if (state === '40001' || state === '40P01') return new ConflictError('Someone changed the same thing at the same moment: try again.')
  }
  return undefined
}

/**
 * What the log keeps of an unexpected error: its type, message and stack, cut short, and the
 * SQLSTATE. Never the SQL text or its bound values (they carry user data and can be megabytes).
 */
export function errorForLog(err: unknown): Record<string, unknown> {
  const cut = (t: unknown, n: number) => (typeof t === 'string' && t.length > n ? `${t.slice(0, n)}… (${t.length} characters)` : t)
  if (!(err instanceof Error)) return { message: cut(String(err), 500) }
  const out: Record<string, unknown> = { type: err.name, message: cut(err.message, 500), stack: cut(err.stack, 4000) }
  if (err instanceof BaseError) {
    const state = sqlState(err)
    if (state) out.sqlState = state
  }
  return out
}

function render(err: unknown, maxBytes: number): HttpError | undefined {
  if (err instanceof HttpError) return err
  if (err instanceof ZodError) {
    const issue = err.issues[0]
    const field = issue?.path.join('.') || undefined
    return new ValidationError(field ? `${field}: ${issue!.message}` : (issue?.message ?? 'Invalid input.'), field,
      { issues: err.issues.map((i) => ({ path: i.path.join('.'), message: i.message })) })
  }
  if (err instanceof multer.MulterError) {
    if (err.code === 'LIMIT_FILE_SIZE') {
      const mb = (maxBytes / 1024 / 1024).toFixed(maxBytes >= 1024 * 1024 ? 0 : 3)
      return new TooLargeError(`A file is larger than the ${mb} MB limit: split it or upload fewer rows.`)
    }
    if (err.code === 'LIMIT_FILE_COUNT') return new TooLargeError('Too many files: upload at most 10 at once.')
    if (err.code === 'LIMIT_UNEXPECTED_FILE') return new ValidationError(`Unexpected file field "${err.field}": send the files in the field "files".`, err.field)
    return new ValidationError(`Upload refused: ${err.message}.`, err.field)
  }
  const e = err as { type?: string; status?: number }
  if (e?.type === 'entity.parse.failed') return new ValidationError('The request body is not valid JSON.')
  if (e?.type === 'entity.too.large') return new TooLargeError('The request body is too large.')
  return databaseError(err)
}

/** The one error middleware: every failure leaves as `{ error: { code, message, field?, details?, requestId? } }`. */
export function errorMiddleware(opts: {
  maxUploadBytes: number
  log?: (err: unknown, requestId: string) => void
  /** Told of outages (503) so the operator sees them; the caller gets the short message only. */
  warn?: (err: unknown) => void
}): ErrorRequestHandler {
  return (err, req, res, _next) => {
    const known = render(err, opts.maxUploadBytes)
    if (known instanceof UnavailableError && known !== err) opts.warn?.(err)
    let status: number
    let body: ErrorBody
    if (known) {
      status = known.status
      body = { error: { code: known.code, message: known.message } }
      if (known.field) body.error.field = known.field
      if (known.details !== undefined) body.error.details = known.details
    } else {
      const requestId = String((req as { id?: unknown }).id ?? randomUUID())
      opts.log?.(err, requestId)
      status = 500
      body = { error: { code: 'internal', message: `Something went wrong on the server (request ${requestId}).`, requestId } }
    }
    if (res.headersSent) return
    if (known instanceof UnavailableError) res.set('Retry-After', String(known.retryAfterSeconds))
    res.status(status).json(body)
  }
}

import type { ErrorRequestHandler } from 'express'
import { randomUUID } from 'node:crypto'
import multer from 'multer'
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
  return undefined
}

/** The one error middleware: every failure leaves as `{ error: { code, message, field?, details?, requestId? } }`. */
export function errorMiddleware(opts: { maxUploadBytes: number; log?: (err: unknown, requestId: string) => void }): ErrorRequestHandler {
  return (err, req, res, _next) => {
    const known = render(err, opts.maxUploadBytes)
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
    res.status(status).json(body)
  }
}

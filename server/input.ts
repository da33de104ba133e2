import type { NextFunction, Request, Response } from 'express'
import { ValidationError } from './errors.ts'

// Text the database cannot store faithfully is refused at the door, naming the field: NUL and
// other C0 control characters (tab, line feed and carriage return are text) and lone UTF-16
// surrogates (JSON "\ud800": not a character; PostgreSQL refuses it in JSONB and UTF-8 has no
// form for it). Applies to JSON bodies and query strings of every route.

const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/
const CONTROL = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F]/
const MAX_DEPTH = 64

/** Why a string cannot be stored, or null. */
export function unstorableText(text: string): string | null {
  const c = CONTROL.exec(text)
  if (c) return `contains the control character U+${c[0].charCodeAt(0).toString(16).toUpperCase().padStart(4, '0')}: remove it`
  if (LONE_SURROGATE.test(text)) return 'contains a lone surrogate (a broken character): re-type or re-paste the text'
  return null
}

/** The path and reason of the first unstorable string (or key) in a parsed JSON value, or null. */
export function findUnstorable(value: unknown, path: string[] = [], depth = 0): { path: string; reason: string } | null {
  if (typeof value === 'string') {
    const reason = unstorableText(value)
    return reason ? { path: path.join('.'), reason } : null
  }
  if (value === null || typeof value !== 'object' || depth > MAX_DEPTH) return null
  for (const [k, v] of Object.entries(value)) {
    const keyReason = unstorableText(k)
    if (keyReason) return { path: [...path, '(a key)'].join('.'), reason: keyReason }
    const found = findUnstorable(v, [...path, k], depth + 1)
    if (found) return found
  }
  return null
}

export function refuseUnstorableText(req: Request, _res: Response, next: NextFunction): void {
  const found = findUnstorable(req.body) ?? findUnstorable(req.query)
  if (!found) return next()
  next(new ValidationError(`${found.path || 'The request'} ${found.reason}.`, found.path || undefined))
}

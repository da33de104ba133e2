/**
 * The one fetch wrapper every API function goes through: same-origin credentials, the CSRF
 * double-submit header on unsafe methods, and the server's error envelope turned into ApiError.
 */

export type ApiErrorCode =
  | 'validation' | 'unauthorized' | 'forbidden' | 'not_found' | 'conflict'
  | 'too_large' | 'rate_limited' | 'unavailable' | 'internal' | 'network'

/** A failed request, as the screen shows it. `field` names the offending input when the server says so. */
export class ApiError extends Error {
  readonly status: number
  readonly code: ApiErrorCode
  readonly field?: string
  readonly details?: unknown

  constructor(status: number, code: ApiErrorCode, message: string, field?: string, details?: unknown) {
    super(message)
    this.name = 'ApiError'
    this.status = status
    this.code = code
    this.field = field
    this.details = details
  }
}

const CSRF_COOKIE = 'starsway_csrf'
const UNSAFE = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])

/** Reads the readable CSRF cookie the server sets on sign-in, register and `me`. */
export function csrfToken(): string | undefined {
  if (typeof document === 'undefined') return undefined
  for (const part of document.cookie.split(';')) {
    const [name, ...rest] = part.trim().split('=')
    if (name === CSRF_COOKIE) return decodeURIComponent(rest.join('='))
  }
  return undefined
}

let unauthorizedHandler: ((path: string) => void) | null = null

/**
 * Called when a request other than the sign-in family answers 401 (the session ran out), so the
 * app can send the user to sign-in instead of showing a page of errors.
 */
export function onUnauthorized(handler: ((path: string) => void) | null): void {
  unauthorizedHandler = handler
}

export interface RequestOptions {
  method?: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE'
  /** A plain object is sent as JSON; FormData as multipart. */
  body?: unknown
  signal?: AbortSignal
}

function codeForStatus(status: number): ApiErrorCode {
  if (status === 400) return 'validation'
  if (status === 401) return 'unauthorized'
  if (status === 403) return 'forbidden'
  if (status === 404) return 'not_found'
  if (status === 409) return 'conflict'
  if (status === 413) return 'too_large'
  if (status === 429) return 'rate_limited'
  if (status === 503) return 'unavailable'
  return 'internal'
}

async function toApiError(response: Response): Promise<ApiError> {
  let payload: unknown
  try {
    payload = await response.json()
  } catch {
    payload = undefined
  }
  const envelope = (payload as { error?: { code?: string; message?: string; field?: string; details?: unknown } } | undefined)?.error
  const code = (envelope?.code as ApiErrorCode | undefined) ?? codeForStatus(response.status)
  const message = envelope?.message ?? `The server answered ${response.status} ${response.statusText}`.trim()
  return new ApiError(response.status, code, message, envelope?.field, envelope?.details)
}

/** Sends one request to `/api…` and returns the parsed JSON body (undefined for 204/202 without a body). */
export async function request<T>(path: string, options: RequestOptions = {}): Promise<T> {
  const method = options.method ?? 'GET'
  const headers: Record<string, string> = { Accept: 'application/json' }
  let body: BodyInit | undefined
  if (options.body instanceof FormData) {
    body = options.body
  } else if (options.body !== undefined) {
    headers['Content-Type'] = 'application/json'
    body = JSON.stringify(options.body)
  }
  if (UNSAFE.has(method)) {
    const token = csrfToken()
    if (token) headers['X-CSRF-Token'] = token
  }
  let response: Response
  try {
    response = await fetch(`/api${path}`, { method, headers, body, credentials: 'same-origin', signal: options.signal })
  } catch (cause) {
    throw new ApiError(0, 'network', `Could not reach the server (${(cause as Error).message}). Check your connection and try again.`)
  }
  if (!response.ok) {
    const error = await toApiError(response)
    if (error.status === 401 && !path.startsWith('/auth/')) unauthorizedHandler?.(path)
    throw error
  }
  if (response.status === 204) return undefined as T
  const text = await response.text()
  return (text ? JSON.parse(text) : undefined) as T
}

/** Turns anything thrown into a message fit for the screen. */
export function errorMessage(error: unknown): string {
  if (error instanceof Error) return error.message
  return String(error)
}

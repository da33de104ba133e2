// @vitest-environment happy-dom
import { afterEach, describe, expect, it, vi } from 'vitest'
import { ApiError, onUnauthorized, request } from '@/api/http.ts'

function answer(status: number, body?: unknown) {
  return vi.fn(async () => new Response(body === undefined ? null : JSON.stringify(body), {
    status, headers: { 'Content-Type': 'application/json' },
  }))
}

afterEach(() => {
  vi.unstubAllGlobals()
  onUnauthorized(null)
  document.cookie = 'starsway_csrf=; expires=Thu, 01 Jan 1970 00:00:00 GMT; path=/'
})

describe('request', () => {
  it('sends the CSRF cookie as X-CSRF-Token on unsafe methods only, with JSON bodies', async () => {
    document.cookie = 'starsway_csrf=tok%2B123; path=/'
    const fetchMock = answer(200, { ok: true })
    vi.stubGlobal('fetch', fetchMock)
    await request('/stars/1', { method: 'PATCH', body: { name: 'x' } })
    await request('/stars/1')
    const [url, patchInit] = fetchMock.mock.calls[0] as unknown as [string, RequestInit]
    const [, getInit] = fetchMock.mock.calls[1] as unknown as [string, RequestInit]
    expect(url).toBe('/api/stars/1')
    expect(patchInit.credentials).toBe('same-origin')
    expect((patchInit.headers as Record<string, string>)['X-CSRF-Token']).toBe('tok+123')
    expect((patchInit.headers as Record<string, string>)['Content-Type']).toBe('application/json')
    expect(patchInit.body).toBe('{"name":"x"}')
    expect((getInit.headers as Record<string, string>)['X-CSRF-Token']).toBeUndefined()
  })

  it('turns the error envelope into an ApiError with status, code, message and field', async () => {
    vi.stubGlobal('fetch', answer(409, { error: { code: 'conflict', message: 'A star named Vega exists', field: 'name' } }))
    const error = await request('/teams/1/stars', { method: 'POST', body: {} }).catch((e: unknown) => e)
    expect(error).toBeInstanceOf(ApiError)
    expect(error).toMatchObject({ status: 409, code: 'conflict', message: 'A star named Vega exists', field: 'name' })
  })

  it('names the status when the body is not an envelope, and returns undefined for 204', async () => {
    vi.stubGlobal('fetch', vi.fn(async () => new Response('<html>', { status: 502, statusText: 'Bad Gateway' })))
    await expect(request('/health')).rejects.toMatchObject({ status: 502, code: 'internal', message: 'The server answered 502 Bad Gateway' })
    vi.stubGlobal('fetch', vi.fn(async () => new Response(null, { status: 204 })))
    await expect(request('/auth/logout', { method: 'POST' })).resolves.toBeUndefined()
  })

  it('reports a lost session to the handler, but not a failed sign-in', async () => {
    const handler = vi.fn()
    onUnauthorized(handler)
    vi.stubGlobal('fetch', answer(401, { error: { code: 'unauthorized', message: 'Sign in first' } }))
    await expect(request('/teams')).rejects.toBeInstanceOf(ApiError)
    await expect(request('/auth/login', { method: 'POST', body: {} })).rejects.toBeInstanceOf(ApiError)
    expect(handler).toHaveBeenCalledTimes(1)
    expect(handler).toHaveBeenCalledWith('/teams')
  })
})

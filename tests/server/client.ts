// A signed-in (or anonymous) HTTP client for API tests: keeps the cookies and sends the CSRF header.
import request from 'supertest'
import type { Express } from 'express'

export const DEMO_PASSWORD = 'starsway-demo'

function cookieValue(setCookie: string[] | string | undefined, name: string): string | undefined {
  const list = Array.isArray(setCookie) ? setCookie : setCookie ? [setCookie] : []
  for (const c of list) {
    const m = new RegExp(`^${name}=([^;]*)`).exec(c)
    if (m && m[1]) return decodeURIComponent(m[1])
  }
  return undefined
}

export class Client {
  readonly agent: ReturnType<typeof request.agent>
  csrf: string | undefined
  constructor(app: Express) { this.agent = request.agent(app) }

  private withCsrf(t: request.Test): request.Test {
    if (this.csrf) t.set('X-CSRF-Token', this.csrf)
    return t.expect((res) => {
      const c = cookieValue(res.headers['set-cookie'], 'starsway_csrf')
      if (c) this.csrf = c
    })
  }
  get(path: string) { return this.withCsrf(this.agent.get(path)) }
  post(path: string, body?: object) { return this.withCsrf(this.agent.post(path).send(body ?? {})) }
  patch(path: string, body?: object) { return this.withCsrf(this.agent.patch(path).send(body ?? {})) }
  delete(path: string) { return this.withCsrf(this.agent.delete(path)) }
  /** multipart/form-data with `files` and JSON fields. */
  upload(path: string, files: Array<{ name: string; content: string | Buffer }>, fields: Record<string, unknown> = {}) {
    let t = this.withCsrf(this.agent.post(path))
    for (const f of files) t = t.attach('files', Buffer.isBuffer(f.content) ? f.content : Buffer.from(f.content), f.name)
    for (const [k, v] of Object.entries(fields)) t = t.field(k, JSON.stringify(v))
    return t
  }
  /** Any method, for table-driven tests. */
  call(method: string, path: string, body?: object) {
    const m = method.toLowerCase() as 'get' | 'post' | 'patch' | 'delete'
    return m === 'get' ? this.get(path) : m === 'delete' ? this.delete(path) : this[m](path, body)
  }
}

export async function signIn(app: Express, email: string, password = DEMO_PASSWORD): Promise<Client> {
  const c = new Client(app)
  const res = await c.post('/api/auth/login', { email, password })
  if (res.status !== 200) throw new Error(`sign-in of ${email} failed: ${res.status} ${JSON.stringify(res.body)}`)
  return c
}

export function anonymous(app: Express): Client { return new Client(app) }

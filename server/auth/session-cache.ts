// A short-lived, in-process memory of live sessions, so the frequent reads make one database round
// trip fewer (issue 11: under load each round trip costs far more than the query). An entry is the
// user's row as read with a live session, kept for `SESSION_CACHE_MS`.
//
// Exact within this process: signing out, a password change or reset (any save of a user row) and
// every deletion of sessions forget the entries at once, and again when their transaction commits
// (a request that read the old row before the commit cannot keep it). The API runs as one process;
// a change made outside it (another process, SQL by hand) reaches it within `SESSION_CACHE_MS`.
import type { Services } from '../services.ts'

/** How long an entry lives (ms). */
export const SESSION_CACHE_MS = 5000
/** Most entries kept; the oldest go first beyond this. */
const MAX_ENTRIES = 10_000

interface Entry { userId: number; row: Record<string, unknown>; until: number }

export class SessionCache {
  private readonly bySession = new Map<string, Entry>()
  constructor(private readonly ttlMs = SESSION_CACHE_MS, private readonly now: () => number = Date.now) {}

  /** The user row cached for this session hash and user, or undefined. */
  get(hash: string, userId: number): Record<string, unknown> | undefined {
    const e = this.bySession.get(hash)
    if (!e) return undefined
    if (e.until <= this.now() || e.userId !== userId) { this.bySession.delete(hash); return undefined }
    return e.row
  }

  set(hash: string, userId: number, row: Record<string, unknown>): void {
    if (this.ttlMs <= 0) return
    this.bySession.delete(hash)
    if (this.bySession.size >= MAX_ENTRIES) this.bySession.delete(this.bySession.keys().next().value!)
    this.bySession.set(hash, { userId, row, until: this.now() + this.ttlMs })
  }

  forgetSession(hash: string): void { this.bySession.delete(hash) }

  forgetUser(userId: number): void {
    for (const [h, e] of this.bySession) if (e.userId === userId) this.bySession.delete(h)
  }

  clear(): void { this.bySession.clear() }

  get size(): number { return this.bySession.size }
}

const caches = new WeakMap<Services, SessionCache>()

/** The cache of one running API (its Services); hooks on the user model forget a user on every save (all on a bulk change). */
export function sessionCache(s: Services): SessionCache {
  let c = caches.get(s)
  if (!c) {
    const cache = new SessionCache()
    c = cache
    caches.set(s, cache)
    const forget = (user: { get(key: 'id'): unknown }, options?: { transaction?: { afterCommit(fn: () => void): void } | null }): void => {
      const id = Number(user.get('id'))
      cache.forgetUser(id)
      options?.transaction?.afterCommit(() => cache.forgetUser(id))
    }
    s.models.User.addHook('afterSave', 'session-cache', forget)
    s.models.User.addHook('afterDestroy', 'session-cache', forget)
    const clear = (options?: { transaction?: { afterCommit(fn: () => void): void } | null }): void => {
      cache.clear()
      options?.transaction?.afterCommit(() => cache.clear())
    }
    s.models.User.addHook('afterBulkUpdate', 'session-cache', clear)
    s.models.User.addHook('afterBulkDestroy', 'session-cache', clear)
  }
  return c
}

import { QueryTypes, type Transaction } from 'sequelize'
import { randomBytes } from 'node:crypto'
import type { Services } from '../services.ts'
import type { User } from '../db/models.ts'
import { hashToken } from './tokens.ts'
import { sessionCache } from './session-cache.ts'

// Server-side sessions (table `sessions`, migration 0007): the cookie carries a random id, the
// table its sha256. Sign-out deletes the row; a password change or reset deletes the others.

/** Creates a session for the user; returns its id (goes into the signed cookie only). */
export async function createSession(s: Services, userId: number, days: number): Promise<string> {
  const id = randomBytes(32).toString('base64url')
  await s.sequelize.query(
    `INSERT INTO sessions (id_hash, user_id, created_at, expires_at) VALUES (:hash, :userId, now(), now() + make_interval(days => :days))`,
    { replacements: { hash: hashToken(id), userId, days }, type: QueryTypes.INSERT },
  )
  // a user's expired sessions go when they sign in again (the table stays small)
  await s.sequelize.query(`DELETE FROM sessions WHERE user_id = :userId AND expires_at < now()`, { replacements: { userId }, type: QueryTypes.DELETE })
  return id
}

export async function deleteSession(s: Services, id: string): Promise<void> {
  sessionCache(s).forgetSession(hashToken(id))
  await s.sequelize.query(`DELETE FROM sessions WHERE id_hash = :hash`, { replacements: { hash: hashToken(id) }, type: QueryTypes.DELETE })
}

/** Ends every session of the user (password reset), or every one but `keep` (password change). */
export async function deleteUserSessions(s: Services, userId: number, keep?: string, transaction?: Transaction): Promise<void> {
  const cache = sessionCache(s)
  cache.forgetUser(userId)
  transaction?.afterCommit(() => cache.forgetUser(userId))
  await s.sequelize.query(
    keep ? `DELETE FROM sessions WHERE user_id = :userId AND id_hash <> :keep` : `DELETE FROM sessions WHERE user_id = :userId`,
    { replacements: { userId, keep: keep ? hashToken(keep) : null }, type: QueryTypes.DELETE, transaction },
  )
}

/**
 * The user of a live session, or null when the session is unknown, expired or another user's: one
 * query, or none within a few seconds of the last one for this session (session-cache.ts). Plain SQL
 * mapped onto the model: this runs on every request, and building the same query through findOne
 * cost more of the API's event loop than the query took in PostgreSQL (CPU profile under load, issue 11).
 */
export async function sessionUser(s: Services, id: string, userId: number): Promise<User | null> {
  const hash = hashToken(id)
  const cache = sessionCache(s)
  const cached = cache.get(hash, userId)
  // a fresh instance each time: a route may change its copy of the user
  if (cached) return s.models.User.build({ ...cached } as never, { isNewRecord: false, raw: true })
  const [user] = await s.sequelize.query(
    `SELECT u.* FROM users u
      WHERE u.id = :userId AND EXISTS (SELECT 1 FROM sessions WHERE id_hash = :hash AND user_id = u.id AND expires_at > now())`,
    { replacements: { userId, hash }, model: s.models.User, mapToModel: true },
  )
  if (user) cache.set(hash, userId, { ...(user.get({ plain: true }) as Record<string, unknown>) })
  return user ?? null
}

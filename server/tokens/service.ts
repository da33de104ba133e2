/**
 * Personal API tokens. A token belongs to one member of one team; requests carrying it act as that
 * member inside that team only (other teams answer 404, account routes 403), and a read-only token
 * may only read. Only its SHA-256 is stored.
 */
import { QueryTypes } from 'sequelize'
import type { Services } from '../services.ts'
import type { User } from '../db/models.ts'
import { ForbiddenError, NotFoundError } from '../errors.ts'
import { hashToken, newToken } from '../auth/tokens.ts'
import { record } from '../audit/service.ts'
import { TOKEN_PREFIX, type ApiTokenItem, type CreateTokenRequest, type CreatedToken } from '../../shared/api/tokens.ts'
import type { Role } from '../../shared/api/common.ts'

interface Row {
  id: number; user_id: number; team_id: number; name: string; read_only: boolean
  created_at: Date; expires_at: Date | null; last_used_at: Date | null; revoked_at: Date | null
}

const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null)
const item = (r: Row): ApiTokenItem => ({
  id: r.id, teamId: r.team_id, name: r.name, readOnly: r.read_only,
  createdAt: iso(r.created_at)!, expiresAt: iso(r.expires_at), lastUsedAt: iso(r.last_used_at), revokedAt: iso(r.revoked_at),
})

/** Creates a token for the user in the team; reviewers get read-only ones whatever they ask. */
export async function createToken(s: Services, user: User, teamId: number, role: Role, req: Required<Pick<CreateTokenRequest, 'name'>> & { readOnly: boolean; expiresInDays: number }): Promise<CreatedToken> {
  const { token, hash } = newToken()
  const readOnly = role === 'reviewer' ? true : req.readOnly
  const [row] = await s.sequelize.query<Row>(
    `INSERT INTO api_tokens (user_id, team_id, name, token_hash, read_only, created_at, expires_at)
     VALUES (:userId, :teamId, :name, :hash, :readOnly, now(), now() + make_interval(days => :days)) RETURNING *`,
    { replacements: { userId: user.id, teamId, name: req.name, hash, readOnly, days: req.expiresInDays }, type: QueryTypes.SELECT },
  )
  await record(s, { teamId, userId: user.id, action: 'token.create', entity: 'api_token', entityId: row!.id, detail: { name: req.name, readOnly } })
  return { ...item(row!), token: `${TOKEN_PREFIX}${token}` }
}

/** The user's tokens in the team (owners see every member's), newest first. */
export async function listTokens(s: Services, user: User, teamId: number, role: Role): Promise<ApiTokenItem[]> {
  const rows = await s.sequelize.query<Row>(
    `SELECT * FROM api_tokens WHERE team_id = :teamId ${role === 'owner' ? '' : 'AND user_id = :userId'} ORDER BY created_at DESC, id DESC`,
    { replacements: { teamId, userId: user.id }, type: QueryTypes.SELECT },
  )
  return rows.map(item)
}

/** Revokes a token of the team: its holder or an owner may. */
export async function revokeToken(s: Services, user: User, teamId: number, role: Role, tokenId: number): Promise<ApiTokenItem> {
  const [row] = await s.sequelize.query<Row>('SELECT * FROM api_tokens WHERE id = :id AND team_id = :teamId', { replacements: { id: tokenId, teamId }, type: QueryTypes.SELECT })
  if (!row) throw new NotFoundError('Token')
  if (row.user_id !== user.id && role !== 'owner') throw new ForbiddenError('Revoking another member\'s token needs the owner role; only its holder or an owner may.')
  const [done] = await s.sequelize.query<Row>('UPDATE api_tokens SET revoked_at = COALESCE(revoked_at, now()) WHERE id = :id RETURNING *', { replacements: { id: tokenId }, type: QueryTypes.SELECT })
  await record(s, { teamId, userId: user.id, action: 'token.revoke', entity: 'api_token', entityId: tokenId, detail: { name: row.name } })
  return item(done!)
}

export interface TokenScope { id: number; teamId: number; readOnly: boolean }

/** The user and scope of a presented token, or null when it is unknown, revoked or expired. */
export async function tokenUser(s: Services, presented: string): Promise<{ user: User; scope: TokenScope } | null> {
  if (!presented.startsWith(TOKEN_PREFIX)) return null
  const [row] = await s.sequelize.query<Row>(
    `UPDATE api_tokens SET last_used_at = now() WHERE token_hash = :hash AND revoked_at IS NULL AND (expires_at IS NULL OR expires_at > now()) RETURNING *`,
    { replacements: { hash: hashToken(presented.slice(TOKEN_PREFIX.length)) }, type: QueryTypes.SELECT },
  )
  if (!row) return null
  const user = await s.models.User.findByPk(row.user_id)
  return user ? { user, scope: { id: row.id, teamId: row.team_id, readOnly: row.read_only } } : null
}

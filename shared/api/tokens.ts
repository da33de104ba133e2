import { z } from 'zod'

// Personal API tokens (scripts and notebooks call the API with `Authorization: Bearer <token>`).

/** POST /api/teams/:teamId/tokens */
export const createTokenRequestSchema = z.object({
  name: z.string().trim().min(1, 'is required').max(80),
  /** Reading only (GET); reviewers always get read-only tokens. */
  readOnly: z.boolean().default(true),
  /** Days until the token stops working (default 90; at most a year). */
  expiresInDays: z.number().int().min(1).max(366).default(90),
})
export type CreateTokenRequest = z.input<typeof createTokenRequestSchema>

export interface ApiTokenItem {
  id: number; teamId: number; name: string; readOnly: boolean
  createdAt: string; expiresAt: string | null; lastUsedAt: string | null; revokedAt: string | null
}

/** The answer to a creation: the token itself, shown this once. */
export interface CreatedToken extends ApiTokenItem { token: string }

/** The prefix of every token, so a leaked one is easy to recognise in a scan. */
export const TOKEN_PREFIX = 'sw_'

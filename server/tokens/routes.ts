import type { Request, Response } from 'express'
import type { Services } from '../services.ts'
import { routeId, scope, signedInUser } from '../guards.ts'
import { createTokenRequestSchema } from '../../shared/api/tokens.ts'
import * as tokens from './service.ts'

export async function create(req: Request, res: Response, s: Services): Promise<void> {
  const input = createTokenRequestSchema.parse(req.body ?? {})
  const sc = scope(res)
  res.status(201).json(await tokens.createToken(s, signedInUser(res), sc.team!.id, sc.membership.role, input))
}

export async function list(_req: Request, res: Response, s: Services): Promise<void> {
  const sc = scope(res)
  res.json(await tokens.listTokens(s, signedInUser(res), sc.team!.id, sc.membership.role))
}

export async function revoke(req: Request, res: Response, s: Services): Promise<void> {
  const sc = scope(res)
  res.json(await tokens.revokeToken(s, signedInUser(res), sc.team!.id, sc.membership.role, routeId(req, 'tokenId', 'Token')))
}

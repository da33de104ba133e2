import type { Request, Response } from 'express'
import type { Services } from '../services.ts'
import type { Membership, Star } from '../db/models.ts'
import { analysisScope } from '../analyses/guards.ts'
import { ForbiddenError, NotFoundError } from '../errors.ts'
import { scope, signedInUser, type Guard } from '../guards.ts'
import { ROLE_RANK, type Role } from '../../shared/api/common.ts'
import type { LimitsRun } from '../../shared/api/limits.ts'
import * as limits from './service.ts'

interface LimitsScope { membership: Membership; star: Star; run: LimitsRun }
const lscope = (res: Response) => res.locals.scope as LimitsScope

/** Detection-limit run :runId of a star in a team where the user has at least `min` (401 → 404 → 403, as server/guards.ts). */
export function limitsRunGuard(min: Role): Guard {
  return async (req, res, s) => {
    const user = signedInUser(res)
    const raw = req.params.runId
    const id = Number(raw)
    if (!Number.isSafeInteger(id) || id <= 0 || String(id) !== raw) throw new NotFoundError('Detection-limit run')
    const run = await limits.loadRun(s, id)
    if (!run) throw new NotFoundError('Detection-limit run')
    const star = await s.models.Star.findOne({ where: { id: run.starId, archivedAt: null } })
    if (!star) throw new NotFoundError('Detection-limit run')
    const membership = await s.models.Membership.findOne({ where: { userId: user.id, teamId: star.teamId } })
    if (!membership) throw new NotFoundError('Detection-limit run')
    if (ROLE_RANK[membership.role] < ROLE_RANK[min]) {
      throw new ForbiddenError(`This needs the ${min} role or higher in the team; you are ${membership.role === 'analyst' ? 'an' : 'a'} ${membership.role}.`)
    }
    res.locals.scope = { membership, star, run } satisfies LimitsScope
  }
}

export async function start(req: Request, res: Response, s: Services): Promise<void> {
  res.status(201).json(await limits.startRun(s, signedInUser(res), scope(res).star!, analysisScope(res).model!, req.body ?? {}))
}

export async function list(_req: Request, res: Response, s: Services): Promise<void> {
  res.json(await limits.listRuns(s, scope(res).star!))
}

export async function show(_req: Request, res: Response): Promise<void> {
  res.json(lscope(res).run)
}

export async function cancel(_req: Request, res: Response, s: Services): Promise<void> {
  const { star, run } = lscope(res)
  res.json(await limits.cancelRun(s, signedInUser(res), star, run))
}

export async function resume(_req: Request, res: Response, s: Services): Promise<void> {
  const { star, run } = lscope(res)
  res.json(await limits.resumeRun(s, signedInUser(res), star, run))
}

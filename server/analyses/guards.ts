import type { Request, Response } from 'express'
import type { Guard, Scope } from '../guards.ts'
import { signedInUser } from '../guards.ts'
import type { Services } from '../services.ts'
import type { Star, User } from '../db/models.ts'
import { analysisModels, type FitModel, type PeriodogramRun } from '../db/models-analysis.ts'
import { ForbiddenError, NotFoundError } from '../errors.ts'
import { ROLE_RANK, type Role } from '../../shared/api/common.ts'

/** What the analysis guards found (res.locals.analysis), beside the usual scope. */
export interface AnalysisScope { model?: FitModel; periodogram?: PeriodogramRun }

export function analysisScope(res: Response): AnalysisScope { return (res.locals.analysis ?? {}) as AnalysisScope }

function idOf(req: Request, name: string, what: string): number {
  const raw = req.params[name]
  const n = Number(raw)
  if (!Number.isSafeInteger(n) || n <= 0 || String(n) !== raw) throw new NotFoundError(what)
  return n
}

// Same order of checks as server/guards.ts: 401 → 404 outside the user's teams → 403 below the role.
async function starScope(s: Services, res: Response, user: User, starId: number, min: Role, what: string): Promise<Star> {
  const st = await s.models.Star.findOne({ where: { id: starId, archivedAt: null } })
  if (!st) throw new NotFoundError(what)
  const m = await s.models.Membership.findOne({ where: { userId: user.id, teamId: st.teamId } })
  if (!m) throw new NotFoundError(what)
  if (ROLE_RANK[m.role] < ROLE_RANK[min]) {
    throw new ForbiddenError(`This needs the ${min} role or higher in the team; you are ${m.role === 'analyst' ? 'an' : 'a'} ${m.role}.`)
  }
  res.locals.scope = { membership: m, star: st } satisfies Scope
  return st
}

/** Fit model :modelId (not archived) of a star in a team where the user has at least `min`. */
export function fitModel(min: Role): Guard {
  return async (req, res, s) => {
    const user = signedInUser(res)
    const model = await analysisModels(s.sequelize, s.models).FitModel.findOne({ where: { id: idOf(req, 'modelId', 'Model'), archivedAt: null } })
    if (!model) throw new NotFoundError('Model')
    await starScope(s, res, user, model.starId, min, 'Model')
    res.locals.analysis = { model } satisfies AnalysisScope
  }
}

/** Periodogram run :periodogramId of a star in a team where the user has at least `min`. */
export function periodogramRun(min: Role): Guard {
  return async (req, res, s) => {
    const user = signedInUser(res)
    const run = await analysisModels(s.sequelize, s.models).PeriodogramRun.findByPk(idOf(req, 'periodogramId', 'Periodogram'), { attributes: ['id', 'starId'] })
    if (!run) throw new NotFoundError('Periodogram')
    await starScope(s, res, user, run.starId, min, 'Periodogram')
    res.locals.analysis = { periodogram: run } satisfies AnalysisScope
  }
}

import type { Request, Response } from 'express'
import type { Guard, Scope } from '../guards.ts'
import { signedInUser } from '../guards.ts'
import { reportModels, type Report } from '../db/models-reports.ts'
import { ForbiddenError, NotFoundError } from '../errors.ts'
import { ROLE_RANK, type Role } from '../../shared/api/common.ts'

export function reportScope(res: Response): Report { return res.locals.report as Report }

/**
 * Report :reportId of a star (not archived) in a team where the user has at least `min`. Same order
 * of checks as server/guards.ts: 401 → 404 outside the user's teams → 403 below the role.
 */
export function report(min: Role): Guard {
  return async (req: Request, res, s) => {
    const user = signedInUser(res)
    const raw = req.params.reportId
    const id = Number(raw)
    if (!Number.isSafeInteger(id) || id <= 0 || String(id) !== raw) throw new NotFoundError('Report')
    const r = await reportModels(s.sequelize, s.models).Report.findByPk(id)
    if (!r) throw new NotFoundError('Report')
    const star = await s.models.Star.findOne({ where: { id: r.starId, archivedAt: null } })
    if (!star) throw new NotFoundError('Report')
    const membership = await s.models.Membership.findOne({ where: { userId: user.id, teamId: star.teamId } })
    if (!membership) throw new NotFoundError('Report')
    if (ROLE_RANK[membership.role] < ROLE_RANK[min]) {
      throw new ForbiddenError(`This needs the ${min} role or higher in the team; you are ${membership.role === 'analyst' ? 'an' : 'a'} ${membership.role}.`)
    }
    res.locals.scope = { membership, star } satisfies Scope
    res.locals.report = r
  }
}

import type { Response } from 'express'
import { resource } from '../guards.ts'
import { reportModels, type Report } from '../db/models-reports.ts'

export function reportScope(res: Response): Report { return res.locals.report as Report }

/** Report :reportId of a star (not archived) in a team where the user has at least `min`. */
export const report = resource<Report>({
  param: 'reportId', what: 'Report', starIdOf: (r) => r.starId,
  load: (s, id) => reportModels(s.sequelize, s.models).Report.findByPk(id),
  keep: (res, r) => { res.locals.report = r },
})

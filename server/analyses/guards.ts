import type { Response } from 'express'
import { resource } from '../guards.ts'
import { analysisModels, type FitModel, type PeriodogramRun } from '../db/models-analysis.ts'

/** What the analysis guards found (res.locals.analysis), beside the usual scope. */
export interface AnalysisScope { model?: FitModel; periodogram?: PeriodogramRun }

export function analysisScope(res: Response): AnalysisScope { return (res.locals.analysis ?? {}) as AnalysisScope }

/** Fit model :modelId (not archived) of a star in a team where the user has at least `min`. */
export const fitModel = resource<FitModel>({
  param: 'modelId', what: 'Model', starIdOf: (m) => m.starId,
  load: (s, id) => analysisModels(s.sequelize, s.models).FitModel.findOne({ where: { id, archivedAt: null } }),
  keep: (res, model) => { res.locals.analysis = { model } satisfies AnalysisScope },
})

/** Periodogram run :periodogramId of a star in a team where the user has at least `min`. */
export const periodogramRun = resource<PeriodogramRun>({
  param: 'periodogramId', what: 'Periodogram', starIdOf: (run) => run.starId,
  load: (s, id) => analysisModels(s.sequelize, s.models).PeriodogramRun.findByPk(id, { attributes: ['id', 'starId'] }),
  keep: (res, periodogram) => { res.locals.analysis = { periodogram } satisfies AnalysisScope },
})

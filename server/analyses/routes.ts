import type { Request, Response } from 'express'
import type { Services } from '../services.ts'
import { routeId, scope, signedInUser } from '../guards.ts'
import {
  periodogramQuerySchema,
  createModelRequestSchema, duplicateModelRequestSchema, fitModelRequestSchema, runPeriodogramRequestSchema,
  searchRequestSchema, updateModelRequestSchema, overruleRequestSchema, gpVariantRequestSchema,
} from '../../shared/api/analyses.ts'
import * as activity from './activity.ts'
import { analysisScope } from './guards.ts'
import * as analyses from './service.ts'
import { compareModels } from './compare.ts'
import { ValidationError } from '../errors.ts'

export async function runPeriodogram(req: Request, res: Response, s: Services): Promise<void> {
  const input = runPeriodogramRequestSchema.parse(req.body)
  res.status(201).json(await analyses.runPeriodogram(s, signedInUser(res), scope(res).star!, input))
}

export async function listPeriodograms(_req: Request, res: Response, s: Services): Promise<void> {
  res.json(await analyses.listPeriodograms(s, scope(res).star!))
}

export async function showPeriodogram(req: Request, res: Response, s: Services): Promise<void> {
  const full = req.query.full
  if (!periodogramQuerySchema.safeParse({ full }).success) {
    throw new ValidationError('full: use full=1 for every computed power, or leave it out for the plot copy.', 'full')
  }
  res.json(await analyses.getPeriodogram(s, analysisScope(res).periodogram!.id, { full: full === '1' || full === 'true' }))
}

export async function listModels(_req: Request, res: Response, s: Services): Promise<void> {
  res.json(await analyses.listModels(s, scope(res).star!))
}

export async function createModel(req: Request, res: Response, s: Services): Promise<void> {
  const input = createModelRequestSchema.parse(req.body)
  res.status(201).json(await analyses.createModel(s, signedInUser(res), scope(res).star!, input))
}

export async function showModel(_req: Request, res: Response, s: Services): Promise<void> {
  res.json(await analyses.modelDetail(s, analysisScope(res).model!.id))
}

export async function showVersion(req: Request, res: Response, s: Services): Promise<void> {
  res.json(await analyses.getVersion(s, analysisScope(res).model!, routeId(req, 'version', 'Model version')))
}

export async function updateModel(req: Request, res: Response, s: Services): Promise<void> {
  const input = updateModelRequestSchema.parse(req.body)
  res.json(await analyses.updateModel(s, signedInUser(res), scope(res).star!, analysisScope(res).model!, input))
}

export async function fitModel(req: Request, res: Response, s: Services): Promise<void> {
  const input = fitModelRequestSchema.parse(req.body ?? {})
  res.json(await analyses.fitModel(s, signedInUser(res), scope(res).star!, analysisScope(res).model!, input))
}

export async function duplicateModel(req: Request, res: Response, s: Services): Promise<void> {
  const input = duplicateModelRequestSchema.parse(req.body ?? {})
  res.status(201).json(await analyses.duplicateModel(s, signedInUser(res), scope(res).star!, analysisScope(res).model!, input))
}

export async function archiveModel(_req: Request, res: Response, s: Services): Promise<void> {
  await analyses.archiveModel(s, signedInUser(res), scope(res).star!, analysisScope(res).model!)
  res.status(204).end()
}

export async function search(req: Request, res: Response, s: Services): Promise<void> {
  const input = searchRequestSchema.parse(req.body ?? {})
  res.status(201).json(await analyses.search(s, signedInUser(res), scope(res).star!, input))
}

export async function compare(_req: Request, res: Response, s: Services): Promise<void> {
  res.json(await compareModels(s, scope(res).star!))
}

export async function overrule(req: Request, res: Response, s: Services): Promise<void> {
  const input = overruleRequestSchema.parse(req.body ?? {})
  res.json(await activity.overrule(s, signedInUser(res), scope(res).star!, analysisScope(res).model!, input))
}

export async function gpVariant(req: Request, res: Response, s: Services): Promise<void> {
  const input = gpVariantRequestSchema.parse(req.body ?? {})
  res.status(201).json(await activity.gpVariant(s, signedInUser(res), scope(res).star!, analysisScope(res).model!, input))
}

import type { Request, Response } from 'express'
import type { Services } from '../services.ts'
import { createStarRequestSchema, updateStarRequestSchema } from '../../shared/api/stars.ts'
import { scope, signedInUser } from '../guards.ts'
import * as stars from './service.ts'
import { NotFoundError } from '../errors.ts'

export async function list(_req: Request, res: Response, s: Services): Promise<void> {
  res.json(await stars.listStars(s, scope(res).team!.id))
}
export async function create(req: Request, res: Response, s: Services): Promise<void> {
  const star = await stars.createStar(s, signedInUser(res), scope(res).team!.id, createStarRequestSchema.parse(req.body))
  res.status(201).json(await stars.starJson(s, star))
}
export async function show(_req: Request, res: Response, s: Services): Promise<void> {
  res.json(await stars.starJson(s, scope(res).star!))
}
export async function update(req: Request, res: Response, s: Services): Promise<void> {
  const star = await stars.updateStar(s, signedInUser(res), scope(res).star!, updateStarRequestSchema.parse(req.body))
  res.json(await stars.starJson(s, star))
}
export async function archive(_req: Request, res: Response, s: Services): Promise<void> {
  await stars.archiveStar(s, signedInUser(res), scope(res).star!)
  res.status(204).end()
}
export async function listArchived(_req: Request, res: Response, s: Services): Promise<void> {
  res.json(await stars.listArchived(s, scope(res).team!.id))
}
export async function restore(req: Request, res: Response, s: Services): Promise<void> {
  const starId = Number(req.params.starId)
  if (!Number.isSafeInteger(starId) || starId <= 0 || String(starId) !== req.params.starId) throw new NotFoundError('Archived star')
  const star = await stars.restoreStar(s, signedInUser(res), scope(res).team!.id, starId)
  res.json(await stars.starJson(s, star))
}

import type { Request, Response } from 'express'
import type { Services } from '../services.ts'
import { deleteDatasetRequestSchema, updateMeasurementRequestSchema } from '../../shared/api/measurements.ts'
import { scope, signedInUser } from '../guards.ts'
import * as measurements from './service.ts'
import * as datasets from './datasets.ts'

export async function list(_req: Request, res: Response, s: Services): Promise<void> {
  res.json(await measurements.listForStar(s, scope(res).star!))
}

export async function update(req: Request, res: Response, s: Services): Promise<void> {
  const input = updateMeasurementRequestSchema.parse(req.body)
  const sc = scope(res)
  res.json(await measurements.setExcluded(s, signedInUser(res), sc.star!, sc.measurement!, input.excluded, input.reason))
}

/** What uses a dataset (shown in the confirmation before deleting it). */
export async function datasetUsage(_req: Request, res: Response, s: Services): Promise<void> {
  const sc = scope(res)
  res.json(await datasets.datasetUsage(s, sc.star!, sc.dataset!))
}

/** Deletes an unused dataset and its measurements (the raw file stays); 409 when something uses it. */
export async function deleteDataset(req: Request, res: Response, s: Services): Promise<void> {
  const input = deleteDatasetRequestSchema.parse(req.body ?? {})
  const sc = scope(res)
  await datasets.deleteDataset(s, signedInUser(res), sc.star!, sc.dataset!, input.reason)
  res.status(204).end()
}

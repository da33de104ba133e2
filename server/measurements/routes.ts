import type { Request, Response } from 'express'
import type { Services } from '../services.ts'
import { updateMeasurementRequestSchema } from '../../shared/api/measurements.ts'
import { scope, signedInUser } from '../guards.ts'
import * as measurements from './service.ts'

export async function list(_req: Request, res: Response, s: Services): Promise<void> {
  res.json(await measurements.listForStar(s, scope(res).star!))
}

export async function update(req: Request, res: Response, s: Services): Promise<void> {
  const input = updateMeasurementRequestSchema.parse(req.body)
  const sc = scope(res)
  res.json(await measurements.setExcluded(s, signedInUser(res), sc.star!, sc.measurement!, input.excluded, input.reason))
}

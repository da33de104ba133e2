import type { Request, Response } from 'express'
import type { Services } from '../services.ts'
import { scope } from '../guards.ts'
import { planFor } from './service.ts'

/** POST /api/stars/:starId/plan — computes (stores nothing), so any member may ask. */
export async function plan(req: Request, res: Response, s: Services): Promise<void> {
  res.json(await planFor(s, scope(res).star!, req.body ?? {}))
}

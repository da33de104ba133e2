import type { Request, Response } from 'express'
import type { Services } from '../services.ts'
import { scope } from '../guards.ts'
import * as audit from './service.ts'

export async function list(_req: Request, res: Response, s: Services): Promise<void> {
  res.json(await audit.list(s, scope(res).team!.id))
}

import type { Request, Response } from 'express'
import type { Services } from '../services.ts'
import type { Membership, Star } from '../db/models.ts'
import { analysisScope } from '../analyses/guards.ts'
import type { SamplingRun } from '../db/models-sampling.ts'
import { ForbiddenError, NotFoundError } from '../errors.ts'
import { scope, signedInUser, type Guard } from '../guards.ts'
import { ROLE_RANK, type Role } from '../../shared/api/common.ts'
import { SAMPLING_DONE_STATES, startSamplingRequestSchema } from '../../shared/api/sampling.ts'
import * as sampling from './service.ts'

interface SamplingScope { membership: Membership; star: Star; run?: SamplingRun }
const sscope = (res: Response) => scope(res) as unknown as SamplingScope

function idOf(req: Request, name: string, what: string): number {
  const raw = req.params[name]
  const n = Number(raw)
  if (!Number.isSafeInteger(n) || n <= 0 || String(n) !== raw) throw new NotFoundError(what)
  return n
}

async function starScope(s: Services, res: Response, starId: number, min: Role, what: string): Promise<{ membership: Membership; star: Star }> {
  const user = signedInUser(res)
  const star = await s.models.Star.findOne({ where: { id: starId, archivedAt: null } })
  if (!star) throw new NotFoundError(what)
  const membership = await s.models.Membership.findOne({ where: { userId: user.id, teamId: star.teamId } })
  if (!membership) throw new NotFoundError(what)
  if (ROLE_RANK[membership.role] < ROLE_RANK[min]) {
    throw new ForbiddenError(`This needs the ${min} role or higher in the team; you are ${membership.role === 'analyst' ? 'an' : 'a'} ${membership.role}.`)
  }
  return { membership, star }
}

/** Sampling run :runId of a star in a team where the user has at least `min`. */
export function samplingRunGuard(min: Role): Guard {
  return async (req, res, s) => {
    signedInUser(res)
    const run = await sampling.loadRun(s, idOf(req, 'runId', 'Sampling run'))
    if (!run) throw new NotFoundError('Sampling run')
    res.locals.scope = { ...(await starScope(s, res, run.starId, min, 'Sampling run')), run } satisfies SamplingScope
  }
}

export async function start(req: Request, res: Response, s: Services): Promise<void> {
  const { star } = sscope(res)
  res.status(201).json(await sampling.startRun(s, signedInUser(res), star, analysisScope(res).model!, startSamplingRequestSchema.parse(req.body ?? {})))
}

export async function list(_req: Request, res: Response, s: Services): Promise<void> {
  res.json(await sampling.listRuns(s, scope(res).star!))
}

export async function show(_req: Request, res: Response): Promise<void> {
  res.json(sampling.runJson(sscope(res).run!))
}

export async function cancel(_req: Request, res: Response, s: Services): Promise<void> {
  const { star, run } = sscope(res)
  res.json(await sampling.cancelRun(s, signedInUser(res), star, run!))
}

/**
 * Server-sent events: `progress` whenever the stored progress or state changes (checked every
 * second), then one `done` when the run has finished, and the stream ends. A comment line every
 * 15 s keeps proxies from closing an idle stream.
 */
export async function events(req: Request, res: Response, s: Services): Promise<void> {
  const runId = sscope(res).run!.id
  res.status(200).set({ 'Content-Type': 'text/event-stream; charset=utf-8', 'Cache-Control': 'no-cache, no-transform', Connection: 'keep-alive', 'X-Accel-Buffering': 'no' })
  res.flushHeaders()
  let closed = false
  req.on('close', () => { closed = true })
  let last = ''
  let quiet = 0
  while (!closed) {
    const run = await sampling.loadRun(s, runId, false)
    if (!run) break
    const ev = sampling.eventJson(run)
    const text = JSON.stringify(ev)
    const done = SAMPLING_DONE_STATES.includes(run.state)
    if (text !== last) { res.write(`event: progress\ndata: ${text}\n\n`); last = text; quiet = 0 }
    if (done) { res.write(`event: done\ndata: ${text}\n\n`); break }
    if (++quiet % 15 === 0) res.write(': still running\n\n')
    await new Promise((r) => setTimeout(r, 1000))
  }
  res.end()
}

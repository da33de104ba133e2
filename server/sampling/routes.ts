import type { Request, Response } from 'express'
import type { Services } from '../services.ts'
import type { Membership, Star } from '../db/models.ts'
import { analysisScope } from '../analyses/guards.ts'
import type { SamplingRun } from '../db/models-sampling.ts'
import { resource, scope, signedInUser } from '../guards.ts'
import { SAMPLING_DONE_STATES, startSamplingRequestSchema, samplingEstimateQuerySchema } from '../../shared/api/sampling.ts'
import { chainCsv } from './chain-csv.ts'
import * as sampling from './service.ts'

interface SamplingScope { membership: Membership; star: Star; run?: SamplingRun }
const sscope = (res: Response) => scope(res) as unknown as SamplingScope

/** Sampling run :runId of a star in a team where the user has at least `min`. */
export const samplingRunGuard = resource<SamplingRun>({
  param: 'runId', what: 'Sampling run', starIdOf: (run) => run.starId,
  load: (s, id) => sampling.loadRun(s, id),
  keep: (res, run) => { sscope(res).run = run },
})

export async function start(req: Request, res: Response, s: Services): Promise<void> {
  const { star } = sscope(res)
  res.status(201).json(await sampling.startRun(s, signedInUser(res), star, analysisScope(res).model!, startSamplingRequestSchema.parse(req.body ?? {})))
}

/** GET /api/models/:modelId/sampling/estimate?walkers&steps&untilConverged: free parameters and expected time before starting. */
export async function estimate(req: Request, res: Response, s: Services): Promise<void> {
  const { star } = sscope(res)
  res.json(await sampling.estimateForModel(s, star, analysisScope(res).model!, samplingEstimateQuerySchema.parse(req.query ?? {})))
}

/** GET /api/sampling/:runId/chain.csv: the kept chain (every walker at every kept step) as CSV. */
export async function chain(_req: Request, res: Response, s: Services): Promise<void> {
  const run = await sampling.loadRunWithInput(s, sscope(res).run!.id)
  const text = await chainCsv(s, run!)
  res.status(200).set({ 'Content-Type': 'text/csv; charset=utf-8', 'Content-Disposition': `attachment; filename="sampling-run-${run!.id}-chain.csv"` }).send(text)
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

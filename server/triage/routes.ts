import type { Request, RequestHandler, Response } from 'express'
import multer from 'multer'
import type { Services } from '../services.ts'
import { ValidationError } from '../errors.ts'
import { middleware, routeId, signedInUser } from '../guards.ts'
import { startTriageRequestSchema, surveyUploadOptionsSchema } from '../../shared/api/survey.ts'
import * as triage from './service.ts'
import { surveyUpload } from './upload.ts'

/** Files of one survey upload at most (each within the ordinary upload's byte limit). */
export const SURVEY_MAX_FILES = 500

const uploaders = new WeakMap<object, RequestHandler>()
/** Multipart reader of the survey upload: like the ordinary upload's, with room for a folder of stars. */
export const surveyFiles = middleware((s) => {
  let m = uploaders.get(s.config)
  if (!m) {
    m = multer({
      storage: multer.memoryStorage(), defParamCharset: 'utf8',
      limits: { fileSize: s.config.upload.maxBytes, files: SURVEY_MAX_FILES, fields: 5, fieldSize: 64 * 1024 },
    }).array('files', SURVEY_MAX_FILES)
    uploaders.set(s.config, m)
  }
  return m
})

const teamIdOf = (req: Request) => routeId(req, 'teamId', 'Team')

/** Fields: files (one per star, or tables with a star column); options (JSON: starMass, starMassErr, starColumn, queue). */
export async function upload(req: Request, res: Response, s: Services): Promise<void> {
  const raw = (req.body as Record<string, unknown> | undefined)?.options
  let options = {}
  if (raw !== undefined && raw !== '') {
    let value: unknown
    try { value = JSON.parse(String(raw)) } catch { throw new ValidationError('The field "options" is not valid JSON.', 'options') }
    const r = surveyUploadOptionsSchema.safeParse(value)
    if (!r.success) { const i = r.error.issues[0]!; throw new ValidationError(`options.${i.path.join('.')}: ${i.message}`, `options.${i.path.join('.')}`) }
    options = r.data
  }
  const files = ((req.files as Express.Multer.File[] | undefined) ?? []).map((f) => ({ originalname: f.originalname, buffer: f.buffer, size: f.size }))
  res.status(201).json(await surveyUpload(s, signedInUser(res), teamIdOf(req), files, options))
}

/** Body: { starIds? } — queue the search of these stars (all active stars when omitted). */
export async function start(req: Request, res: Response, s: Services): Promise<void> {
  const body = startTriageRequestSchema.parse(req.body ?? {})
  res.status(201).json(await triage.queueStars(s, signedInUser(res), teamIdOf(req), body.starIds ?? null, 'request'))
}

export async function table(req: Request, res: Response, s: Services): Promise<void> {
  res.json(await triage.teamTable(s, teamIdOf(req)))
}

export async function queue(req: Request, res: Response, s: Services): Promise<void> {
  res.json(await triage.queueStatus(s, teamIdOf(req)))
}

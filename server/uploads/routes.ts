import type { Request, Response } from 'express'
import type { ZodType } from 'zod'
import type { Services } from '../services.ts'
import { commitMappingsSchema, commitOptionsSchema, previewHintsSchema } from '../../shared/api/uploads.ts'
import { ValidationError } from '../errors.ts'
import { scope, signedInUser } from '../guards.ts'
import * as uploads from './service.ts'

/** A multipart text field holding JSON, validated by `schema`. */
function jsonField<T>(req: Request, name: string, schema: ZodType<T>, fallback?: T): T {
  const raw = (req.body as Record<string, unknown> | undefined)?.[name]
  if (raw === undefined || raw === '') {
    if (fallback !== undefined) return fallback
    throw new ValidationError(`The field "${name}" is required (JSON).`, name)
  }
  let value: unknown
  try { value = JSON.parse(String(raw)) } catch { throw new ValidationError(`The field "${name}" is not valid JSON.`, name) }
  const r = schema.safeParse(value)
  if (!r.success) {
    const issue = r.error.issues[0]!
    const path = [name, ...issue.path.map(String)].join('.')
    throw new ValidationError(`${path}: ${issue.message}`, path)
  }
  return r.data
}

function filesOf(req: Request): uploads.UploadedFile[] {
  return ((req.files as Express.Multer.File[] | undefined) ?? []).map((f) => ({
    originalname: f.originalname, buffer: f.buffer, size: f.size,
  }))
}

/** Fields: files; hints (per file name, for a first look); mappings (per file name: read with the user's mapping as it stands). */
export async function preview(req: Request, res: Response, s: Services): Promise<void> {
  const hints = jsonField(req, 'hints', previewHintsSchema, {})
  const mappings = jsonField(req, 'mappings', commitMappingsSchema, {})
  res.json(await uploads.preview(s, scope(res).star!, filesOf(req), hints, mappings))
}

/** Fields: files; mappings (the confirmed mapping per file name); options (overlap, skipProblemRows, site). */
export async function commit(req: Request, res: Response, s: Services): Promise<void> {
  const mappings = jsonField(req, 'mappings', commitMappingsSchema)
  const options = jsonField(req, 'options', commitOptionsSchema, { overlap: 'cancel', skipProblemRows: false })
  res.status(201).json(await uploads.commit(s, signedInUser(res), scope(res).star!, filesOf(req), mappings, options))
}

export async function listDatasets(_req: Request, res: Response, s: Services): Promise<void> {
  res.json(await uploads.listDatasets(s, scope(res).star!.id))
}

export async function raw(_req: Request, res: Response, s: Services): Promise<void> {
  const file = await uploads.rawFile(s, scope(res).dataset!.rawFileId)
  res.attachment(file.fileName).type('application/octet-stream').send(file.bytes)
}

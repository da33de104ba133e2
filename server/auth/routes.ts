import type { Request, Response } from 'express'
import type { Services } from '../services.ts'
import {
  changePasswordRequestSchema, loginRequestSchema, registerRequestSchema, resetPasswordRequestSchema, resetRequestSchema,
} from '../../shared/api/auth.ts'
import * as auth from './service.ts'
import { CSRF_COOKIE, endSession, issueCsrf, startSession } from './session.ts'
import { signedInUser } from '../guards.ts'

export async function register(req: Request, res: Response, s: Services): Promise<void> {
  const user = await auth.register(s, registerRequestSchema.parse(req.body))
  startSession(s, res, user)
  res.status(201).json({ user: auth.userJson(user) })
}

export async function login(req: Request, res: Response, s: Services): Promise<void> {
  const input = loginRequestSchema.parse(req.body)
  const user = await auth.login(s, input.email, input.password)
  startSession(s, res, user)
  res.json({ user: auth.userJson(user) })
}

export async function logout(_req: Request, res: Response, s: Services): Promise<void> {
  endSession(s, res)
  res.status(204).end()
}

export async function me(req: Request, res: Response, s: Services): Promise<void> {
  issueCsrf(s, res, req.cookies?.[CSRF_COOKIE] as string | undefined)
  res.json(await auth.me(s, signedInUser(res)))
}

export async function changePassword(req: Request, res: Response, s: Services): Promise<void> {
  const input = changePasswordRequestSchema.parse(req.body)
  const user = await auth.changePassword(s, signedInUser(res), input.currentPassword, input.newPassword)
  startSession(s, res, user) // the old token carries the old version; keep this browser signed in
  res.status(204).end()
}

export async function resetRequest(req: Request, res: Response, s: Services): Promise<void> {
  await auth.requestReset(s, resetRequestSchema.parse(req.body).email)
  res.status(202).json({ ok: true })
}

export async function reset(req: Request, res: Response, s: Services): Promise<void> {
  const input = resetPasswordRequestSchema.parse(req.body)
  await auth.resetPassword(s, input.token, input.newPassword)
  res.status(204).end()
}

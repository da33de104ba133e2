import type { Request, Response } from 'express'
import type { Services } from '../services.ts'
import {
  changePasswordRequestSchema, loginRequestSchema, registerRequestSchema, resetPasswordRequestSchema, resetRequestSchema,
} from '../../shared/api/auth.ts'
import * as auth from './service.ts'
import { endSession, issueCsrf, startSession } from './session.ts'
import { deleteUserSessions } from './sessions.ts'
import { signedInUser } from '../guards.ts'

export async function register(req: Request, res: Response, s: Services): Promise<void> {
  const user = await auth.register(s, registerRequestSchema.parse(req.body))
  await startSession(s, res, user)
  res.status(201).json({ user: auth.userJson(user) })
}

export async function login(req: Request, res: Response, s: Services): Promise<void> {
  const input = loginRequestSchema.parse(req.body)
  const user = await auth.login(s, input.email, input.password)
  await startSession(s, res, user)
  res.json({ user: auth.userJson(user) })
}

export async function logout(_req: Request, res: Response, s: Services): Promise<void> {
  await endSession(s, res)
  res.status(204).end()
}

export async function me(_req: Request, res: Response, s: Services): Promise<void> {
  issueCsrf(s, res)
  res.json(await auth.me(s, signedInUser(res)))
}

export async function changePassword(req: Request, res: Response, s: Services): Promise<void> {
  const input = changePasswordRequestSchema.parse(req.body)
  const user = await auth.changePassword(s, signedInUser(res), input.currentPassword, input.newPassword)
  // every session ends (the old cookies carry the old token version); this browser gets a new one
  await deleteUserSessions(s, user.id)
  await startSession(s, res, user)
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

import type { Request, Response } from 'express'
import type { Services } from '../services.ts'
import { createInvitationRequestSchema, createTeamRequestSchema, updateMemberRequestSchema } from '../../shared/api/teams.ts'
import { routeId, scope, signedInUser } from '../guards.ts'
import * as teams from './service.ts'

const param = routeId

export async function list(_req: Request, res: Response, s: Services): Promise<void> {
  res.json(await teams.listTeams(s, signedInUser(res)))
}
export async function create(req: Request, res: Response, s: Services): Promise<void> {
  res.status(201).json(await teams.createTeam(s, signedInUser(res), createTeamRequestSchema.parse(req.body).name))
}
export async function show(_req: Request, res: Response, s: Services): Promise<void> {
  const sc = scope(res)
  res.json(await teams.teamDetail(s, sc.team!, sc.membership.role))
}
export async function updateMember(req: Request, res: Response, s: Services): Promise<void> {
  const { role } = updateMemberRequestSchema.parse(req.body)
  res.json(await teams.changeRole(s, signedInUser(res), scope(res).team!.id, param(req, 'userId', 'Member'), role))
}
export async function removeMember(req: Request, res: Response, s: Services): Promise<void> {
  await teams.removeMember(s, signedInUser(res), scope(res).team!.id, param(req, 'userId', 'Member'))
  res.status(204).end()
}
export async function listInvitations(_req: Request, res: Response, s: Services): Promise<void> {
  res.json(await teams.listInvitations(s, scope(res).team!.id))
}
export async function invite(req: Request, res: Response, s: Services): Promise<void> {
  const input = createInvitationRequestSchema.parse(req.body)
  res.status(201).json(await teams.invite(s, signedInUser(res), scope(res).team!, input.email, input.role))
}
export async function approveInvitation(req: Request, res: Response, s: Services): Promise<void> {
  res.json(await teams.approveInvitation(s, signedInUser(res), scope(res).team!, param(req, 'invitationId', 'Invitation')))
}
export async function revokeInvitation(req: Request, res: Response, s: Services): Promise<void> {
  await teams.revokeInvitation(s, signedInUser(res), scope(res).team!.id, param(req, 'invitationId', 'Invitation'))
  res.status(204).end()
}
export async function showInvitation(req: Request, res: Response, s: Services): Promise<void> {
  res.json(await teams.publicInvitation(s, String(req.params.token)))
}
export async function acceptInvitation(req: Request, res: Response, s: Services): Promise<void> {
  res.json(await teams.acceptInvitation(s, signedInUser(res), String(req.params.token)))
}

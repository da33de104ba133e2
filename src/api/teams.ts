import { request } from './http.ts'
import type { AcceptInvitationResponse, Invitation, InvitationInfo, Member, Role, TeamDetail, TeamSummary } from './types.ts'

export const listTeams = () => request<TeamSummary[]>('/teams')
export const createTeam = (body: { name: string }) => request<TeamSummary>('/teams', { method: 'POST', body })
export const fetchTeam = (teamId: number) => request<TeamDetail>(`/teams/${teamId}`)
export const changeMemberRole = (teamId: number, userId: number, role: Role) =>
  request<Member>(`/teams/${teamId}/members/${userId}`, { method: 'PATCH', body: { role } })
export const removeMember = (teamId: number, userId: number) =>
  request<void>(`/teams/${teamId}/members/${userId}`, { method: 'DELETE' })
export const listInvitations = (teamId: number) => request<Invitation[]>(`/teams/${teamId}/invitations`)
export const createInvitation = (teamId: number, body: { email: string; role: Role }) =>
  request<Invitation>(`/teams/${teamId}/invitations`, { method: 'POST', body })
export const approveInvitation = (teamId: number, id: number) =>
  request<Invitation>(`/teams/${teamId}/invitations/${id}/approve`, { method: 'POST' })
export const deleteInvitation = (teamId: number, id: number) =>
  request<void>(`/teams/${teamId}/invitations/${id}`, { method: 'DELETE' })
export const fetchInvitation = (token: string) => request<InvitationInfo>(`/invitations/${encodeURIComponent(token)}`)
export const acceptInvitation = (token: string) =>
  request<AcceptInvitationResponse>(`/invitations/${encodeURIComponent(token)}/accept`, { method: 'POST' })

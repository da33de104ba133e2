import { defineStore } from 'pinia'
import * as api from '@/api/teams.ts'
import type { Invitation, Role, TeamDetail } from '@/api/types.ts'
import { asyncState, track } from './async-state.ts'

/** The current team's members and invitations. */
export const useTeamsStore = defineStore('teams', () => {
  const team = asyncState<TeamDetail>()
  const invitations = asyncState<Invitation[]>([])
  const action = asyncState<unknown>()

  async function load(teamId: number, withInvitations: boolean) {
    await track(team, () => api.fetchTeam(teamId))
    if (withInvitations) await track(invitations, () => api.listInvitations(teamId))
    else invitations.data = []
  }

  async function changeRole(teamId: number, userId: number, role: Role) {
    await track(action, () => api.changeMemberRole(teamId, userId, role))
    await load(teamId, true)
  }
  async function removeMember(teamId: number, userId: number) {
    await track(action, () => api.removeMember(teamId, userId))
    await load(teamId, true)
  }
  async function invite(teamId: number, email: string, role: Role) {
    const result = await track(action, () => api.createInvitation(teamId, { email, role }))
    await load(teamId, true)
    return result
  }
  async function approveInvitation(teamId: number, id: number) {
    await track(action, () => api.approveInvitation(teamId, id))
    await load(teamId, true)
  }
  async function cancelInvitation(teamId: number, id: number) {
    await track(action, () => api.deleteInvitation(teamId, id))
    await load(teamId, true)
  }

  return { team, invitations, action, load, changeRole, removeMember, invite, approveInvitation, cancelInvitation }
})

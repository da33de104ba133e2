import { defineStore } from 'pinia'
import { requestReset, resetPassword } from '@/api/auth.ts'
import { acceptInvitation, fetchInvitation } from '@/api/teams.ts'
import type { InvitationInfo } from '@/api/types.ts'
import { asyncState, track } from './async-state.ts'

/**
 * What a visitor does before or while joining: asking for a password-reset link, choosing a new
 * password from it, reading and accepting an invitation. Each with its own {data, error, isLoading}.
 */
export const useAccountStore = defineStore('account', () => {
  const resetRequest = asyncState<void>()
  const reset = asyncState<void>()
  const invitation = asyncState<InvitationInfo>()
  const accepting = asyncState<{ teamId: number }>()

  /** True when the link was sent (the error is in `resetRequest.error` otherwise). */
  async function askReset(email: string): Promise<boolean> {
    await track(resetRequest, () => requestReset({ email }))
    return !resetRequest.error
  }
  async function chooseNewPassword(token: string, newPassword: string): Promise<boolean> {
    await track(reset, () => resetPassword({ token, newPassword }))
    return !reset.error
  }
  async function loadInvitation(token: string) {
    invitation.data = null
    return track(invitation, () => fetchInvitation(token))
  }
  async function accept(token: string) {
    return track(accepting, () => acceptInvitation(token))
  }
  return { resetRequest, reset, invitation, accepting, askReset, chooseNewPassword, loadInvitation, accept }
})

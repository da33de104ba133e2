import { z } from 'zod'
import { roleSchema } from './common.ts'
import { emailSchema } from './auth.ts'

export const createTeamRequestSchema = z.object({ name: z.string().trim().min(1, 'is required').max(120, 'must be at most 120 characters') })
export type CreateTeamRequest = z.infer<typeof createTeamRequestSchema>

export const teamSummarySchema = z.object({ id: z.number().int(), name: z.string(), role: roleSchema })
export type TeamSummary = z.infer<typeof teamSummarySchema>
export const teamListResponseSchema = z.array(teamSummarySchema)

export const memberSchema = z.object({ userId: z.number().int(), name: z.string(), email: z.string(), role: roleSchema, joinedAt: z.string() })
export type Member = z.infer<typeof memberSchema>

export const teamDetailSchema = teamSummarySchema.extend({ members: z.array(memberSchema) })
export type TeamDetail = z.infer<typeof teamDetailSchema>

export const updateMemberRequestSchema = z.object({ role: roleSchema })
export type UpdateMemberRequest = z.infer<typeof updateMemberRequestSchema>

export const createInvitationRequestSchema = z.object({ email: emailSchema, role: roleSchema })
export type CreateInvitationRequest = z.infer<typeof createInvitationRequestSchema>

export const invitationSchema = z.object({
  id: z.number().int(), email: z.string(), role: roleSchema, expiresAt: z.string(), acceptedAt: z.string().nullable(),
  /** Requested by an analyst (sharing a report with an outsider): no link is sent until an owner approves. */
  pendingApproval: z.boolean(),
})
export type Invitation = z.infer<typeof invitationSchema>
export const invitationListResponseSchema = z.array(invitationSchema)

export const publicInvitationSchema = z.object({ teamId: z.number().int(), teamName: z.string(), role: roleSchema, email: z.string(), expiresAt: z.string() })
export type PublicInvitation = z.infer<typeof publicInvitationSchema>

export const acceptInvitationResponseSchema = z.object({ teamId: z.number().int(), role: roleSchema })
export type AcceptInvitationResponse = z.infer<typeof acceptInvitationResponseSchema>

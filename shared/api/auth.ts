import { z } from 'zod'
import { roleSchema } from './common.ts'
import { weakPasswordReason } from './password.ts'

/** The one normal form of an e-mail address (the schema below and the sign-in rate limit key on it). */
export const normaliseEmail = (email: string): string => email.trim().toLowerCase()
export const emailSchema = z.string().transform(normaliseEmail).pipe(z.email('must be an e-mail address').max(320, 'must be at most 320 characters'))
export const passwordSchema = z.string().min(10, 'must be at least 10 characters').max(200, 'must be at most 200 characters')
  .superRefine((p, ctx) => { const why = weakPasswordReason(p); if (why) ctx.addIssue({ code: 'custom', message: why }) })

export const registerRequestSchema = z.object({
  email: emailSchema,
  password: passwordSchema,
  name: z.string().trim().min(1, 'is required').max(120, 'must be at most 120 characters'),
  inviteToken: z.string().min(1).optional(),
})
export type RegisterRequest = z.infer<typeof registerRequestSchema>

export const loginRequestSchema = z.object({ email: emailSchema, password: z.string().min(1, 'is required') })
export type LoginRequest = z.infer<typeof loginRequestSchema>

export const changePasswordRequestSchema = z.object({ currentPassword: z.string().min(1, 'is required'), newPassword: passwordSchema })
export type ChangePasswordRequest = z.infer<typeof changePasswordRequestSchema>

export const resetRequestSchema = z.object({ email: emailSchema })
export type ResetRequest = z.infer<typeof resetRequestSchema>

export const resetPasswordRequestSchema = z.object({ token: z.string().min(1, 'is required'), newPassword: passwordSchema })
export type ResetPasswordRequest = z.infer<typeof resetPasswordRequestSchema>

export const userSchema = z.object({ id: z.number().int(), email: z.string(), name: z.string() })
export type User = z.infer<typeof userSchema>

export const membershipSchema = z.object({ teamId: z.number().int(), teamName: z.string(), role: roleSchema })
export type Membership = z.infer<typeof membershipSchema>

export const userResponseSchema = z.object({ user: userSchema })
export type UserResponse = z.infer<typeof userResponseSchema>

export const meResponseSchema = z.object({ user: userSchema, memberships: z.array(membershipSchema) })
export type MeResponse = z.infer<typeof meResponseSchema>

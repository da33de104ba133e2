import { z } from 'zod'

export const roleSchema = z.enum(['owner', 'analyst', 'reviewer'])
export type Role = z.infer<typeof roleSchema>
/** Rank of each role: a higher rank may do everything a lower one may. */
export const ROLE_RANK: Record<Role, number> = { reviewer: 1, analyst: 2, owner: 3 }

export const idParam = z.coerce.number().int().positive()
export const isoDate = z.string()
export const userRefSchema = z.object({ id: z.number().int(), name: z.string() })
export type UserRef = z.infer<typeof userRefSchema>

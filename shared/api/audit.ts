import { z } from 'zod'
import { userRefSchema } from './common.ts'

export const auditEntrySchema = z.object({
  id: z.number().int(),
  at: z.string(),
  user: userRefSchema.nullable(),
  action: z.string(),
  entity: z.string(),
  entityId: z.number().int().nullable(),
  detail: z.unknown(),
})
export type AuditEntry = z.infer<typeof auditEntrySchema>
export const auditListResponseSchema = z.array(auditEntrySchema)

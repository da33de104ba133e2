import { z } from 'zod'

export const healthResponseSchema = z.object({ ok: z.literal(true), version: z.string() })
export type HealthResponse = z.infer<typeof healthResponseSchema>

export const devMailMessageSchema = z.object({
  id: z.string(), to: z.array(z.string()), from: z.string(), subject: z.string(), date: z.string(),
  text: z.string(), html: z.string().optional(),
})
export type DevMailMessage = z.infer<typeof devMailMessageSchema>
export const devMailListResponseSchema = z.array(devMailMessageSchema)

import { z } from 'zod'

export const errorCodeSchema = z.enum(['validation', 'unauthorized', 'forbidden', 'not_found', 'conflict', 'too_large', 'rate_limited', 'unavailable', 'internal'])
export type ErrorCode = z.infer<typeof errorCodeSchema>

/** The one error envelope every failing request returns. */
export const errorBodySchema = z.object({
  error: z.object({
    code: errorCodeSchema,
    message: z.string(),
    field: z.string().optional(),
    details: z.unknown().optional(),
    requestId: z.string().optional(),
  }),
})
export type ErrorBody = z.infer<typeof errorBodySchema>

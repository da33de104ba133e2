import { z } from 'zod'

const optionalNumber = (check: z.ZodNumber) => check.nullable().optional()

export const starFieldsSchema = z.object({
  name: z.string().trim().min(1, 'is required').max(120),
  massMsun: z.number().positive('must be positive').max(300),
  massErrMsun: z.number().min(0, 'must not be negative').max(300),
  radiusRsun: optionalNumber(z.number().positive('must be positive')),
  teffK: optionalNumber(z.number().positive('must be positive').max(100000)),
  luminosityLsun: optionalNumber(z.number().positive('must be positive')),
  raDeg: optionalNumber(z.number().min(0, 'must be in [0, 360)').lt(360, 'must be in [0, 360)')),
  decDeg: optionalNumber(z.number().min(-90, 'must be in [-90, 90]').max(90, 'must be in [-90, 90]')),
  notes: z.string().max(10000).nullable().optional(),
})
export const createStarRequestSchema = starFieldsSchema
export type CreateStarRequest = z.infer<typeof createStarRequestSchema>
export const updateStarRequestSchema = starFieldsSchema.partial()
export type UpdateStarRequest = z.infer<typeof updateStarRequestSchema>

export const starSummarySchema = z.object({
  id: z.number().int(), name: z.string(), massMsun: z.number(), massErrMsun: z.number(),
  nPoints: z.number().int(), instruments: z.array(z.string()), updatedAt: z.string(),
})
export type StarSummary = z.infer<typeof starSummarySchema>
export const starListResponseSchema = z.array(starSummarySchema)

export const starSchema = starSummarySchema.extend({
  teamId: z.number().int(),
  radiusRsun: z.number().nullable(), teffK: z.number().nullable(), luminosityLsun: z.number().nullable(),
  raDeg: z.number().nullable(), decDeg: z.number().nullable(), notes: z.string().nullable(),
  createdAt: z.string(),
})
export type Star = z.infer<typeof starSchema>

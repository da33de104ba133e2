import { z } from 'zod'
import { userRefSchema } from './common.ts'

export const measurementSchema = z.object({
  id: z.number().int(),
  datasetId: z.number().int(),
  instrument: z.string(),
  /** Full Julian date, days. */
  time: z.number(),
  /** m/s */
  rv: z.number(),
  /** m/s */
  error: z.number(),
  indicators: z.record(z.string(), z.number()),
  excluded: z.boolean(),
  excludedReason: z.string().nullable(),
  excludedBy: userRefSchema.nullable(),
  excludedAt: z.string().nullable(),
})
export type Measurement = z.infer<typeof measurementSchema>
export const measurementListResponseSchema = z.array(measurementSchema)

export const updateMeasurementRequestSchema = z.object({
  excluded: z.boolean(),
  reason: z.string().trim().max(500).optional(),
}).refine((v) => !v.excluded || (v.reason !== undefined && v.reason.length > 0), {
  message: 'is required when excluding a point', path: ['reason'],
})
export type UpdateMeasurementRequest = z.infer<typeof updateMeasurementRequestSchema>

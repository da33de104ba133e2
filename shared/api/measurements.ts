import { z } from 'zod'
import { userRefSchema } from './common.ts'

export const measurementSchema = z.object({
  id: z.number().int(),
  datasetId: z.number().int(),
  instrument: z.string(),
  /** Full Julian date, days, on the dataset's time scale (`timeScale`). */
  time: z.number(),
  /**
   * The time scale of the dataset the point belongs to (shared/time `TimeScaleName`: 'bjd_tdb',
   * 'jd_utc', 'hjd_utc', …, 'unknown' when the upload did not record one). The server always sends
   * it; absent (hand-made objects in tests) reads as 'unknown'.
   */
  timeScale: z.string().optional(),
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

/** Body of DELETE /api/datasets/:datasetId (optional reason, kept in the audit log). */
export const deleteDatasetRequestSchema = z.object({ reason: z.string().trim().max(500).optional() })
export type DeleteDatasetRequest = z.infer<typeof deleteDatasetRequestSchema>

/** What uses a dataset's measurements, and whether it may be deleted (nothing uses it). */
export const datasetUsageSchema = z.object({
  datasetId: z.number().int(),
  nMeasurements: z.number().int(),
  modelVersions: z.number().int(),
  samplingRuns: z.number().int(),
  reportVersions: z.number().int(),
  deletable: z.boolean(),
  /** Why it cannot be deleted and what to do instead; null when deletable. */
  reason: z.string().nullable(),
})
export type DatasetUsage = z.infer<typeof datasetUsageSchema>

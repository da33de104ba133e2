import { z } from 'zod'
import { siteSchema } from './stars.ts'

// The next-observation planner (server/plan): request and response of POST /api/stars/:starId/plan.

export const PLAN_DEFAULTS = { days: 28, stepMinutes: 20, count: 10, minSpacingDays: 1 } as const

/** Body of POST /api/stars/:starId/plan. */
export const planRequestSchema = z.object({
  /** A finished sampling run of this star: its posterior draws predict the velocities. */
  samplingRunId: z.number().int().positive(),
  /** The observatory; default the star's default site. */
  site: siteSchema.optional(),
  /** First instant, Julian day UTC (default: now). */
  startJd: z.number().min(2400000, 'must be a full Julian day').max(2600000, 'must be a full Julian day').optional(),
  days: z.number().min(1).max(120).optional(),
  stepMinutes: z.number().int().min(5).max(120).optional(),
  /** The instrument that will observe (its offset draws are included); default the run's first. */
  instrument: z.string().trim().min(1).max(120).optional(),
  /** Error of the new velocity with jitter, m/s; default from the instrument's median error and jitter. */
  noise: z.number().positive().max(10000).optional(),
  count: z.number().int().min(1).max(50).optional(),
  minSpacingDays: z.number().min(0).max(30).optional(),
  sunMaxAltDeg: z.number().min(-90).max(0).optional(),
  minAltDeg: z.number().min(0).max(89).optional(),
  maxAirmass: z.number().min(1.01).max(40).optional(),
  minMoonSeparationDeg: z.number().min(0).max(180).optional(),
})
export type PlanRequest = z.input<typeof planRequestSchema>

export interface PlanRecommendation {
  jdUtc: number; information: number; spread: number; predicted: number; starAltDeg: number; airmass: number
  moonSeparationDeg: number; moonIllumination: number; sunAltDeg: number
}

export interface PlanResponse {
  starId: number
  samplingRunId: number
  instrument: string
  noise: number
  site: z.infer<typeof siteSchema>
  star: { name: string; raDeg: number; decDeg: number }
  window: { startJd: number; endJd: number; stepMinutes: number }
  limits: { sunMaxAltDeg: number; minAltDeg: number; maxAirmass: number; minMoonSeparationDeg: number }
  recommendations: PlanRecommendation[]
  observableCount: number
  warnings: string[]
  timeNote: string
  /** Every instant: observable or not (and why), expected information (nats), star altitude. */
  slots: Array<{ jdUtc: number; observable: boolean; reasons: string[]; information: number; starAltDeg: number }>
  /** The predicted velocity over the window: 16 %, 50 %, 84 % across the posterior draws (m/s). */
  curve: { jd: number[]; lo: number[]; mid: number[]; hi: number[] }
}

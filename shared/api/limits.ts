import { z } from 'zod'
import { userRefSchema } from './common.ts'

// Detection-limit runs (server/limits): request and response bodies of /api/.../limits.

export const limitsStateSchema = z.enum(['queued', 'running', 'succeeded', 'failed', 'cancelled'])
export type LimitsState = z.infer<typeof limitsStateSchema>
export const LIMITS_DONE_STATES: readonly LimitsState[] = ['succeeded', 'failed', 'cancelled']

/** Defaults: 30 periods × 30 masses × 10 phases, circular orbits, the search's 1e-3 FAP, 30 chunks. */
export const LIMITS_DEFAULTS = { periods: 30, masses: 30, phases: 10, chunks: 30, fapThreshold: 1e-3, criterion: 'peak' } as const

const positive = z.number().finite().positive()

/** Body of POST /api/models/:modelId/limits; every field optional. */
export const startLimitsRequestSchema = z.object({
  periods: z.number().int().min(2).max(200).optional(),
  masses: z.number().int().min(2).max(200).optional(),
  phases: z.number().int().min(1).max(100).optional(),
  eccentricities: z.array(z.number().min(0).max(0.95)).min(1).max(10).optional(),
  minPeriod: positive.optional(),
  maxPeriod: positive.optional(),
  minMassEarth: positive.optional(),
  maxMassEarth: positive.optional(),
  criterion: z.enum(['peak', 'power']).optional(),
  fapThreshold: z.number().gt(0).lt(0.5).optional(),
  chunks: z.number().int().min(1).max(1000).optional(),
  seed: z.number().int().min(0).max(2 ** 32 - 1).optional(),
}).superRefine((v, ctx) => {
  if (v.minPeriod !== undefined && v.maxPeriod !== undefined && !(v.maxPeriod > v.minPeriod)) ctx.addIssue({ code: 'custom', path: ['maxPeriod'], message: 'must exceed minPeriod' })
  if (v.minMassEarth !== undefined && v.maxMassEarth !== undefined && !(v.maxMassEarth > v.minMassEarth)) ctx.addIssue({ code: 'custom', path: ['maxMassEarth'], message: 'must exceed minMassEarth' })
  const trials = (v.periods ?? 30) * (v.masses ?? 30) * (v.phases ?? 10) * (v.eccentricities?.length ?? 1)
  if (trials > 400_000) ctx.addIssue({ code: 'custom', path: ['phases'], message: `the grid would hold ${trials} injections; at most 400 000` })
})
export type StartLimitsRequest = z.input<typeof startLimitsRequestSchema>

export interface LimitsSettings {
  periods: number; masses: number; phases: number; eccentricities: number[]
  minPeriod: number | null; maxPeriod: number | null; minMassEarth: number | null; maxMassEarth: number | null
  criterion: 'peak' | 'power'; fapThreshold: number; chunks: number
}

export interface ContourPointJson { period: number; massEarth: number | null; flag: 'inside' | 'below-grid' | 'not-reached' }
export interface LimitsResult {
  periods: number[]
  massesEarth: number[]
  /** Recovered fraction per cell, row per period: fraction[iP][iM]. */
  fraction: number[][]
  perCell: number
  contour50: ContourPointJson[]
  contour90: ContourPointJson[]
  table: Array<{ from: number; to: number; mass50Earth: number | null; mass90Earth: number | null; meanCompleteness: number }>
  /** The known planets of the model (period, M sin i) and the Solar System giants for this star. */
  planets: Array<{ label: string; period: number; massEarth: number }>
  giants: Array<{ name: string; period: number; massEarth: number }>
  level: number
  nPoints: number
  baseline: number
  starMass: number
}

export interface LimitsRun {
  id: number
  starId: number
  modelId: number | null
  modelVersion: number | null
  settings: LimitsSettings
  seed: number
  state: LimitsState
  trials: number
  chunkCount: number
  /** Trials whose chunk has finished, and chunks done / running. */
  progress: { trialsDone: number; chunksDone: number; chunksRunning: number }
  error: string | null
  requestedBy: z.infer<typeof userRefSchema> | null
  createdAt: string
  startedAt: string | null
  finishedAt: string | null
  result: LimitsResult | null
}

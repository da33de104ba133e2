import { z } from 'zod'
import { userRefSchema } from './common.ts'

// Posterior sampling runs (server/sampling): request and response bodies of /api/.../sampling.

export const samplingStateSchema = z.enum(['queued', 'running', 'succeeded', 'failed', 'cancelled'])
export type SamplingState = z.infer<typeof samplingStateSchema>
/** States after which a run never changes again. */
export const SAMPLING_DONE_STATES: readonly SamplingState[] = ['succeeded', 'failed', 'cancelled']

/** Defaults of a run: walkers max(32, 2 × sampled parameters), burn steps / 4, seed drawn at random (and stored). */
export const SAMPLING_DEFAULTS = { walkers: 32, steps: 5000, thin: 1 } as const

/** Body of POST /api/models/:modelId/sampling; every field optional (see SAMPLING_DEFAULTS). */
export const startSamplingRequestSchema = z.object({
  walkers: z.number().int().min(4).max(512).refine((v) => v % 2 === 0, 'must be even').optional(),
  steps: z.number().int().min(20).max(200_000).optional(),
  burn: z.number().int().min(0).optional(),
  thin: z.number().int().min(1).max(1000).optional(),
  seed: z.number().int().min(0).max(2 ** 32 - 1).optional(),
}).superRefine((v, ctx) => {
  const steps = v.steps ?? SAMPLING_DEFAULTS.steps
  const thin = v.thin ?? SAMPLING_DEFAULTS.thin
  if (v.burn !== undefined && v.burn > steps - 4 * thin) ctx.addIssue({ code: 'custom', path: ['burn'], message: `must leave at least ${4 * thin} steps after burn-in (steps ${steps})` })
  if (steps % thin !== 0) ctx.addIssue({ code: 'custom', path: ['thin'], message: 'must divide steps' })
})
export type StartSamplingRequest = z.input<typeof startSamplingRequestSchema>

export const samplingSettingsSchema = z.object({
  walkers: z.number().int(), steps: z.number().int(), burn: z.number().int(), thin: z.number().int(), seed: z.number().int(),
})
export type SamplingSettings = z.infer<typeof samplingSettingsSchema>

export const samplingProgressSchema = z.object({
  stepsDone: z.number().int(),
  stepsTotal: z.number().int(),
  /** Longest integrated autocorrelation time of the chain so far (steps), null until it can be estimated. */
  tau: z.number().nullable(),
  /** Seconds left at the current speed; null before the speed is known. */
  etaSeconds: z.number().nullable(),
  /** Mean acceptance fraction so far. */
  acceptance: z.number().nullable(),
  updatedAt: z.string(),
})
export type SamplingProgress = z.infer<typeof samplingProgressSchema>

export const parameterSummarySchema = z.object({
  name: z.string(), unit: z.string(), median: z.number(), lo: z.number(), hi: z.number(), mean: z.number(), sd: z.number(),
})
export type ParameterSummary = z.infer<typeof parameterSummarySchema>

const nullableNumber = z.number().nullable()
/** The stored result: samplePosterior's output (shared/rv/mcmc.ts) as JSON (non-finite numbers → null). */
export const samplingResultSchema = z.object({
  parameters: z.array(parameterSummarySchema),
  /** Thinned draws for plots: row i is walker[i] at step[i]; columns[j][i] is names[j] of row i. Last column 'ln posterior'. */
  sample: z.object({
    names: z.array(z.string()), units: z.array(z.string()), step: z.array(z.number().int()), walker: z.array(z.number().int()),
    columns: z.array(z.array(nullableNumber)),
  }),
  diagnostics: z.object({
    names: z.array(z.string()), tau: z.array(nullableNumber), nOverTau: z.array(nullableNumber), rhat: z.array(nullableNumber),
    acceptance: z.number(), acceptanceMin: z.number(), acceptanceMax: z.number(), converged: z.boolean(), warnings: z.array(z.string()),
  }),
  settings: z.object({
    seed: z.number(), walkers: z.number().int(), steps: z.number().int(), burn: z.number().int(), thin: z.number().int(),
    stepsDone: z.number().int(), stopped: z.boolean(),
  }),
  start: z.object({ lnPosterior: z.number().nullable(), fitStatus: z.string() }),
})
export type SamplingResult = z.infer<typeof samplingResultSchema>

const runBase = {
  id: z.number().int(),
  starId: z.number().int(),
  modelId: z.number().int().nullable(),
  modelVersionId: z.number().int().nullable(),
  /** Version number of the model the run samples. */
  modelVersion: z.number().int().nullable(),
  settings: samplingSettingsSchema,
  state: samplingStateSchema,
  progress: samplingProgressSchema.nullable(),
  /** Expected wall-clock time from a timing of the likelihood when the run was requested, seconds. */
  estimateSeconds: z.number().nullable(),
  /** Times the run was started by a worker (> 1 after a lost worker: it resumed from its checkpoint). */
  attempts: z.number().int(),
  /** Step of the last checkpoint saved (0 = none). */
  checkpointStep: z.number().int(),
  /** Step the latest attempt resumed from after a lost worker or a restart (null: from the start). */
  resumedFromStep: z.number().int().nullable(),
  error: z.string().nullable(),
  requestedBy: userRefSchema.nullable(),
  createdAt: z.string(),
  startedAt: z.string().nullable(),
  finishedAt: z.string().nullable(),
}

/** GET /api/sampling/:runId, POST responses. `result` is null until succeeded (or a cancelled run's partial result). */
export const samplingRunSchema = z.object({ ...runBase, result: samplingResultSchema.nullable() })
export type SamplingRun = z.infer<typeof samplingRunSchema>

/** Items of GET /api/stars/:starId/sampling (no result; `converged` from it when there is one). */
export const samplingRunSummarySchema = z.object({ ...runBase, converged: z.boolean().nullable() })
export type SamplingRunSummary = z.infer<typeof samplingRunSummarySchema>
export const samplingRunListResponseSchema = z.array(samplingRunSummarySchema)

/** Data of each server-sent event `progress` (and of the final `done` event) on GET /api/sampling/:runId/events. */
export const samplingEventSchema = z.object({
  id: z.number().int(), state: samplingStateSchema, progress: samplingProgressSchema.nullable(), error: z.string().nullable(),
})
export type SamplingEvent = z.infer<typeof samplingEventSchema>

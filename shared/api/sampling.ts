import { z } from 'zod'
import { userRefSchema } from './common.ts'

// Posterior sampling runs (server/sampling): request and response bodies of /api/.../sampling.

export const samplingStateSchema = z.enum(['queued', 'running', 'succeeded', 'failed', 'cancelled'])
export type SamplingState = z.infer<typeof samplingStateSchema>
/** States after which a run never changes again. */
export const SAMPLING_DONE_STATES: readonly SamplingState[] = ['succeeded', 'failed', 'cancelled']

/**
 * Defaults of a run: walkers max(32, 2 × free parameters), run until converged (N > 50 τ and
 * split-R̂ < 1.01 for every free parameter) within a budget of 100 000 steps, burn-in a quarter of
 * the steps done, seed drawn at random (and stored). A fixed-length run (`untilConverged: false`)
 * defaults to 5000 steps.
 */
export const SAMPLING_DEFAULTS = { walkers: 32, steps: 100_000, fixedSteps: 5000, thin: 1, untilConverged: true } as const
/** Limits of a request (the launcher's form takes its limits and messages from here). */
export const SAMPLING_LIMITS = { walkersMin: 4, walkersMax: 512, stepsMin: 20, stepsMax: 200_000, thinMax: 1000, seedMax: 2 ** 32 - 1, ensemblesMax: 16 } as const

/** Body of POST /api/models/:modelId/sampling; every field optional (see SAMPLING_DEFAULTS). */
export const startSamplingRequestSchema = z.object({
  walkers: z.number().int().min(SAMPLING_LIMITS.walkersMin).max(SAMPLING_LIMITS.walkersMax).refine((v) => v % 2 === 0, 'must be even').optional(),
  /** The budget when `untilConverged` (default), else the run's length. */
  steps: z.number().int().min(SAMPLING_LIMITS.stepsMin).max(SAMPLING_LIMITS.stepsMax).optional(),
  untilConverged: z.boolean().optional(),
  burn: z.number().int().min(0).optional(),
  thin: z.number().int().min(1).max(SAMPLING_LIMITS.thinMax).optional(),
  seed: z.number().int().min(0).max(SAMPLING_LIMITS.seedMax).optional(),
  /** Independent ensembles on as many workers (parallel mode, merged when they agree); 1 by default, at most the workers seen. */
  ensembles: z.number().int().min(1).max(SAMPLING_LIMITS.ensemblesMax).optional(),
}).superRefine((v, ctx) => {
  const steps = v.steps ?? (v.untilConverged === false ? SAMPLING_DEFAULTS.fixedSteps : SAMPLING_DEFAULTS.steps)
  const thin = v.thin ?? SAMPLING_DEFAULTS.thin
  if (v.burn !== undefined && v.burn > steps - 4 * thin) ctx.addIssue({ code: 'custom', path: ['burn'], message: `must leave at least ${4 * thin} steps after burn-in (steps ${steps})` })
  if (steps % thin !== 0) ctx.addIssue({ code: 'custom', path: ['thin'], message: 'must divide steps' })
})
export type StartSamplingRequest = z.input<typeof startSamplingRequestSchema>

/** Query of GET /api/models/:modelId/sampling/estimate (the launcher's settings, as text). */
export const samplingEstimateQuerySchema = z.object({
  walkers: z.coerce.number().int().min(SAMPLING_LIMITS.walkersMin).max(SAMPLING_LIMITS.walkersMax).optional(),
  steps: z.coerce.number().int().min(SAMPLING_LIMITS.stepsMin).max(SAMPLING_LIMITS.stepsMax).optional(),
  untilConverged: z.enum(['true', 'false']).transform((v) => v === 'true').optional(),
  ensembles: z.coerce.number().int().min(1).max(SAMPLING_LIMITS.ensemblesMax).optional(),
})

/** GET /api/models/:modelId/sampling/estimate → what a run would sample and how long it would take. */
export const samplingEstimateSchema = z.object({
  /** Free (sampled) parameters: the model's fixed ones are not counted. */
  nDim: z.number().int(), names: z.array(z.string()), walkers: z.number().int(),
  steps: z.number().int(),
  /** Steps expected to reach convergence (burn-in + 50 τ with τ ≈ 13 steps per free parameter; a guide). */
  expectedSteps: z.number().int(),
  /** Seconds for the expected steps and for the whole budget. */
  seconds: z.number(), maxSeconds: z.number(),
  /** Job workers connected now (slots: runs they take at once): the most ensembles a parallel run can use. */
  workers: z.number().int().optional(),
  /** Ensembles the estimate is for (steps and seconds are per ensemble, run side by side). */
  ensembles: z.number().int().optional(),
})
export type SamplingEstimate = z.infer<typeof samplingEstimateSchema>

export const samplingSettingsSchema = z.object({
  /** `burn` null: a quarter of the steps done. `untilConverged` absent on runs made before it existed (fixed length). */
  walkers: z.number().int(), steps: z.number().int(), burn: z.number().int().nullable(), thin: z.number().int(), seed: z.number().int(),
  untilConverged: z.boolean().optional(),
  /** Parallel mode: the run is K ensembles (K > 1), each its own run on the queue, merged by this one. */
  ensembles: z.number().int().optional(),
  /** Set on each ensemble of a parallel run: the run it belongs to, its place (0-based) and K. */
  ensemble: z.object({ of: z.number().int(), index: z.number().int(), count: z.number().int() }).optional(),
})
export type SamplingSettings = z.infer<typeof samplingSettingsSchema>

export const samplingProgressSchema = z.object({
  stepsDone: z.number().int(),
  /** The budget (or the fixed length). */
  stepsTotal: z.number().int(),
  /** Longest integrated autocorrelation time of the chain so far (steps), null until it can be estimated. */
  tau: z.number().nullable(),
  /** Least N/τ and largest split-R̂ of the latest convergence check (the rule: > 50 and < 1.01). */
  minNOverTau: z.number().nullable().optional(),
  maxRhat: z.number().nullable().optional(),
  /** Steps the run is expected to need (burn-in + 50 τ from the latest τ), null before it is known. */
  expectedSteps: z.number().int().nullable().optional(),
  /** Seconds left at the current speed; null before the speed is known. */
  etaSeconds: z.number().nullable(),
  /** Mean acceptance fraction so far. */
  acceptance: z.number().nullable(),
  updatedAt: z.string(),
  /** Parallel mode: each ensemble's own progress (run id, state, steps done, acceptance). */
  ensembles: z.array(z.object({
    index: z.number().int(), runId: z.number().int(), state: samplingStateSchema, stepsDone: z.number().int(),
    acceptance: z.number().nullable(), attempts: z.number().int(),
  })).optional(),
})
export type SamplingProgress = z.infer<typeof samplingProgressSchema>

export const parameterSummarySchema = z.object({
  name: z.string(), unit: z.string(), median: z.number(), lo: z.number(), hi: z.number(), mean: z.number(), sd: z.number(),
  /** Held fixed by the model: median = lo = hi = its value. */
  fixed: z.boolean().optional(),
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
    /** Runs made before these existed lack them. */
    untilConverged: z.boolean().optional(), keptThin: z.number().int().optional(), keptRows: z.number().int().optional(),
    rhatGroups: z.number().int().optional(), fixed: z.array(z.array(z.string())).optional(),
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

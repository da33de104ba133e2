import { z } from 'zod'
import { userRefSchema, type UserRef } from './common.ts'
import type { CompareRow, DataSelection, FitResultJson, ModelSpec, PeriodogramPeak } from './analyses.ts'
import type { LimitsResult, LimitsSettings } from './limits.ts'

// Reports: frozen solutions (immutable versions), sharing with co-authors, comments and approvals.
// Browser-safe. Units: days, m/s, degrees; times full JD.

/** POST /api/models/:modelId/report — freezes the model's current fitted version (and optionally a sampling run of it). */
export const freezeRequestSchema = z.object({
  /** A succeeded sampling run of this model version, whose credible intervals enter the report. */
  samplingRunId: z.number().int().positive().optional(),
  /** A succeeded detection-limit run of this star, whose completeness map and table enter the report. */
  limitsRunId: z.number().int().positive().optional(),
  title: z.string().trim().min(1).max(200).optional(),
})
export type FreezeRequest = z.infer<typeof freezeRequestSchema>

/** POST /api/reports/:reportId/shares — a team member by id, or an e-mail address (invited as a reviewer when not in the team). */
export const shareRequestSchema = z.object({
  userId: z.number().int().positive().optional(),
  email: z.string().trim().toLowerCase().email('must be an e-mail address').max(320).optional(),
  message: z.string().trim().max(2000).optional(),
}).superRefine((v, ctx) => {
  if ((v.userId === undefined) === (v.email === undefined)) ctx.addIssue({ code: 'custom', path: ['userId'], message: 'give exactly one of userId or email' })
})
export type ShareRequest = z.infer<typeof shareRequestSchema>

export const reviewKindSchema = z.enum(['comment', 'approve', 'request_changes'])
export type ReviewKind = z.infer<typeof reviewKindSchema>

/** POST /api/reports/:reportId/reviews */
export const reviewRequestSchema = z.object({
  version: z.number().int().positive(),
  kind: reviewKindSchema,
  /** A parameter the comment is about, e.g. "b.K" or "HARPS.jitter"; absent: the report as a whole. */
  parameter: z.string().trim().min(1).max(80).optional(),
  body: z.string().trim().max(5000).default(''),
}).superRefine((v, ctx) => {
  if (v.kind !== 'approve' && !v.body) ctx.addIssue({ code: 'custom', path: ['body'], message: 'is required for a comment or a change request' })
})
export type ReviewRequest = z.input<typeof reviewRequestSchema>

// ---------------------------------------------------------------------------------------------
// The frozen snapshot (stored as JSONB, never rewritten)

export interface SnapshotPoint {
  id: number; instrument: string; time: number; rv: number; error: number
  /** Used by the fit (false: excluded, or not in the fitted instruments). */
  included: boolean
  model: number | null; residual: number | null
}
export interface SnapshotExclusion { id: number; instrument: string; time: number; reason: string | null; by: UserRef | null; at: string | null }
export interface SnapshotPeriodogram {
  id: number; kind: string; settings: { minPeriod: number; maxPeriod: number; oversample: number; instruments: string[] | null }
  data: DataSelection; curve: { period: number[]; power: number[] }; fapLevels: Array<{ fap: number; power: number }>
  peaks: Array<Omit<PeriodogramPeak, 'aliases'>>; createdAt: string
}
/** A posterior summary (median and 16th/84th percentiles), as the sampling results give it. */
export interface PosteriorSummary { name: string; unit: string; median: number; lo: number; hi: number; mean: number; sd: number }
/**
 * The run as it went: `steps` done, the burn-in and thinning it used; `untilConverged` and the step
 * `budget` when it ran until converged (absent on older versions).
 */
export interface SamplingSettingsSnapshot { walkers: number; steps: number; burn: number; thin: number; seed: number; untilConverged?: boolean; budget?: number }
export interface SnapshotSampling {
  runId: number; settings: SamplingSettingsSnapshot; parameters: PosteriorSummary[]
  diagnostics: { converged: boolean; acceptance: number; warnings: string[] }
  /** Thinned draws (≤ 1500) of the planets' P, K, e for the corner plot: names[j] ↔ columns[j]. */
  corner: { names: string[]; units: string[]; columns: number[][] }
  /**
   * The posterior itself: thinned draws (≤ 2000 rows: every walker at evenly spaced steps after
   * burn-in) of every parameter the run sampled or derived, and ln posterior; row i is walker[i]
   * at step[i]; names[j] ↔ columns[j]. Parameters the model held fixed are listed in `fixed`, not
   * in the columns. Absent on versions frozen before it was kept.
   */
  samples?: { names: string[]; units: string[]; step: number[]; walker: number[]; columns: number[][]; fixed: string[] }
  finishedAt: string | null
}
export interface ReportSnapshot {
  format: 'starsway-report/1'
  title: string
  frozenAt: string
  frozenBy: UserRef
  product: { name: 'Starsway'; version: string; commit: string | null }
  star: { id: number; name: string; massMsun: number; massErrMsun: number; radiusRsun: number | null; teffK: number | null; luminosityLsun: number | null; raDeg: number | null; decDeg: number | null }
  model: { id: number; name: string; version: number; versionId: number; spec: ModelSpec; note: string; author: UserRef | null; createdAt: string }
  result: FitResultJson
  data: {
    /** SHA-256 of the included measurements (id, time, rv, error) and the exclusions with reasons (shared/report/hash.ts). */
    hash: string
    nIncluded: number; nExcluded: number; instruments: string[]
    /** The data used by the fit no longer match the star's current data (points excluded or restored since the fit). */
    changedSinceFit: boolean
    /** Time scale of the stored times ('tdb' barycentric, 'utc', 'tt', 'hjd'); absent in versions frozen before it was recorded. */
    timeScale?: string | null
    points: SnapshotPoint[]
    exclusions: SnapshotExclusion[]
  }
  periodogram: SnapshotPeriodogram | null
  residualPeriodogram: SnapshotPeriodogram | null
  sampling: SnapshotSampling | null
  /** The detection-limit run chosen at freezing (absent in versions frozen before limits could be included). */
  limits?: SnapshotLimits | null
  comparison: { rows: Array<Pick<CompareRow, 'modelId' | 'name' | 'version' | 'planets' | 'trend' | 'bic' | 'deltaBic' | 'evidence' | 'preferred' | 'comparable'>>; rule: string; reading: string } | null
  settings: { fit: { trend: string; instruments: string[] | null; iterations: number; status: string }; sampling: SamplingSettingsSnapshot | null }
  methods: { text: string; references: Array<{ key: string; citation: string }> }
}

/** A finished detection-limit run as frozen in a report (server/reports/limits-page.ts). */
export interface SnapshotLimits {
  runId: number; seed: number; settings: LimitsSettings; modelId: number | null; modelVersion: number | null; finishedAt: string | null
  result: LimitsResult
  /** The non-detection statement (shared/report/limits.ts nonDetectionSentence). */
  sentence: string
}

export interface SnapshotChange { field: string; from: string; to: string }

// ---------------------------------------------------------------------------------------------
// Responses

export const reviewSchema = z.object({
  id: z.number().int(), version: z.number().int(), kind: reviewKindSchema, parameter: z.string().nullable(), body: z.string(),
  user: userRefSchema.nullable(), createdAt: z.string(),
})
export type Review = z.infer<typeof reviewSchema>

export const shareSchema = z.object({
  id: z.number().int(), user: userRefSchema.nullable(), email: z.string(), invited: z.boolean(),
  sharedBy: userRefSchema.nullable(), version: z.number().int(), createdAt: z.string(),
})
export type Share = z.infer<typeof shareSchema>

export const approvalSchema = z.object({
  version: z.number().int(), user: userRefSchema, decision: z.enum(['approve', 'request_changes']), at: z.string(),
})
export type Approval = z.infer<typeof approvalSchema>

export const reportVersionItemSchema = z.object({
  id: z.number().int(), version: z.number().int(), modelVersion: z.number().int(), dataHash: z.string(),
  samplingRunId: z.number().int().nullable(), frozenBy: userRefSchema.nullable(), createdAt: z.string(),
  /** What differs from the previous version (empty for version 1). */
  changes: z.array(z.object({ field: z.string(), from: z.string(), to: z.string() })),
  /** Latest decision of each reviewer on this version. */
  approvals: z.array(approvalSchema),
})
export type ReportVersionItem = z.infer<typeof reportVersionItemSchema>

export interface ReportDetail {
  id: number; teamId: number; starId: number; starName: string; modelId: number; title: string; currentVersion: number
  createdBy: UserRef | null; createdAt: string
  /** true on POST when a new version was frozen (false: nothing changed since the latest one). */
  created?: boolean
  versions: ReportVersionItem[]
  shares: Share[]
  reviews: Review[]
  /** What the caller may do. */
  can: { freeze: boolean; share: boolean; review: boolean; approve: boolean }
}

export interface ReportVersion {
  reportId: number; version: number; snapshot: ReportSnapshot; changes: SnapshotChange[]; createdAt: string
}

export interface ReportSummary {
  id: number; modelId: number; title: string; currentVersion: number; createdBy: UserRef | null; updatedAt: string
  approvedVersions: number[]
}

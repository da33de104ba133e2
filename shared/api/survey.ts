import { z } from 'zod'

// Survey triage (server/triage): request and response bodies of /api/teams/:teamId/survey….

/** Body of POST /api/teams/:teamId/survey/runs: the stars to search again (all the team's active stars when omitted). */
export const startTriageRequestSchema = z.object({
  starIds: z.array(z.number().int().positive()).min(1).max(5000).optional(),
}).strict()
export type StartTriageRequest = z.infer<typeof startTriageRequestSchema>

/** Multipart field `options` of POST /api/teams/:teamId/survey/upload. */
export const surveyUploadOptionsSchema = z.object({
  /** Mass (M☉) and its error for stars created by this upload that do not give one in a header line. */
  starMass: z.number().positive('must be positive').max(300).optional(),
  starMassErr: z.number().min(0, 'must not be negative').max(300).optional(),
  /** Column naming the star in a table holding several stars (default: found by its header, e.g. "star"). */
  starColumn: z.string().min(1).max(100).optional(),
  /** Queue the automatic search for every star that received data (default true). */
  queue: z.boolean().optional(),
}).strict()
export type SurveyUploadOptions = z.infer<typeof surveyUploadOptionsSchema>

export type TriageState = 'queued' | 'running' | 'done' | 'failed'

/** What the automatic search found for one star (server/triage/summary.ts). */
export interface TriageSummary {
  points: number
  instruments: number
  /** Last minus first time of the points searched (d). */
  baseline: number
  /** Strongest GLS peak of the velocities (no planet): period (d) and its analytic false-alarm probability. */
  strongestPeriod: number | null
  strongestFap: number | null
  /** BIC of the model without a planet minus BIC with the first Keplerian (positive favours the Keplerian); null if none could be fitted. */
  deltaBic: number | null
  /** False-alarm probability of the first Keplerian's likelihood gain over the periods searched. */
  keplerianFap: number | null
  /** Signals the search kept in its fit (planets and activity-labelled signals). */
  candidates: number
  /** Of those, counted as planets (activity-labelled ones are not). */
  planets: number
  /** Some kept signal is labelled an activity candidate by the indicators. */
  activity: boolean
  /** Whether indicators were present to vet the signals. */
  indicators: string[]
  trend: string
  signals: Array<{ period: number; K: number; e: number; activity: boolean }>
  /** Rejections and warnings of the search, readable. */
  flags: string[]
}

export interface TriageRow {
  starId: number
  starName: string
  resultId: number
  runId: number
  state: TriageState
  attempts: number
  error: string | null
  summary: TriageSummary | null
  queuedAt: string
  finishedAt: string | null
}

export interface TriageQueueStatus {
  /** Jobs waiting (queued rows of the team… and of the whole queue). */
  queued: number
  running: number
  queueDepth: number
  /** Stars finished in the last hour (whole queue) and per minute over that hour. */
  doneLastHour: number
  perMinute: number
  failedLastHour: number
  /** Worker processes seen working on triage jobs in the last 10 minutes. */
  workers: Array<{ id: string; lastSeen: string; jobs: number }>
}

export interface SurveyUploadFile {
  fileName: string
  star: string
  status: 'stored' | 'refused'
  message: string
  measurements: number
}

export interface SurveyUploadResponse {
  files: SurveyUploadFile[]
  stars: Array<{ id: number; name: string; created: boolean }>
  runId: number | null
  queued: number
}

export interface StartTriageResponse { runId: number; queued: number }

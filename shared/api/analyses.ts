import { z } from 'zod'
import { userRefSchema } from './common.ts'

// Saved analyses of a star: periodogram runs, fit models (versioned), the automatic search and the
// model comparison. Browser-safe. Units: days, m/s, degrees at this edge; times full JD.

const positive = (what = 'must be positive') => z.number().finite().positive(what)
const instrumentsSchema = z.array(z.string().trim().min(1).max(120)).min(1, 'must list at least one instrument').max(50)

// ---------------------------------------------------------------------------------------------
// Periodograms

export const periodogramKindSchema = z.enum(['rv', 'indicator', 'residuals'])
export type PeriodogramKind = z.infer<typeof periodogramKindSchema>

/** POST /api/stars/:starId/periodograms */
export const runPeriodogramRequestSchema = z.object({
  kind: periodogramKindSchema,
  /** Name of the activity indicator (a key of measurement.indicators); required for kind 'indicator'. */
  indicator: z.string().trim().min(1).max(120).optional(),
  /** A fitted model version of this star; required for kind 'residuals'. */
  modelVersionId: z.number().int().positive().optional(),
  /** Days; default of the core's grid: 0.5 d (0.2 d for dense nightly sampling). */
  minPeriod: positive().optional(),
  /** Days; default 5 × the baseline of the data. */
  maxPeriod: positive().optional(),
  /** Grid step 1/(oversample · baseline); default 10. */
  oversample: z.number().finite().min(1, 'must be at least 1').max(100, 'must be at most 100').optional(),
  /** Only these instruments (default: all). Excluded points are always left out. */
  instruments: instrumentsSchema.optional(),
}).superRefine((v, ctx) => {
  if (v.kind === 'indicator' && !v.indicator) ctx.addIssue({ code: 'custom', path: ['indicator'], message: 'is required for an indicator periodogram' })
  if (v.kind === 'residuals' && v.modelVersionId === undefined) ctx.addIssue({ code: 'custom', path: ['modelVersionId'], message: 'is required for a residual periodogram' })
  if (v.minPeriod !== undefined && v.maxPeriod !== undefined && !(v.minPeriod < v.maxPeriod)) {
    ctx.addIssue({ code: 'custom', path: ['maxPeriod'], message: 'must be larger than minPeriod' })
  }
})
export type RunPeriodogramRequest = z.infer<typeof runPeriodogramRequestSchema>

/** Which data went in: exclusions are always honoured; `hash` is a SHA-256 of the ids and values used. */
export const dataSelectionSchema = z.object({
  instruments: z.array(z.string()),
  nPoints: z.number().int(),
  /** Points of the selected instruments left out because they are excluded. */
  nExcluded: z.number().int(),
  hash: z.string(),
  firstTime: z.number(),
  lastTime: z.number(),
  /** Days. */
  baseline: z.number(),
})
export type DataSelection = z.infer<typeof dataSelectionSchema>

export const aliasSchema = z.object({
  period: z.number(), frequency: z.number(),
  /** '1 solar day', '1 sidereal day', '1 synodic month', '1 year' */
  source: z.string(),
  windowPower: z.number(), power: z.number(),
})
export const peakSchema = z.object({
  period: z.number(), frequency: z.number(), power: z.number(),
  /** Baluev (2008) false-alarm probability. */
  fap: z.number(),
  aliases: z.array(aliasSchema),
})
export type PeriodogramPeak = z.infer<typeof peakSchema>

/** A curve for plotting: parallel arrays, increasing period. */
export const curveSchema = z.object({ period: z.array(z.number()), power: z.array(z.number()) })
export type Curve = z.infer<typeof curveSchema>

export const periodogramResultSchema = z.object({
  grid: z.object({ minFrequency: z.number(), maxFrequency: z.number(), count: z.number().int(), method: z.enum(['direct', 'fast']) }),
  /** Down-sampled to ≤ 4000 points: the minimum and maximum of each of ≤ 2000 equal bins of the grid (so every peak's top is kept). */
  curve: curveSchema,
  window: curveSchema,
  /** Highest local maxima of the spectral window (period, power 0…1). */
  windowPeaks: z.array(z.object({ period: z.number(), power: z.number() })),
  /** Up to 10 highest peaks, by power. */
  peaks: z.array(peakSchema),
  /** Powers at which the FAP is 10 %, 1 %, 0.1 %. */
  fapLevels: z.array(z.object({ fap: z.number(), power: z.number() })),
  downsampling: z.string(),
  /**
   * The Keplerian periodogram over the same range (velocities only): Δχ²/χ²(offsets only) with
   * e, the periastron phase and one offset per instrument fitted at every period; the search's statistic.
   */
  keplerian: z.object({
    curve: curveSchema,
    peaks: z.array(z.object({ period: z.number(), frequency: z.number(), power: z.number(), dchi2: z.number(), e: z.number() })),
    count: z.number().int(), oversample: z.number(),
    cells: z.array(z.object({ e: z.number(), minPeriod: z.number() })),
  }).nullable().optional(),
})
export type PeriodogramResult = z.infer<typeof periodogramResultSchema>

export const periodogramSettingsSchema = z.object({
  minPeriod: z.number(), maxPeriod: z.number(), oversample: z.number(), instruments: z.array(z.string()).nullable(),
})

const periodogramBase = {
  id: z.number().int(), starId: z.number().int(), kind: periodogramKindSchema,
  indicator: z.string().nullable(), modelVersionId: z.number().int().nullable(),
  settings: periodogramSettingsSchema, data: dataSelectionSchema,
  createdBy: userRefSchema.nullable(), createdAt: z.string(),
}
export const periodogramRunSchema = z.object({ ...periodogramBase, result: periodogramResultSchema })
export type PeriodogramRun = z.infer<typeof periodogramRunSchema>
/** Items of GET /api/stars/:starId/periodograms (newest first): no curves. */
export const periodogramSummarySchema = z.object({ ...periodogramBase, topPeak: peakSchema.omit({ aliases: true }).nullable() })
export type PeriodogramSummary = z.infer<typeof periodogramSummarySchema>
/** GET /api/periodograms/:id query: `full=1` (or `true`) for every computed power; absent: the plot copy. */
export const periodogramQuerySchema = z.object({ full: z.enum(['0', '1', 'true', 'false']).optional() })
export const periodogramListResponseSchema = z.array(periodogramSummarySchema)

// ---------------------------------------------------------------------------------------------
// Fit models

export const planetParamSchema = z.enum(['period', 'K', 'e', 'omegaDeg', 'tc', 'tp'])
export type PlanetParamName = z.infer<typeof planetParamSchema>
export const trendSchema = z.enum(['none', 'linear', 'quadratic'])
export type Trend = z.infer<typeof trendSchema>

export const priorSpecSchema = z.object({
  param: planetParamSchema,
  gaussian: z.object({ mu: z.number().finite(), sigma: positive() }).optional(),
  uniform: z.object({ min: z.number().finite(), max: z.number().finite() }).optional(),
}).superRefine((v, ctx) => {
  if (!v.gaussian === !v.uniform) ctx.addIssue({ code: 'custom', path: ['gaussian'], message: 'give exactly one of gaussian or uniform' })
  if (v.uniform && !(v.uniform.min < v.uniform.max)) ctx.addIssue({ code: 'custom', path: ['uniform', 'max'], message: 'must be larger than min' })
})
export type PriorSpec = z.infer<typeof priorSpecSchema>

/**
 * Start (or fixed) values of one planet. Only the period is required: without K or a phase (tc or
 * tp; tc wins), K, e, ω and the phase are taken from a scan of the data at that period.
 */
export const planetSpecSchema = z.object({
  period: positive(),
  K: z.number().finite().min(0, 'must not be negative').optional(),
  e: z.number().min(0, 'must be in [0, 0.99)').lt(0.99, 'must be in [0, 0.99)').optional(),
  omegaDeg: z.number().finite().optional(),
  tc: z.number().finite().optional(),
  tp: z.number().finite().optional(),
  fix: z.array(planetParamSchema).optional(),
  priors: z.array(priorSpecSchema).max(6).optional(),
})
export type PlanetSpec = z.infer<typeof planetSpecSchema>

/**
 * The noise model of a fit: white noise (the quoted errors plus one jitter per instrument) or a
 * Gaussian process for correlated stellar noise on top of it. The GP fields mirror
 * `GpHyperSpec` in `shared/rv/gp-fit.ts` (that module states the priors each one gets).
 */
export const gpKernelSchema = z.enum(['rotation', 'quasi-periodic'])
export type GpKernelName = z.infer<typeof gpKernelSchema>
export const gpNoiseSchema = z.object({
  kind: z.literal('gp'),
  kernel: gpKernelSchema.default('rotation'),
  /** Rotation period (d): prior centre, its 1σ (default 10 %), where it came from, optional start. */
  period: z.object({
    value: positive(), sigma: positive().optional(), fixed: z.boolean().optional(),
    source: z.string().trim().max(200).optional(), start: positive().optional(),
  }),
  /** Decay time of the active regions (d): start, or the value when fixed. */
  decayTime: z.object({ value: positive().optional(), fixed: z.boolean().optional() }).optional(),
  /** Rotation kernel: shape factor in [0, 1]; quasi-periodic: Γ > 0. */
  shape: z.object({ value: z.number().finite().min(0, 'must not be negative').optional(), fixed: z.boolean().optional() }).optional(),
  /** Amplitude(s) in m/s: starts, or values when fixed; one per instrument when `perInstrument`. */
  amplitude: z.object({
    value: z.array(positive()).max(20).optional(), fixed: z.boolean().optional(), perInstrument: z.boolean().optional(),
  }).optional(),
}).superRefine((v, ctx) => {
  if (v.decayTime?.fixed && v.decayTime.value === undefined) ctx.addIssue({ code: 'custom', path: ['decayTime', 'value'], message: 'give the value to fix it at' })
  if (v.shape?.fixed && v.shape.value === undefined) ctx.addIssue({ code: 'custom', path: ['shape', 'value'], message: 'give the value to fix it at' })
  if (v.kernel === 'rotation' && v.shape?.value !== undefined && v.shape.value > 1) ctx.addIssue({ code: 'custom', path: ['shape', 'value'], message: 'the rotation kernel\'s shape factor lies in [0, 1]' })
  if (v.amplitude?.fixed && !v.amplitude.value?.length) ctx.addIssue({ code: 'custom', path: ['amplitude', 'value'], message: 'give the value(s) to fix them at' })
})
export const noiseModelSchema = z.union([z.object({ kind: z.literal('white') }), gpNoiseSchema])
export type NoiseModelSpec = z.infer<typeof noiseModelSchema>
export type GpNoiseSpec = z.infer<typeof gpNoiseSchema>

/** Per-instrument terms the user pins: a fixed jitter (m/s) instead of a fitted one. */
export const instrumentTermSchema = z.object({
  instrument: z.string().trim().min(1).max(120),
  jitter: z.number().finite().min(0, 'must not be negative').max(10000).optional(),
})
export type InstrumentTermSpec = z.infer<typeof instrumentTermSchema>

export const modelSpecSchema = z.object({
  planets: z.array(planetSpecSchema).max(8, 'at most 8 planets'),
  trend: trendSchema.default('none'),
  /** Instruments fitted (null or absent: all of the star's). */
  instruments: instrumentsSchema.nullable().optional(),
  /** Noise model (absent: white noise). */
  noise: noiseModelSchema.optional(),
  /** Jitters pinned per instrument (absent: every jitter fitted). */
  instrumentTerms: z.array(instrumentTermSchema).max(20).optional(),
})
export type ModelSpec = z.infer<typeof modelSpecSchema>
export type ModelSpecInput = z.input<typeof modelSpecSchema>

const nameSchema = z.string().trim().min(1, 'is required').max(120)
export const createModelRequestSchema = z.object({ name: nameSchema, spec: modelSpecSchema })
export type CreateModelRequest = z.input<typeof createModelRequestSchema>
export const updateModelRequestSchema = z.object({ name: nameSchema.optional(), spec: modelSpecSchema.optional() })
  .refine((v) => v.name !== undefined || v.spec !== undefined, { message: 'give a new name or spec', path: ['spec'] })
export type UpdateModelRequest = z.input<typeof updateModelRequestSchema>
export const duplicateModelRequestSchema = z.object({ name: nameSchema.optional() })
export type DuplicateModelRequest = z.infer<typeof duplicateModelRequestSchema>
/** POST /api/models/:modelId/overrule — count an activity candidate of the search as a planet. */
export const overruleRequestSchema = z.object({
  /** The candidate's `signal` index in the search report. */
  signal: z.number().int().min(0),
  /** Why the analyst counts it as a planet (kept in the model's history). */
  reason: z.string().trim().min(3, 'say in a few words why the signal is a planet').max(500),
})
export type OverruleRequest = z.infer<typeof overruleRequestSchema>
/** POST /api/models/:modelId/gp-variant — the same planets with a GP noise model, fitted. */
export const gpVariantRequestSchema = z.object({
  name: nameSchema.optional(),
  /** Rotation period (d) and its 1σ; default: the strongest significant activity-indicator peak. */
  period: positive().optional(),
  sigma: positive().optional(),
  kernel: gpKernelSchema.optional(),
})
export type GpVariantRequest = z.infer<typeof gpVariantRequestSchema>
export const fitModelRequestSchema = z.object({ maxIterations: z.number().int().min(1).max(2000).optional() })
export type FitModelRequest = z.infer<typeof fitModelRequestSchema>

const num = z.number().nullable()

export const fittedPlanetSchema = z.object({
  /** 'b', 'c', … in the order of the spec. */
  label: z.string(),
  period: z.number(), K: z.number(), e: z.number(), omegaDeg: z.number(), tp: z.number(), tc: z.number(),
  /** 1σ; null where not determined; 0 for fixed parameters. */
  uncertainty: z.object({ period: num, K: num, e: num, omegaDeg: num, tp: num, tc: num }),
  msiniMjup: z.number().nullable(), msiniMearth: z.number().nullable(), aAu: z.number().nullable(),
  derivedUncertainty: z.object({ msiniMjup: num, msiniMearth: num, aAu: num }),
  /** Orbit-averaged flux L/(a²√(1−e²)) relative to Earth's; null without the star's luminosity. */
  insolationEarth: z.number().nullable(),
})
export type FittedPlanet = z.infer<typeof fittedPlanetSchema>

export const fitWarningSchema = z.object({
  code: z.enum(['not_converged', 'e_near_1', 'k_below_noise', 'period_beyond_baseline', 'failed']),
  /** Index into planets, when the warning is about one. */
  planet: z.number().int().nullable(),
  message: z.string(),
})
export type FitWarning = z.infer<typeof fitWarningSchema>

/** How one signal of the search was judged against the activity indicators. */
export const activityCandidateSchema = z.object({
  /** Index into the search's full fit (every signal found, planets and activity). */
  signal: z.number().int(),
  period: z.number(), K: z.number(), e: z.number(), omegaDeg: z.number(), tc: z.number(),
  /** True: labelled an activity candidate (not counted as a planet). */
  activity: z.boolean(),
  matches: z.array(z.object({
    indicator: z.string(), kind: z.enum(['period', 'harmonic', 'correlation']), relation: z.string().nullable(),
    indicatorPeriod: z.number().nullable(), fap: z.number().nullable(),
    pearson: z.number().nullable(), pearsonP: z.number().nullable(), spearman: z.number().nullable(),
  })),
  /** The evidence in plain words. */
  cautions: z.array(z.string()),
  /** Set once an analyst counted the signal as a planet. */
  overruled: z.object({ by: userRefSchema.nullable(), at: z.string(), reason: z.string() }).nullable().optional(),
})
export type ActivityCandidate = z.infer<typeof activityCandidateSchema>
export const activityReportSchema = z.object({
  candidates: z.array(activityCandidateSchema),
  indicators: z.array(z.object({
    name: z.string(), n: z.number().int(),
    peaks: z.array(z.object({ period: z.number(), fap: z.number() })),
    pearson: z.number().nullable(), pearsonP: z.number().nullable(), spearman: z.number().nullable(),
  })),
  cautions: z.array(z.string()),
  settings: z.object({ peakFap: z.number(), correlationP: z.number(), minAbsR: z.number() }),
})
export type ActivityReport = z.infer<typeof activityReportSchema>

/** A rejection, warning or note of the search about one signal or the model (readable message). */
export const searchFlagSchema = z.object({
  kind: z.string(),
  severity: z.enum(['rejection', 'warning', 'info']),
  /** Days; null for model-level flags. */
  period: z.number().nullable(),
  instrument: z.string().nullable(),
  message: z.string(),
})
export type SearchFlag = z.infer<typeof searchFlagSchema>

/** A kept signal with its alias partners fitted in its place (best first; lnL of each). */
export const searchSignalSchema = z.object({
  planet: z.number().int(), period: z.number(),
  aliases: z.array(z.object({ period: z.number(), relation: z.string(), lnL: z.number(), converged: z.boolean() })),
  /** lnL of the chosen period minus the runner-up partner's (null if none could be fitted). */
  runnerUpDeltaLnL: z.number().nullable(),
})
export type SearchSignal = z.infer<typeof searchSignalSchema>

/** What the search said beside its chosen model: flags, alias partners, alternatives, settings used. */
export const searchReportSchema = z.object({
  flags: z.array(searchFlagSchema),
  signals: z.array(searchSignalSchema),
  alternatives: z.array(z.object({ description: z.string(), planets: z.number().int(), trend: trendSchema, bic: z.number(), lnL: z.number() })),
  /** Flagged candidates: passed the BIC and false-alarm rules, not counted as planets (their doubts are among the flags). */
  candidates: z.array(z.object({
    period: z.number(), K: z.number(), e: z.number(), omegaDeg: z.number(), deltaLnL: z.number(), deltaBic: z.number(), kinds: z.array(z.string()),
  })).optional(),
  settings: z.object({ minPeriod: z.number(), maxPeriod: z.number(), bicThreshold: z.number(), maxPlanets: z.number().int(), falseAlarm: z.number().optional() }),
  /** With activity indicators: every signal judged against them (activity candidates are not in the model). */
  activity: activityReportSchema.optional(),
})
export type SearchReport = z.infer<typeof searchReportSchema>

/** One hyperparameter of the noise model as fitted: value, 1σ (null when fixed or undetermined), unit. */
export const noiseHyperSchema = z.object({
  name: z.string(), symbol: z.string(), value: z.number(), error: z.number().nullable(), unit: z.string(), fixed: z.boolean(),
})
export type NoiseHyper = z.infer<typeof noiseHyperSchema>

/** The fitted noise model: what the methods text, the report table and the plots need. */
export const fitNoiseSchema = z.object({
  kind: z.enum(['white', 'gp']),
  kernel: gpKernelSchema.nullable(),
  /** 'semiseparable (O(N))' or 'dense Cholesky' for a GP; null for white noise. */
  solver: z.string().nullable(),
  hyperparameters: z.array(noiseHyperSchema),
  /** The priors as applied, in words. */
  priors: z.array(z.string()),
  /** Jitters pinned by the user (instrument → m/s). */
  pinnedJitters: z.array(z.object({ instrument: z.string(), jitter: z.number() })),
  lnL: z.number().nullable(), bic: z.number().nullable(),
  /** Exact parameters to rebuild the GP (plots): kernel shape, amplitude(s) and jitters in the fit's instrument order. */
  model: z.object({
    kernel: z.object({ kind: gpKernelSchema, period: z.number(), decayTime: z.number(), shape: z.number() }),
    amplitude: z.array(z.number()), jitter: z.array(z.number()), instruments: z.array(z.string()),
  }).nullable(),
  /** Plain words on how to read the fit under this noise model. */
  note: z.string(),
})
export type FitNoise = z.infer<typeof fitNoiseSchema>


export const fitResultSchema = z.object({
  planets: z.array(fittedPlanetSchema),
  instruments: z.array(z.object({
    name: z.string(), n: z.number().int(), offset: z.number().nullable(), offsetErr: z.number().nullable(),
    jitter: z.number().nullable(), jitterErr: z.number().nullable(), rms: z.number().nullable(),
  })),
  trend: z.object({ kind: trendSchema, slope: z.number(), slopeErr: z.number().nullable(), curvature: z.number(), curvatureErr: z.number().nullable(), epoch: z.number() }).nullable(),
  stats: z.object({
    /** Non-finite values (a failed fit, no degrees of freedom) are null. */
    chi2: z.number().nullable(), reducedChi2: z.number().nullable(), lnL: z.number().nullable(), bic: z.number().nullable(),
    aic: z.number().nullable(), rms: z.number().nullable(),
    nParams: z.number().int(), nPoints: z.number().int(), converged: z.boolean(),
    status: z.enum(['converged', 'max-iterations', 'stalled', 'failed']), message: z.string(), iterations: z.number().int(),
  }),
  /** Reference time of the trend and of the reported Tc/Tp (full JD). */
  epoch: z.number(),
  /** Per measurement used: the model velocity (with its instrument's offset and the trend) and the residual, m/s. */
  residuals: z.array(z.object({
    measurementId: z.number().int(), model: z.number(), residual: z.number(),
    /** GP noise model only: the GP's conditional mean at this row (the activity as its instrument sees it), m/s. */
    activity: z.number().optional(),
  })),
  warnings: z.array(fitWarningSchema),
  data: dataSelectionSchema,
  /** For a model made by the search: its flags, alias partners and alternatives. */
  search: searchReportSchema.nullable().optional(),
  /** The noise model as fitted (absent in results stored before noise models existed: white noise). */
  noise: fitNoiseSchema.optional(),
})
export type FitResultJson = z.infer<typeof fitResultSchema>

export const modelStatusSchema = z.enum(['draft', 'fitted', 'failed'])
export type ModelStatus = z.infer<typeof modelStatusSchema>

export const modelVersionSchema = z.object({
  id: z.number().int(), modelId: z.number().int(), version: z.number().int(), name: z.string(),
  spec: modelSpecSchema, status: modelStatusSchema, result: fitResultSchema.nullable(),
  /** What made this version: 'created', 'updated', 'fitted', 'duplicated from model 12 version 3', 'search'. */
  note: z.string(),
  author: userRefSchema.nullable(), createdAt: z.string(),
})
export type ModelVersion = z.infer<typeof modelVersionSchema>

export const modelSummarySchema = z.object({
  id: z.number().int(), starId: z.number().int(), name: z.string(), currentVersion: z.number().int(),
  status: modelStatusSchema, planets: z.number().int(), trend: trendSchema, bic: z.number().nullable(),
  createdBy: userRefSchema.nullable(), createdAt: z.string(), updatedAt: z.string(),
})
export type ModelSummary = z.infer<typeof modelSummarySchema>
export const modelListResponseSchema = z.array(modelSummarySchema)

export const modelVersionListItemSchema = z.object({
  id: z.number().int(), version: z.number().int(), name: z.string(), status: modelStatusSchema, note: z.string(),
  planets: z.number().int(), bic: z.number().nullable(), author: userRefSchema.nullable(), createdAt: z.string(),
})
export const modelDetailSchema = modelSummarySchema.extend({
  current: modelVersionSchema,
  /** Every version, oldest first. */
  versions: z.array(modelVersionListItemSchema),
})
export type ModelDetail = z.infer<typeof modelDetailSchema>

// ---------------------------------------------------------------------------------------------
// Search and comparison

export const searchRequestSchema = z.object({
  trend: z.enum(['auto', 'none', 'linear', 'quadratic']).optional(),
  /** Most planets tried in auto mode (default: the core's SEARCH_DEFAULTS.maxPlanets). */
  maxPlanets: z.number().int().min(1).max(8).optional(),
  /** A new signal is kept only at this false-alarm probability or below (default 0.001; the search's calibrated law). */
  falseAlarm: z.number().gt(0, 'must be in (0, 1)').lt(1, 'must be in (0, 1)').optional(),
  /** Accepted for old callers and not used (the result says so): the gate is `falseAlarm`. */
  fapThreshold: z.number().gt(0, 'must be in (0, 1)').lt(1, 'must be in (0, 1)').optional(),
  /** Days; default of the core's grid (0.5 d, 0.2 d for dense sampling). */
  minPeriod: positive().optional(),
  /** Days; default 5 × the baseline. */
  maxPeriod: positive().optional(),
  instruments: instrumentsSchema.optional(),
}).superRefine((v, ctx) => {
  if (v.minPeriod !== undefined && v.maxPeriod !== undefined && !(v.minPeriod < v.maxPeriod)) {
    ctx.addIssue({ code: 'custom', path: ['maxPeriod'], message: 'must be larger than minPeriod' })
  }
})
export type SearchRequest = z.infer<typeof searchRequestSchema>

export const searchStepSchema = z.object({
  planets: z.number().int(), trend: trendSchema, bic: z.number(), lnL: z.number(),
  nextPeakFap: z.number().nullable(), nextPeakPeriod: z.number().nullable(),
})

export const searchResponseSchema = z.object({
  model: modelDetailSchema,
  steps: z.array(searchStepSchema),
  chosen: z.object({ planets: z.number().int(), trend: trendSchema }),
  report: searchReportSchema,
})
export type SearchResponse = z.infer<typeof searchResponseSchema>

export const evidenceSchema = z.enum(['bare mention', 'positive', 'strong', 'very strong'])
export const compareRowSchema = z.object({
  modelId: z.number().int(), name: z.string(), version: z.number().int(),
  planets: z.number().int(), trend: trendSchema,
  lnL: z.number(), bic: z.number(),
  /** bic − bic of the preferred model; null when not comparable. */
  deltaBic: z.number().nullable(),
  rms: z.number(),
  jitters: z.array(z.object({ instrument: z.string(), jitter: z.number() })),
  nPoints: z.number().int(), dataHash: z.string(),
  /** Fitted to the same data as the preferred model (BIC differences mean something only then). */
  comparable: z.boolean(),
  preferred: z.boolean(),
  /** Kass & Raftery (1995) grade of |ΔBIC| against the preferred model (null for the preferred itself or when not comparable). */
  evidence: evidenceSchema.nullable(),
  reading: z.string(),
  /** Noise model of the fit (spec.noise): white noise with jitters, or a Gaussian process. */
  noise: z.enum(['white', 'gp']).optional(),
  /** The same model as an earlier one (same data, planets, trend and noise; BIC and ln L equal to 10⁻⁶): shown in that one's row, never compared with it. */
  sameAs: z.object({ modelId: z.number().int(), name: z.string(), version: z.number().int() }).nullable().optional(),
})
export type CompareRow = z.infer<typeof compareRowSchema>
export const compareResponseSchema = z.object({
  /** Fitted models (current version of each), by BIC ascending. */
  rows: z.array(compareRowSchema),
  preferredModelId: z.number().int().nullable(),
  rule: z.string(),
  reading: z.string(),
})
export type CompareResponse = z.infer<typeof compareResponseSchema>

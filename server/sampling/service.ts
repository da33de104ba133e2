// Posterior sampling runs: requested from a fitted model version, queued on pg-boss (server/jobs),
// worked on by server/sampling/runner.ts. The run freezes its input (the measurements the fit
// used, the fitted model, the star's mass) so it can be resumed and reproduced exactly.
import { randomInt } from 'node:crypto'
import { Op, QueryTypes, type Sequelize } from 'sequelize'
import type PgBoss from 'pg-boss'
import type { Services } from '../services.ts'
import type { Star, User } from '../db/models.ts'
import { samplingModels, type SamplingInput, type SamplingRun } from '../db/models-sampling.ts'
import { analysisModels, type FitModel, type FitModelVersion } from '../db/models-analysis.ts'
import { ConflictError, ValidationError } from '../errors.ts'
import { record } from '../audit/service.ts'
import { createJobSender, SAMPLING_QUEUE } from '../jobs/boss.ts'
import { createLogPosterior, type PosteriorSpec } from '../../shared/rv/posterior.ts'
import { gpHyperOf } from '../compute/fit-noise.ts'
import { MIN_N_OVER_TAU } from '../../shared/rv/mcmc.ts'
import type { PlanetParam } from '../../shared/rv/index.ts'
import { rvDataOf } from './thread.ts'
import { notify } from './runner.ts'
import { cancelEnsembles, composeProgress, ensemblesOf, isParallel, parentOf, workersSeen } from './ensembles.ts'
import { stepsPerEnsemble } from '../../shared/rv/ensemble-merge.ts'
import {
  SAMPLING_DEFAULTS, type SamplingRun as SamplingRunJson, type SamplingRunSummary, type SamplingSettings, type StartSamplingRequest,
  type SamplingEvent,
} from '../../shared/api/sampling.ts'

/** pg-boss job options of a sampling run: retried when its worker is lost; expiry is only a backstop. */
export function samplingJobOptions(s: Services): PgBoss.SendOptions {
  return { retryLimit: s.config.jobs.retryLimit, retryDelay: 1, expireInSeconds: 23 * 3600 }
}

const senders = new WeakMap<Sequelize, PgBoss>()
/** The API's job sender (never started; sends through the Sequelize pool). */
export function jobSender(s: Services): PgBoss {
  let b = senders.get(s.sequelize)
  if (!b) { b = createJobSender(s.sequelize); senders.set(s.sequelize, b) }
  return b
}

const iso = (d: Date | null | undefined): string | null => (d ? d.toISOString() : null)

function base(r: SamplingRun) {
  return {
    id: r.id, starId: r.starId, modelId: r.modelId, modelVersionId: r.modelVersionId, modelVersion: r.modelVersion,
    settings: r.settings, state: r.state, progress: r.progress ?? null, estimateSeconds: r.estimateSeconds,
    attempts: r.attempts, checkpointStep: r.checkpointStep, resumedFromStep: r.resumedFromStep ?? null, error: r.error ?? null,
    requestedBy: r.requester ? { id: r.requester.id, name: r.requester.name } : null,
    createdAt: r.createdAt.toISOString(), startedAt: iso(r.startedAt), finishedAt: iso(r.finishedAt),
  }
}
export function runJson(r: SamplingRun): SamplingRunJson { return { ...base(r), result: r.result ?? null } }
export function runSummaryJson(r: SamplingRun): SamplingRunSummary { return { ...base(r), converged: r.result ? r.result.diagnostics.converged : null } }
export function eventJson(r: SamplingRun): SamplingEvent { return { id: r.id, state: r.state, progress: r.progress ?? null, error: r.error ?? null } }

const LIGHT = { exclude: ['input', 'checkpoint', 'checkpointChain', 'checkpointLnprob'] }

export async function loadRun(s: Services, id: number, withResult = true): Promise<SamplingRun | null> {
  const { SamplingRun } = samplingModels(s.sequelize, s.models)
  const run = await SamplingRun.findByPk(id, {
    attributes: withResult ? LIGHT : { exclude: [...LIGHT.exclude, 'result'] },
    include: [{ model: s.models.User, as: 'requester', attributes: ['id', 'name'] }],
  })
  // a parallel run shows each ensemble's live progress (not stored: read with the run)
  if (run && isParallel(run.settings)) run.progress = composeProgress(run, await ensemblesOf(s, run))
  return run
}

/** A run with its frozen input (for the chain download). */
export async function loadRunWithInput(s: Services, id: number): Promise<SamplingRun | null> {
  const { SamplingRun } = samplingModels(s.sequelize, s.models)
  return SamplingRun.findByPk(id, { attributes: { exclude: ['checkpoint', 'checkpointChain', 'checkpointLnprob'] } })
}

export async function listRuns(s: Services, star: Star): Promise<SamplingRunSummary[]> {
  const { SamplingRun } = samplingModels(s.sequelize, s.models)
  const rows = await SamplingRun.findAll({
    // the ensembles of a parallel run are listed through it, not on their own
    where: s.sequelize.and({ starId: star.id }, s.sequelize.literal(`settings->'ensemble' IS NULL`)), attributes: LIGHT, order: [['createdAt', 'DESC'], ['id', 'DESC']], limit: 200,
    include: [{ model: s.models.User, as: 'requester', attributes: ['id', 'name'] }],
  })
  return rows.map(runSummaryJson)
}

/** Freezes what a run of this fitted version samples: its measurements, its fitted model as the start, the star's mass. */
export async function inputFromVersion(s: Services, star: Star, version: FitModelVersion): Promise<SamplingInput> {
  const result = version.result
  if (version.status !== 'fitted' || !result) {
    throw new ConflictError(`Version ${version.version} of this model is not fitted: fit it first (sampling starts from the fit).`)
  }
  if (!result.planets.length) throw new ConflictError('The model has no planet: add one and fit it before sampling.')
  const ids = result.residuals.map((r) => r.measurementId)
  const rows = await s.sequelize.query<{ id: number; instrument: string; time: number; rv: number; error: number }>(
    `SELECT m.id, d.instrument, m.time, m.rv, m.error FROM measurements m JOIN datasets d ON d.id = m.dataset_id
      WHERE m.star_id = :star AND m.id IN (:ids) ORDER BY m.time, m.id`,
    { replacements: { star: star.id, ids: ids.length ? ids : [0] }, type: QueryTypes.SELECT },
  )
  if (rows.length < 3) throw new ConflictError('The fit used fewer than 3 measurements: there is nothing to sample.')
  const names = result.instruments.map((i) => i.name).filter((n) => rows.some((r) => r.instrument === n))
  for (const r of rows) if (!names.includes(r.instrument)) names.push(r.instrument)
  const spec = version.spec
  return {

    data: {
      measurementIds: rows.map((r) => r.id), t: rows.map((r) => r.time), y: rows.map((r) => r.rv), dy: rows.map((r) => r.error),
      instrument: rows.map((r) => names.indexOf(r.instrument)), instrumentNames: names,
    },
    model: {
      planets: result.planets.map((p, k) => {
        const fix = spec.planets[k]?.fix ?? []
        const phase = fix.includes('tp') ? { tp: p.tp } : { tc: p.tc }
        return { period: p.period, K: p.K, e: p.e, omegaDeg: p.omegaDeg, ...phase, ...(fix.length ? { fix } : {}) }
      }),
      trend: spec.trend ?? 'none',
      epoch: result.epoch,
      priors: spec.planets.flatMap((p, k) => (p.priors ?? []).map((pr) => ({ planet: k, param: pr.param, gaussian: pr.gaussian, uniform: pr.uniform }))),
      ...noiseOf(spec, names),
    },
    starMass: star.massMsun > 0 ? { value: star.massMsun, err: Math.max(0, star.massErrMsun ?? 0) } : null,
  }
}

/**
 * The spec's noise model and pinned jitters as the sampler takes them: a GP's hyperparameters
 * (its values are the sampler's centre, refined to the planets + GP optimum by the core), and the
 * jitters when every instrument's is pinned. The sampler holds all jitters pinned or none: a spec
 * that pins some is refused here rather than sampled as another model.
 */
function noiseOf(spec: FitModelVersion['spec'], names: string[]): Pick<SamplingInput['model'], 'noise' | 'jitter'> {
  const noise = spec.noise?.kind === 'gp' ? gpHyperOf(spec.noise) : null
  const pins = spec.instrumentTerms?.filter((t) => t.jitter !== undefined) ?? []
  if (!pins.length) return { noise }
  const jitter = names.map((n) => pins.find((t) => t.instrument === n)?.jitter)
  if (jitter.some((j) => j === undefined)) {
    throw new ConflictError('This model pins the jitter of some instruments only; the sampler holds all jitters pinned or none. Pin every instrument\'s jitter, or none, and fit again before sampling.')
  }
  return { noise, jitter: jitter as number[] }
}

/**
 * Integrated autocorrelation time per free parameter the estimate assumes before a run has
 * measured it, in steps: about 13 per parameter, from our runs of the one-planet models of
 * tests/shared/rv/mcmc.spec.ts and the bench (τ ≈ 60–110 steps for 6–7 parameters, as emcee found
 * on the fixture's model: fixtures/sampler/one-planet-emcee.json, τ 85–110). A guide only: the
 * run measures τ and stops by the rule.
 */
export const TAU_PER_PARAMETER = 13

export interface RunEstimate {
  /** Free (sampled) parameters, their names, and the walkers the run would use. */
  nDim: number
  names: string[]
  walkers: number
  /** The budget (or fixed length) in steps and the steps expected to reach convergence (burn-in + 50 τ, τ ≈ 13 steps per parameter). */
  steps: number
  expectedSteps: number
  /** Wall-clock seconds for the expected steps and for the whole budget, from a timing of the log-posterior. */
  seconds: number
  maxSeconds: number
  /** Ensembles run side by side (steps and seconds are those of each), and the job workers connected now. */
  ensembles?: number
  workers?: number
}

/** The posterior a run of this input samples (its free parameters: the model's fixed ones left out). */
export function posteriorOf(input: SamplingInput, fitVersion: FitModelVersion['result']) {
  const data = rvDataOf(input)
  const r = fitVersion!
  const spec: PosteriorSpec = {
    planets: input.model.planets.map((p) => ({
      period: p.period, K: p.K, e: p.e, omegaDeg: p.omegaDeg, tc: p.tc, tp: p.tp,
      ...(p.fix?.length ? { fix: p.fix as PlanetParam[] } : {}),
    })),
    trend: input.model.trend, epoch: input.model.epoch,
    offsets: input.data.instrumentNames.map((n) => r.instruments.find((i) => i.name === n)?.offset ?? 0),
    jitters: input.data.instrumentNames.map((n) => Math.max(r.instruments.find((i) => i.name === n)?.jitter ?? 0, 0.1)),
    slope: r.trend?.slope, curvature: r.trend?.curvature,
    ...(input.model.jitter ? { jitter: input.model.jitter } : {}),
    noise: input.model.noise ?? null,
  }
  return createLogPosterior(data, spec)
}

/**
 * Times the log-posterior of the frozen input at its fitted point and returns the free
 * parameters and the expected wall-clock seconds (plus a fixed allowance for the start-up fit and
 * the summaries): for the steps a run until convergence is expected to need, and for the budget.
 */
export function estimateRun(input: SamplingInput, fitVersion: FitModelVersion['result'], walkers: number | null, steps: number, untilConverged = true, ensembles = 1): RunEstimate {
  const post = posteriorOf(input, fitVersion)
  const x = Float64Array.from(post.centre)
  // warm up first (the optimising compiler), then time short batches
  const time = (ms: number, minN: number): { n: number; elapsed: number } => {
    let n = 0
    const t0 = performance.now()
    let t = t0
    while (t - t0 < ms || n < minN) {
      for (let i = 0; i < 10; i++) { x[0] = post.centre[0]! * (1 + 1e-12 * (n % 7)); post.logProb(x); n++ }
      t = performance.now()
    }
    return { n, elapsed: t - t0 }
  }
  time(15, 200)
  // the quickest of five short batches: the least disturbed by other work on the machine
  let perEval = Infinity
  for (let b = 0; b < 5; b++) { const { n, elapsed } = time(6, 10); perEval = Math.min(perEval, elapsed / 1000 / n) }
  const w = walkers ?? defaultWalkersFor(post.nDim)
  const single = Math.ceil((MIN_N_OVER_TAU * TAU_PER_PARAMETER * post.nDim * 4) / 3 / 100) * 100
  // K ensembles side by side: each needs about 1/K of one run's steps (ensemble-merge.ts)
  const expectedSteps = untilConverged || ensembles > 1 ? Math.min(steps, ensembles > 1 ? stepsPerEnsemble(single, ensembles) : single) : steps
  const secs = (n: number) => Math.round((1.5 + 1.15 * w * n * perEval) * 10) / 10
  return { nDim: post.nDim, names: post.names, walkers: w, steps, expectedSteps, seconds: secs(expectedSteps), maxSeconds: secs(steps), ensembles }
}

/** Default walkers: max(32, 2 × free parameters) (even). */
export function defaultWalkersFor(nDim: number): number {
  return Math.max(SAMPLING_DEFAULTS.walkers, 2 * nDim)
}

export function settingsFor(req: StartSamplingRequest, nDim: number): SamplingSettings {
  const untilConverged = req.untilConverged ?? SAMPLING_DEFAULTS.untilConverged
  const steps = req.steps ?? (untilConverged ? SAMPLING_DEFAULTS.steps : SAMPLING_DEFAULTS.fixedSteps)
  const walkers = req.walkers ?? defaultWalkersFor(nDim)
  if (walkers < 2 * nDim) throw new ValidationError(`walkers: at least ${2 * nDim} are needed for the ${nDim} free parameters of this model (twice their number).`, 'walkers')
  const ensembles = req.ensembles ?? 1
  return { walkers, steps, burn: req.burn ?? null, thin: req.thin ?? SAMPLING_DEFAULTS.thin, seed: req.seed ?? randomInt(1, 2 ** 31), untilConverged, ...(ensembles > 1 ? { ensembles } : {}) }
}

/** Refuses more ensembles than job workers are connected now (each ensemble takes one). */
export async function checkEnsembles(s: Services, ensembles: number): Promise<void> {
  if (ensembles <= 1) return
  const seen = await workersSeen(s)
  if (ensembles > seen) {
    throw new ValidationError(`ensembles: ${seen} job worker${seen === 1 ? ' is' : 's are'} connected now, so at most ${Math.max(seen, 1)} ensemble${seen > 1 ? 's' : ''} can run side by side; ask for fewer or start more workers (scripts/worker.ts).`, 'ensembles')
  }
}

/** Seed of ensemble i of a parallel run: its own stream, fixed by the run's seed. */
export const ensembleSeed = (seed: number, i: number): number => (seed + 7919 * (i + 1)) % 2 ** 31

/** GET /api/models/:modelId/sampling/estimate: what a run with these settings would sample and how long it would take. */
export async function estimateForModel(s: Services, star: Star, model: FitModel, req: StartSamplingRequest): Promise<RunEstimate> {
  const { FitModelVersion } = analysisModels(s.sequelize, s.models)
  const version = await FitModelVersion.findOne({ where: { modelId: model.id, version: model.currentVersion } })
  if (!version) throw new ConflictError('The model has no current version.')
  const input = await inputFromVersion(s, star, version)
  const untilConverged = req.untilConverged ?? SAMPLING_DEFAULTS.untilConverged
  const steps = req.steps ?? (untilConverged ? SAMPLING_DEFAULTS.steps : SAMPLING_DEFAULTS.fixedSteps)
  const est = estimateRun(input, version.result, req.walkers ?? null, steps, untilConverged, req.ensembles ?? 1)
  return { ...est, workers: await workersSeen(s) }
}

/** Inserts a run and queues its job. */
export async function enqueueRun(s: Services, fields: {
  starId: number; modelId: number | null; modelVersionId: number | null; modelVersion: number | null
  settings: SamplingSettings; input: SamplingInput; estimateSeconds: number | null; requestedBy: number | null
}): Promise<SamplingRun> {
  const { SamplingRun } = samplingModels(s.sequelize, s.models)
  const run = await SamplingRun.create({
    ...fields, progress: { stepsDone: 0, stepsTotal: fields.settings.steps, tau: null, etaSeconds: fields.estimateSeconds, acceptance: null, updatedAt: new Date().toISOString() },
  })
  const jobId = await jobSender(s).send(SAMPLING_QUEUE, { runId: run.id }, samplingJobOptions(s))
  await run.update({ jobId })
  return run
}

/**
 * A parallel run: its own row (no job: its ensembles' workers merge into it) and K ensembles, each
 * a run on the queue with its own seed that runs to the budget (the merge decides when to stop).
 */
export async function enqueueParallel(s: Services, fields: Parameters<typeof enqueueRun>[1], K: number): Promise<SamplingRun> {
  const { SamplingRun } = samplingModels(s.sequelize, s.models)
  const parent = await SamplingRun.create({
    ...fields, progress: { stepsDone: 0, stepsTotal: fields.settings.steps, tau: null, etaSeconds: fields.estimateSeconds, acceptance: null, updatedAt: new Date().toISOString() },
  })
  for (let i = 0; i < K; i++) {
    const { ensembles: _k, ...base } = fields.settings
    await enqueueRun(s, { ...fields, settings: { ...base, seed: ensembleSeed(fields.settings.seed, i), untilConverged: false, ensemble: { of: parent.id, index: i, count: K } } })
  }
  return parent
}

/** POST /api/models/:modelId/sampling: a run of the model's current version. */
export async function startRun(s: Services, actor: User, star: Star, model: FitModel, req: StartSamplingRequest): Promise<SamplingRunJson> {
  const { FitModelVersion } = analysisModels(s.sequelize, s.models)
  const version = await FitModelVersion.findOne({ where: { modelId: model.id, version: model.currentVersion } })
  if (!version) throw new ConflictError('The model has no current version.')
  const input = await inputFromVersion(s, star, version)
  const nDim = posteriorOf(input, version.result).nDim
  const settings = settingsFor(req, nDim)
  const K = settings.ensembles ?? 1
  if (K > 1 && input.model.noise) {
    throw new ValidationError('ensembles: the parallel mode samples white-noise models only for now; run a planets + GP model as one ensemble.', 'ensembles')
  }
  await checkEnsembles(s, K)
  const estimate = estimateRun(input, version.result, settings.walkers, settings.steps, settings.untilConverged, K)
  const fields = {
    starId: star.id, modelId: model.id, modelVersionId: version.id, modelVersion: version.version,
    settings, input, estimateSeconds: estimate.seconds, requestedBy: actor.id,
  }
  const run = K > 1 ? await enqueueParallel(s, fields, K) : await enqueueRun(s, fields)
  await record(s, {
    teamId: star.teamId, userId: actor.id, action: 'sampling.start', entity: 'sampling', entityId: run.id,
    detail: { starId: star.id, modelId: model.id, version: version.version, settings, estimateSeconds: run.estimateSeconds },
  })
  return runJson((await loadRun(s, run.id))!)
}

/** POST /api/sampling/:runId/cancel: a queued run never starts; a running one stops within about a second (its partial result is kept). */
export async function cancelRun(s: Services, actor: User, star: Star, run: SamplingRun): Promise<SamplingRunJson> {
  const { SamplingRun } = samplingModels(s.sequelize, s.models)
  if (['succeeded', 'failed', 'cancelled'].includes(run.state)) throw new ConflictError(`The run has already ${run.state === 'cancelled' ? 'been cancelled' : run.state}.`)
  const of = parentOf(run.settings)
  if (of !== null) throw new ConflictError(`This run is ensemble ${run.settings.ensemble!.index + 1} of parallel run ${of}: cancel run ${of} (it stops every ensemble).`)
  const [n] = await SamplingRun.update(
    { state: 'cancelled', finishedAt: new Date(), error: `Cancelled by ${actor.name}.` },
    { where: { id: run.id, state: { [Op.in]: ['queued', 'running'] } } },
  )
  if (n === 0) throw new ConflictError('The run finished in the meantime.')
  if (run.state === 'queued' && run.jobId) {
    await jobSender(s).cancel(SAMPLING_QUEUE, run.jobId).catch(() => undefined)
  }
  if (isParallel(run.settings)) {
    for (const k of await cancelEnsembles(s, run, actor.name)) {
      if (k.was === 'queued' && k.jobId) await jobSender(s).cancel(SAMPLING_QUEUE, k.jobId).catch(() => undefined)
    }
  }
  await record(s, { teamId: star.teamId, userId: actor.id, action: 'sampling.cancel', entity: 'sampling', entityId: run.id, detail: { starId: star.id, was: run.state } })
  return runJson((await loadRun(s, run.id))!)
}

/**
 * Runs marked running whose heartbeat is older than `staleSeconds` lost their worker (killed,
 * machine gone): their pg-boss job is failed, so pg-boss retries it (up to the retry limit) and
 * the next worker resumes from the checkpoint. Out of retries → the run is marked failed.
 */
export async function reapStaleRuns(s: Services, boss: PgBoss, staleSeconds: number): Promise<number> {
  const stale = await s.sequelize.query<{ id: number; job_id: string | null; attempts: number }>(
    `SELECT id, job_id, attempts FROM sampling_runs
      WHERE state = 'running' AND heartbeat_at < now() - make_interval(secs => :stale)`,
    { replacements: { stale: staleSeconds }, type: QueryTypes.SELECT },
  )
  const { SamplingRun } = samplingModels(s.sequelize, s.models)
  for (const r of stale) {
    const job = r.job_id ? await boss.getJobById(SAMPLING_QUEUE, r.job_id) : null
    if (job && (job.state === 'created' || job.state === 'retry')) continue // already waiting for a worker
    if (job && job.state === 'active') {
      // another reaper (another process) may have been quicker: only fail a job whose run is still silent
      const still = await SamplingRun.count({ where: { id: r.id, state: 'running', jobId: r.job_id, heartbeatAt: { [Op.lt]: new Date(Date.now() - staleSeconds * 1000) } } })
      if (!still) continue
      await boss.fail(SAMPLING_QUEUE, r.job_id!, { message: `worker lost (no heartbeat for ${staleSeconds} s)` })
      const after = await boss.getJobById(SAMPLING_QUEUE, r.job_id!)
      if (after && after.state !== 'failed') continue
    } else if (!job || job.state === 'completed' || job.state === 'cancelled') {
      // the job ended although the run did not (a race between workers): queue a fresh one, within the retry limit
      if (r.attempts <= s.config.jobs.retryLimit) {
        const jobId = await boss.send(SAMPLING_QUEUE, { runId: r.id }, samplingJobOptions(s))
        await SamplingRun.update({ jobId }, { where: { id: r.id, state: 'running' } })
        continue
      }
    }
    // out of retries: the run ends here
    const [n] = await SamplingRun.update(
      { state: 'failed', finishedAt: new Date(), error: `The worker running this job was lost ${r.attempts} time(s) and the job is out of retries; start a new run.` },
      { where: { id: r.id, state: 'running' } },
    )
    if (n) await notify(s, (await SamplingRun.findByPk(r.id))!)
  }
  return stale.length
}

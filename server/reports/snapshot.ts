// Builds the frozen snapshot of a report version from the database as it is now: the model
// version and its result, the star, the measurements (with exclusions and reasons), the latest
// periodograms, the sampling run when chosen, the comparison, the product version and the methods.
import { execFileSync } from 'node:child_process'
import { readFileSync } from 'node:fs'
import { QueryTypes } from 'sequelize'
import type { Services } from '../services.ts'
import type { Star, User } from '../db/models.ts'
import { analysisModels, type FitModel, type FitModelVersion, type PeriodogramRun } from '../db/models-analysis.ts'
import { restoreDisplayCurves } from '../analyses/periodogram-store.ts'
import { ValidationError } from '../errors.ts'
import { rvHash, type Row } from '../analyses/data.ts'
import { compareModels } from '../analyses/compare.ts'
import { dataContentHash } from '../../shared/report/hash.ts'
import { methodsParagraph } from '../../shared/report/methods.ts'
import type { ReportSnapshot, SnapshotPeriodogram, SnapshotSampling } from '../../shared/api/reports.ts'

let product: ReportSnapshot['product'] | undefined

/** package.json's version and the checkout's git commit (STARSWAY_COMMIT when set; null when neither is known). */
export function productVersion(): ReportSnapshot['product'] {
  if (product) return product
  let version = '0.0.0'
  try { version = (JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { version: string }).version } catch { /* keep 0.0.0 */ }
  let commit: string | null = process.env.STARSWAY_COMMIT ?? null
  if (!commit) {
    try {
      commit = execFileSync('git', ['rev-parse', 'HEAD'], { cwd: new URL('../..', import.meta.url), stdio: ['ignore', 'pipe', 'ignore'], timeout: 3000 }).toString().trim() || null
    } catch { commit = null }
  }
  product = { name: 'Starsway', version, commit }
  return product
}

interface MeasurementRow extends Row { excluded_reason: string | null; excluded_at: Date | null; excluder_id: number | null; excluder_name: string | null }

async function measurementRows(s: Services, star: Star): Promise<MeasurementRow[]> {
  return s.sequelize.query<MeasurementRow>(
    `SELECT m.id, d.instrument, m.time, m.rv, m.error, m.indicators, m.excluded, m.excluded_reason, m.excluded_at,
            u.id AS excluder_id, u.name AS excluder_name
       FROM measurements m JOIN datasets d ON d.id = m.dataset_id LEFT JOIN users u ON u.id = m.excluded_by
      WHERE m.star_id = :id ORDER BY m.time, m.id`,
    { replacements: { id: star.id }, type: QueryTypes.SELECT },
  )
}

function periodogramSnapshot(r: PeriodogramRun | null): SnapshotPeriodogram | null {
  if (!r) return null
  return {
    id: r.id, kind: r.kind, settings: r.settings, data: r.data, curve: r.result.curve, fapLevels: r.result.fapLevels,
    peaks: r.result.peaks.slice(0, 5).map((p) => ({ period: p.period, frequency: p.frequency, power: p.power, fap: p.fap })),
    createdAt: new Date(r.createdAt).toISOString(),
  }
}

/** The time scale of the fitted instruments' datasets ('unknown' when they differ or were not recorded). */
async function fittedTimeScale(s: Services, starId: number, instruments: string[]): Promise<string> {
  const rows = await s.sequelize.query<{ time_scale: string }>(
    'SELECT DISTINCT time_scale FROM datasets WHERE star_id = :starId AND instrument IN (:instruments)',
    { replacements: { starId, instruments: instruments.length ? instruments : [''] }, type: QueryTypes.SELECT },
  )
  return rows.length === 1 ? rows[0]!.time_scale : 'unknown'
}

/**
 * The velocity periodogram the report shows and its methods text describe: the latest run over
 * exactly the instruments of the fit; a run over another selection (a test on one instrument, say)
 * is never picked silently. Null when none matches.
 */
async function periodogramOfFit(PeriodogramRun: ReturnType<typeof analysisModels>['PeriodogramRun'], starId: number, fitted: string[]): Promise<PeriodogramRun | null> {
  const runs = await PeriodogramRun.findAll({ where: { starId, kind: 'rv' }, order: [['createdAt', 'DESC'], ['id', 'DESC']], limit: 50 })
  const want = [...fitted].sort().join('\u0000')
  return runs.find((r) => [...(r.data?.instruments ?? [])].sort().join('\u0000') === want) ?? null
}

interface SamplingRow { id: number; star_id: number; model_version_id: number | null; state: string; settings: Omit<SnapshotSampling['settings'], 'burn'> & { burn: number | null; untilConverged?: boolean }; result: null | { parameters: Array<SnapshotSampling['parameters'][number] & { fixed?: boolean }>; settings?: { steps: number; stepsDone: number; burn: number; thin: number; keptThin?: number; untilConverged?: boolean }; diagnostics: { converged: boolean; acceptance: number; warnings: string[] }; sample: { names: string[]; units: string[]; step: number[]; walker: number[]; columns: Array<Array<number | null>> } }; finished_at: Date | null }

/** Every sampled or derived parameter's thinned draws (the run's plot sample), without the columns the model held fixed. */
function posteriorSamples(result: NonNullable<SamplingRow['result']>): NonNullable<SnapshotSampling['samples']> {
  const sample = result.sample
  const fixed = result.parameters.filter((p) => p.fixed).map((p) => p.name)
  const keep = sample.names.map((n, j) => ({ n, j })).filter(({ n }) => !fixed.includes(n))
  return {
    names: keep.map((k) => k.n), units: keep.map((k) => sample.units[k.j] ?? ''), step: sample.step ?? [], walker: sample.walker ?? [],
    columns: keep.map((k) => (sample.columns[k.j] ?? []).map((x) => x ?? Number.NaN)), fixed,
  }
}

/** The run's settings as it went: steps done, the burn-in and thinning used (a run until converged chose them itself). */
function settingsAsRun(run: SamplingRow): SnapshotSampling['settings'] {
  const r = run.result?.settings
  const base = { walkers: run.settings.walkers, seed: run.settings.seed }
  if (!r) return { ...base, steps: run.settings.steps, burn: run.settings.burn ?? Math.floor(run.settings.steps / 4), thin: run.settings.thin }
  return {
    ...base, steps: r.stepsDone, burn: r.burn, thin: r.keptThin ?? r.thin,
    ...(r.untilConverged ? { untilConverged: true, budget: r.steps } : {}),
  }
}

/** A succeeded sampling run of this model version (400 naming samplingRunId otherwise). */
async function samplingSnapshot(s: Services, star: Star, v: FitModelVersion, runId: number): Promise<SnapshotSampling> {
  const [exists] = await s.sequelize.query<{ t: string | null }>(`SELECT to_regclass('public.sampling_runs')::text AS t`, { type: QueryTypes.SELECT })
  const rows = exists?.t
    ? await s.sequelize.query<SamplingRow>(`SELECT id, star_id, model_version_id, state, settings, result, finished_at FROM sampling_runs WHERE id = :id`, { replacements: { id: runId }, type: QueryTypes.SELECT })
    : []
  const run = rows[0]
  if (!run || run.star_id !== star.id) throw new ValidationError('samplingRunId: this star has no sampling run with that id.', 'samplingRunId')
  if (run.model_version_id !== v.id) throw new ValidationError(`samplingRunId: that run samples another version of the model; sample version ${v.version} or freeze without it.`, 'samplingRunId')
  if (run.state !== 'succeeded' || !run.result) throw new ValidationError(`samplingRunId: that run has not succeeded (it is ${run.state}).`, 'samplingRunId')
  const sample = run.result.sample
  const wanted = sample.names.map((n, j) => ({ n, j })).filter(({ n }) => /^(P|K|e) [b-z]$/.test(n))
  const nRows = sample.columns[0]?.length ?? 0
  const step = Math.max(1, Math.ceil(nRows / 1500))
  const pick = (col: Array<number | null>) => col.filter((_, i) => i % step === 0).map((x) => x ?? Number.NaN)
  return {
    runId: run.id, settings: settingsAsRun(run), parameters: run.result.parameters,
    diagnostics: { converged: run.result.diagnostics.converged, acceptance: run.result.diagnostics.acceptance, warnings: run.result.diagnostics.warnings },
    corner: { names: wanted.map((w) => w.n), units: wanted.map((w) => sample.units[w.j] ?? ''), columns: wanted.map((w) => pick(sample.columns[w.j] ?? [])) },
    samples: posteriorSamples(run.result),
    finishedAt: run.finished_at ? new Date(run.finished_at).toISOString() : null,
  }
}

export async function buildSnapshot(s: Services, actor: User, star: Star, model: FitModel, title: string, samplingRunId: number | undefined): Promise<ReportSnapshot> {
  const { FitModelVersion, PeriodogramRun } = analysisModels(s.sequelize, s.models)
  const v = await FitModelVersion.findOne({ where: { modelId: model.id, version: model.currentVersion }, include: [{ model: s.models.User, as: 'authorUser', attributes: ['id', 'name'] }] })
  if (!v || v.status !== 'fitted' || !v.result) {
    throw new ValidationError(`modelId: version ${model.currentVersion} of "${model.name}" has not been fitted; fit it before freezing a report.`, 'modelId')
  }
  const result = v.result
  const rows = await measurementRows(s, star)
  const fittedInstruments = new Set(result.instruments.map((i) => i.name))
  const inModel = rows.filter((r) => fittedInstruments.has(r.instrument))
  const fitted = new Map(result.residuals.map((p) => [p.measurementId, p]))
  const points = inModel.map((r) => {
    const f = fitted.get(r.id)
    return { id: r.id, instrument: r.instrument, time: r.time, rv: r.rv, error: r.error, included: !!f, model: f?.model ?? null, residual: f?.residual ?? null }
  })
  const exclusions = inModel.filter((r) => r.excluded).map((r) => ({
    id: r.id, instrument: r.instrument, time: r.time, reason: r.excluded_reason,
    by: r.excluder_id ? { id: r.excluder_id, name: r.excluder_name ?? '' } : null, at: r.excluded_at ? new Date(r.excluded_at).toISOString() : null,
  }))
  const included = points.filter((p) => p.included)
  const nowUsed = inModel.filter((r) => !r.excluded && Number.isFinite(r.time) && Number.isFinite(r.rv) && r.error > 0)
  const changedSinceFit = rvHash(nowUsed) !== result.data.hash
  const timeScale = await fittedTimeScale(s, star.id, result.data.instruments)
  const rvRun = await periodogramOfFit(PeriodogramRun, star.id, result.data.instruments)
  const resRun = await PeriodogramRun.findOne({ where: { starId: star.id, kind: 'residuals', modelVersionId: v.id }, order: [['createdAt', 'DESC'], ['id', 'DESC']] })
  const sampling = samplingRunId !== undefined ? await samplingSnapshot(s, star, v, samplingRunId) : null
  const cmp = await compareModels(s, star)
  const comparison = cmp.rows.length > 1 ? {
    rows: cmp.rows.map((r) => ({ modelId: r.modelId, name: r.name, version: r.version, planets: r.planets, trend: r.trend, bic: r.bic, deltaBic: r.deltaBic, evidence: r.evidence, preferred: r.preferred, comparable: r.comparable })),
    rule: cmp.rule, reading: cmp.reading,
  } : null
  for (const run of [rvRun, resRun]) if (run) await restoreDisplayCurves(s, run) // curves live in periodogram_curves
  const periodogram = periodogramSnapshot(rvRun)
  const methods = methodsParagraph({
    nPoints: included.length, instruments: result.data.instruments, nExcluded: exclusions.length,
    periodogram: periodogram ? periodogram.settings : null, residualPeriodogram: !!resRun,
    planets: result.planets.length, trend: v.spec.trend ?? 'none', compared: !!comparison,
    derived: result.planets.some((p) => p.msiniMjup !== null), sampling: sampling ? sampling.settings : null,
    noise: result.noise ?? null,
  })
  return {
    format: 'starsway-report/1', title, frozenAt: new Date().toISOString(), frozenBy: { id: actor.id, name: actor.name },
    product: productVersion(),
    star: { id: star.id, name: star.name, massMsun: star.massMsun, massErrMsun: star.massErrMsun, radiusRsun: star.radiusRsun, teffK: star.teffK, luminosityLsun: star.luminosityLsun, raDeg: star.raDeg, decDeg: star.decDeg },
    model: { id: model.id, name: v.name, version: v.version, versionId: v.id, spec: v.spec, note: v.note, author: v.authorUser ? { id: v.authorUser.id, name: v.authorUser.name } : null, createdAt: new Date(v.createdAt).toISOString() },
    result,
    data: {
      hash: dataContentHash(included, exclusions), nIncluded: included.length, nExcluded: exclusions.length,
      instruments: result.data.instruments, changedSinceFit, timeScale, points, exclusions,
    },
    periodogram, residualPeriodogram: periodogramSnapshot(resRun), sampling, comparison,
    settings: { fit: { trend: v.spec.trend ?? 'none', instruments: v.spec.instruments ?? null, iterations: result.stats.iterations, status: result.stats.status }, sampling: sampling?.settings ?? null },
    methods,
  }
}

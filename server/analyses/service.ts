import { QueryTypes, literal, type Transaction } from 'sequelize'
import type { Services } from '../services.ts'
import type { Star, User } from '../db/models.ts'
import { analysisModels, type FitModel, type FitModelVersion, type PeriodogramRun } from '../db/models-analysis.ts'
import { ConflictError, NotFoundError, ValidationError } from '../errors.ts'
import { record } from '../audit/service.ts'
import { ComputeError, defaultPool, type ComputePool } from '../compute/pool.ts'
import { contentHash, indicatorColumns, instrumentsOf, loadRv, selectRows, selection, starRows } from './data.ts'
import { fitJson, specFromFit } from './fit-json.ts'
import { whiteNoise } from '../compute/fit-noise.ts'
import type { ActivitySearchOutput } from '../compute/search-activity.ts'
import type {
  CreateModelRequest, DuplicateModelRequest, FitModelRequest, FitResultJson, ModelDetail, ModelSpec, ModelSummary, ModelVersion,
  PeriodogramRun as PeriodogramRunJson, PeriodogramSummary, RunPeriodogramRequest, SearchRequest, SearchResponse, UpdateModelRequest,
} from '../../shared/api/analyses.ts'
import { modelSpecSchema } from '../../shared/api/analyses.ts'
import { enforceTeamBound, fullCurveNote, readCurves, saveCurves, splitForStorage, teamFullBytes, withCurves, type RunCurves } from './periodogram-store.ts'
import { decodeCurves } from './periodogram-codec.ts'

export function pool(s: Services): ComputePool { return s.compute ?? defaultPool() }
export const M = (s: Services) => analysisModels(s.sequelize, s.models)
const ref = (u: User | null | undefined) => (u ? { id: u.id, name: u.name } : null)
const iso = (d: Date) => new Date(d).toISOString()
/** JSON with sorted keys: PostgreSQL's JSONB does not keep key order, so specs are compared in this form. */
function canonical(v: unknown): string {
  if (Array.isArray(v)) return `[${v.map(canonical).join(',')}]`
  if (v && typeof v === 'object') {
    return `{${Object.keys(v).filter((k) => (v as Record<string, unknown>)[k] !== undefined).sort()
      .map((k) => `${JSON.stringify(k)}:${canonical((v as Record<string, unknown>)[k])}`).join(',')}}`
  }
  return JSON.stringify(v)
}

/** Fewest points a periodogram is computed for. */
export const MIN_PERIODOGRAM_POINTS = 5

// ---------------------------------------------------------------------------------------------
// Periodograms

function runJson(r: PeriodogramRun): PeriodogramRunJson {
  return {
    id: r.id, starId: r.starId, kind: r.kind, indicator: r.indicator, modelVersionId: r.modelVersionId,
    settings: r.settings, data: r.data, result: r.result, createdBy: ref(r.creator), createdAt: iso(r.createdAt),
  }
}

/**
 * Runs and stores a periodogram of the star's velocities, of one activity indicator, or of a
 * fitted model version's residuals (see server/API.md for how zero points and errors are treated).
 */
export async function runPeriodogram(s: Services, actor: User, star: Star, req: RunPeriodogramRequest): Promise<PeriodogramRunJson> {
  const rows = await starRows(s, star)
  let t: number[], y: number[], dy: number[], inst: number[] | undefined
  let sel
  let modelVersionId: number | null = null
  if (req.kind === 'residuals') {
    const v = await M(s).FitModelVersion.findByPk(req.modelVersionId!)
    const model = v ? await M(s).FitModel.findByPk(v.modelId) : null
    if (!v || !model || model.starId !== star.id) throw new ValidationError('modelVersionId: no model version of this star has that id.', 'modelVersionId')
    if (v.status !== 'fitted' || !v.result) throw new ValidationError('modelVersionId: that version has not been fitted; fit the model first.', 'modelVersionId')
    modelVersionId = v.id
    const byId = new Map(rows.map((r) => [r.id, r]))
    const jitter = new Map(v.result.instruments.map((i) => [i.name, i.jitter ?? 0]))
    const used = v.result.residuals.map((p) => ({ p, r: byId.get(p.measurementId) }))
      .filter((x): x is { p: typeof x.p; r: NonNullable<typeof x.r> } => !!x.r && !x.r.excluded)
      .filter((x) => !req.instruments || req.instruments.includes(x.r.instrument))
    if (req.instruments) selectRows(rows, req.instruments, 'instruments') // names checked
    t = used.map((x) => x.r.time); y = used.map((x) => x.p.residual)
    dy = used.map((x) => Math.sqrt(x.r.error ** 2 + (jitter.get(x.r.instrument) ?? 0) ** 2))
    const names = [...new Set(used.map((x) => x.r.instrument))]
    sel = selection(used.map((x) => x.r), v.result.residuals.length - used.length, names,
      contentHash(used.map((x) => `${x.r.id}:${x.r.time}:${x.p.residual}:${x.r.error}`)))
  } else {
    const picked = selectRows(rows, req.instruments, 'instruments')
    let used = picked.used
    const names = picked.instruments
    if (req.kind === 'indicator') {
      const name = req.indicator!
      used = used.filter((r) => Number.isFinite(r.indicators?.[name]))
      if (!used.length) {
        const known = [...new Set(rows.flatMap((r) => Object.keys(r.indicators ?? {})))]
        throw new ValidationError(`indicator: no selected point has "${name}" (the star's indicators: ${known.length ? known.join(', ') : 'none'}).`, 'indicator')
      }
      y = used.map((r) => r.indicators[name]!)
      dy = used.map(() => 1)
      sel = selection(used, picked.nExcluded, [...new Set(used.map((r) => r.instrument))],
        contentHash(used.map((r) => `${r.id}:${r.time}:${r.indicators[name]}`)))
    } else {
      y = used.map((r) => r.rv)
      dy = used.map((r) => r.error)
      sel = selection(used, picked.nExcluded, names, contentHash(used.map((r) => `${r.id}:${r.time}:${r.rv}:${r.error}`)))
    }
    t = used.map((r) => r.time)
    const index = new Map<string, number>()
    inst = used.map((r) => { let k = index.get(r.instrument); if (k === undefined) { k = index.size; index.set(r.instrument, k) } return k })
  }
  if (t.length < MIN_PERIODOGRAM_POINTS) {
    throw new ValidationError(`instruments: ${t.length} usable points (excluded points left out); a periodogram needs at least ${MIN_PERIODOGRAM_POINTS}.`, 'instruments')
  }
  // Grid defaults, centring and peaks are the core's (`periodogramReport`), as in the CLI.
  const baseline = sel.baseline
  if (req.minPeriod !== undefined && req.maxPeriod !== undefined && !(req.maxPeriod > req.minPeriod)) {
    throw new ValidationError(`maxPeriod: must be larger than minPeriod (${req.minPeriod} d); the data cover ${baseline.toFixed(1)} d.`, 'maxPeriod')
  }
  const { settings: grid, full, ...result } = await pool(s).run('periodogram', {
    t: Float64Array.from(t), y: Float64Array.from(y), dy: Float64Array.from(dy),
    minPeriod: req.minPeriod, maxPeriod: req.maxPeriod, oversample: req.oversample,
    instrument: inst ? Int32Array.from(inst) : undefined, keplerian: req.kind === 'rv', full: true,
  }).catch((err: unknown) => {
    // the numerical core names the offending option (e.g. a grid too large)
    if (err instanceof ComputeError && err.remoteName === 'RangeError') {
      const field = /minPeriod|maxPeriod|oversample/.exec(err.message)?.[0] ?? 'oversample'
      throw new ValidationError(`${field}: ${err.message}`, field)
    }
    throw err
  })
  const { minPeriod, maxPeriod, oversample } = grid
  const top = result.peaks[0]
  // curves go to periodogram_curves in binary (display copies + every power), the rest stays JSON
  const stored = splitForStorage(result, full)
  const run = await s.sequelize.transaction(async (transaction) => {
    const r = await M(s).PeriodogramRun.create({
      starId: star.id, kind: req.kind, indicator: req.kind === 'indicator' ? req.indicator! : null, modelVersionId,
      settings: { minPeriod, maxPeriod, oversample, instruments: req.instruments ?? null }, data: sel, result: stored.json,
      topPeak: top ? { period: top.period, frequency: top.frequency, power: top.power, fap: top.fap } : null,
      createdBy: actor.id,
    }, { transaction })
    await record(s, {
      teamId: star.teamId, userId: actor.id, action: 'periodogram.run', entity: 'periodogram', entityId: r.id,
      detail: { starId: star.id, kind: req.kind, indicator: r.indicator, modelVersionId, nPoints: sel.nPoints, topPeriod: top?.period ?? null },
    }, transaction)
    await saveCurves(s, transaction, r.id, stored.display, stored.full)
    return r
  })
  // The team's bound: one sum after the commit (so it sees concurrent runs), the locked pass only when over.
  const bound = s.config.periodogramTeamBytes
  if (stored.full && await teamFullBytes(s, star.teamId) > bound) {
    const kept = await enforceTeamBound(s, star.teamId, bound, run.id)
    if (kept.dropped.length) {
      await record(s, {
        teamId: star.teamId, userId: actor.id, action: 'periodogram.curves_dropped', entity: 'periodogram', entityId: run.id,
        detail: { runIds: kept.dropped, keptBytes: kept.bytes, limitBytes: bound },
      })
    }
  }
  // The answer is what a read of the run gives (the plot curves through the codec), without reading it back.
  const curves: RunCurves = {
    display: decodeCurves(stored.display), full: null, fullState: stored.full ? 'stored' : 'none',
    fullBytes: stored.full?.byteLength ?? 0, fullDroppedAt: null,
  }
  const json: PeriodogramRunJson = { ...runJson(run), createdBy: ref(actor) }
  json.result = withCurves(stored.json, curves)
  json.result.downsampling = `${stored.json.downsampling}; ${fullCurveNote(run.id, curves, false, bound)}`
  return json
}

/**
 * One run with its plot curves (≤ 4000 points each), or with every computed power when `full`
 * (409 when that run's full curve was dropped under the team's bound or never stored).
 */
export async function getPeriodogram(s: Services, id: number, opts: { full?: boolean } = {}): Promise<PeriodogramRunJson> {
  const r = await M(s).PeriodogramRun.findByPk(id, { include: [{ model: s.models.User, as: 'creator', attributes: ['id', 'name'] }] })
  if (!r) throw new NotFoundError('Periodogram')
  const json = runJson(r)
  const curves = await readCurves(s, id, opts)
  if (!curves) return json
  const bound = s.config.periodogramTeamBytes
  if (opts.full && curves.fullState !== 'stored') throw new ConflictError(`full: ${fullCurveNote(id, curves, false, bound)}.`, 'full')
  const served = !!opts.full
  json.result = withCurves(r.result, curves, served)
  json.result.downsampling = served
    ? `full grid (${r.result.grid.count} frequencies; Keplerian ${r.result.keplerian?.count ?? 0} periods); ${fullCurveNote(id, curves, true, bound)}`
    : `${r.result.downsampling}; ${fullCurveNote(id, curves, false, bound)}`
  return json
}

export async function listPeriodograms(s: Services, star: Star): Promise<PeriodogramSummary[]> {
  const rows = await M(s).PeriodogramRun.findAll({
    where: { starId: star.id }, order: [['createdAt', 'DESC'], ['id', 'DESC']],
    attributes: { exclude: ['result'] },
    include: [{ model: s.models.User, as: 'creator', attributes: ['id', 'name'] }],
  })
  return rows.map((r) => ({
    id: r.id, starId: r.starId, kind: r.kind, indicator: r.indicator, modelVersionId: r.modelVersionId,
    settings: r.settings, data: r.data, topPeak: r.topPeak, createdBy: ref(r.creator), createdAt: iso(r.createdAt),
  }))
}

// ---------------------------------------------------------------------------------------------
// Models

function versionJson(v: FitModelVersion): ModelVersion {
  return {
    id: v.id, modelId: v.modelId, version: v.version, name: v.name, spec: v.spec, status: v.status, result: v.result,
    note: v.note, author: ref(v.authorUser), createdAt: iso(v.createdAt),
  }
}

function summaryJson(m: FitModel, cur: FitModelVersion): ModelSummary {
  return {
    id: m.id, starId: m.starId, name: m.name, currentVersion: m.currentVersion, status: cur.status,
    planets: cur.spec.planets.length, trend: cur.spec.trend, bic: cur.result?.stats.bic ?? null,
    createdBy: ref(m.creator), createdAt: iso(m.createdAt), updatedAt: iso(m.updatedAt),
  }
}

const withAuthor = (s: Services) => [{ model: s.models.User, as: 'authorUser', attributes: ['id', 'name'] }]

export async function loadModel(s: Services, id: number): Promise<FitModel | null> {
  return M(s).FitModel.findOne({ where: { id, archivedAt: null }, include: [{ model: s.models.User, as: 'creator', attributes: ['id', 'name'] }] })
}

export async function modelDetail(s: Services, id: number): Promise<ModelDetail> {
  const m = await loadModel(s, id)
  if (!m) throw new NotFoundError('Model')
  // Every version's row, but only the current one's result (a result holds every residual; a long
  // history would otherwise be read and parsed in full for one page); the others give their BIC.
  const current = Number(m.currentVersion)
  const versions = await M(s).FitModelVersion.findAll({
    where: { modelId: id }, order: [['version', 'ASC']], include: withAuthor(s),
    attributes: {
      exclude: ['result'],
      include: [
        [literal(`CASE WHEN "FitModelVersion"."version" = ${current} THEN "FitModelVersion"."result" END`), 'result'],
        [literal(`("FitModelVersion"."result" -> 'stats' ->> 'bic')::float8`), 'bic'],
      ],
    },
  })
  const cur = versions.find((v) => v.version === current)!
  return {
    ...summaryJson(m, cur),
    current: versionJson(cur),
    versions: versions.map((v) => ({
      id: v.id, version: v.version, name: v.name, status: v.status, note: v.note, planets: v.spec.planets.length,
      bic: (v.get('bic') as number | null) ?? null, author: ref(v.authorUser), createdAt: iso(v.createdAt),
    })),
  }
}

export async function getVersion(s: Services, model: FitModel, version: number): Promise<ModelVersion> {
  const v = await M(s).FitModelVersion.findOne({ where: { modelId: model.id, version }, include: withAuthor(s) })
  if (!v) throw new NotFoundError('Model version')
  return versionJson(v)
}

/**
 * The star's models in use, newest first, each with its current version's status, planets, trend
 * and BIC: one query (the BIC read from the current version's result only, never the others').
 */
export async function listModels(s: Services, star: Star): Promise<ModelSummary[]> {
  const rows = await s.sequelize.query<{
    id: number; star_id: number; name: string; current_version: number; created_at: Date; updated_at: Date
    creator_id: number | null; creator_name: string | null; status: ModelSummary['status']; spec: ModelSpec; bic: number | null
  }>(
    `SELECT f.id, f.star_id, f.name, f.current_version, f.created_at, f.updated_at, u.id AS creator_id, u.name AS creator_name,
            v.status, v.spec, (v.result->'stats'->>'bic')::float8 AS bic
       FROM fit_models f
       JOIN fit_model_versions v ON v.model_id = f.id AND v.version = f.current_version
       LEFT JOIN users u ON u.id = f.created_by
      WHERE f.star_id = :starId AND f.archived_at IS NULL
      ORDER BY f.created_at DESC, f.id DESC`,
    { replacements: { starId: star.id }, type: QueryTypes.SELECT },
  )
  return rows.map((r) => ({
    id: r.id, starId: r.star_id, name: r.name, currentVersion: r.current_version, status: r.status,
    planets: r.spec.planets.length, trend: r.spec.trend, bic: r.bic,
    createdBy: r.creator_id !== null ? { id: r.creator_id, name: r.creator_name ?? '' } : null,
    createdAt: iso(r.created_at), updatedAt: iso(r.updated_at),
  }))
}

/** Checks that the spec's instruments exist for this star (400 naming `spec.instruments`). */
async function checkSpec(s: Services, star: Star, spec: ModelSpec): Promise<void> {
  const rows = spec.instruments?.length || spec.instrumentTerms?.length ? await starRows(s, star) : []
  if (spec.instruments && spec.instruments.length) selectRows(rows, spec.instruments, 'spec.instruments')
  if (spec.instrumentTerms?.length) {
    const names = spec.instruments?.length ? spec.instruments : instrumentsOf(rows)
    const bad = spec.instrumentTerms.find((x) => !names.includes(x.instrument))
    if (bad) throw new ValidationError(`spec.instrumentTerms: "${bad.instrument}" is not among the model's instruments (${names.join(', ') || 'none'}).`, 'spec.instrumentTerms')
    const twice = spec.instrumentTerms.find((x, k) => spec.instrumentTerms!.findIndex((y) => y.instrument === x.instrument) !== k)
    if (twice) throw new ValidationError(`spec.instrumentTerms: "${twice.instrument}" is listed twice; give one line per instrument.`, 'spec.instrumentTerms')
  }
}

export async function addVersion(
  s: Services, actor: User, model: FitModel, fields: Pick<FitModelVersion, 'name' | 'spec' | 'status' | 'result' | 'note'>,
  transaction: Transaction,
): Promise<FitModelVersion> {
  const version = model.currentVersion + 1
  const v = await M(s).FitModelVersion.create({ modelId: model.id, version, author: actor.id, ...fields }, { transaction })
  model.set({ currentVersion: version, name: fields.name })
  model.changed('updatedAt', true)
  await model.save({ transaction })
  return v
}

export async function lockModel(s: Services, id: number, transaction: Transaction): Promise<FitModel> {
  const m = await M(s).FitModel.findOne({ where: { id, archivedAt: null }, lock: transaction.LOCK.UPDATE, transaction })
  if (!m) throw new NotFoundError('Model')
  return m
}

export async function createModel(s: Services, actor: User, star: Star, req: CreateModelRequest, extra: { note?: string; status?: FitModelVersion['status']; result?: FitModelVersion['result']; action?: string; detail?: Record<string, unknown> } = {}): Promise<ModelDetail> {
  const spec = modelSpecSchema.parse(req.spec)
  await checkSpec(s, star, spec)
  const id = await s.sequelize.transaction(async (transaction) => {
    const m = await M(s).FitModel.create({ starId: star.id, name: req.name, currentVersion: 1, createdBy: actor.id }, { transaction })
    await M(s).FitModelVersion.create({
      modelId: m.id, version: 1, name: req.name, spec, status: extra.status ?? 'draft', result: extra.result ?? null,
      note: extra.note ?? 'created', author: actor.id,
    }, { transaction })
    await record(s, {
      teamId: star.teamId, userId: actor.id, action: extra.action ?? 'model.create', entity: 'model', entityId: m.id,
      detail: { starId: star.id, name: req.name, version: 1, planets: spec.planets.length, ...extra.detail },
    }, transaction)
    return m.id
  })
  return modelDetail(s, id)
}

/** A new version with the changed name and/or spec; the previous version stays as it was. */
export async function updateModel(s: Services, actor: User, star: Star, model: FitModel, req: UpdateModelRequest): Promise<ModelDetail> {
  const spec = req.spec ? modelSpecSchema.parse(req.spec) : undefined
  if (spec) await checkSpec(s, star, spec)
  await s.sequelize.transaction(async (transaction) => {
    const m = await lockModel(s, model.id, transaction)
    const cur = (await M(s).FitModelVersion.findOne({ where: { modelId: m.id, version: m.currentVersion }, transaction }))!
    const name = req.name ?? cur.name
    const specChanged = spec !== undefined && canonical(spec) !== canonical(cur.spec)
    const v = await addVersion(s, actor, m, specChanged
      ? { name, spec: spec!, status: 'draft', result: null, note: 'updated' }
      : { name, spec: cur.spec, status: cur.status, result: cur.result, note: name !== cur.name ? 'renamed' : 'updated' }, transaction)
    await record(s, {
      teamId: star.teamId, userId: actor.id, action: 'model.update', entity: 'model', entityId: m.id,
      detail: { starId: star.id, version: v.version, from: cur.version, specChanged, ...(name !== cur.name ? { name: { from: cur.name, to: name } } : {}) },
    }, transaction)
  })
  return modelDetail(s, model.id)
}

/**
 * Fits a spec in the worker pool under its noise model (white, or planets + GP) with its pinned
 * jitters; returns the stored JSON (with its `noise` section and, for a GP, the activity per row).
 */
export async function fitSpecJson(s: Services, star: Star, spec: ModelSpec, maxIterations?: number): Promise<FitResultJson> {
  const nParamsMin = spec.planets.length * 5 + 2
  const { data, ids, selection: sel } = await loadRv(s, star, spec.instruments, 'spec.instruments', Math.max(nParamsMin, 3))
  const out = await pool(s).run('fit', {
    data, planets: spec.planets, trend: spec.trend, maxIterations, noise: spec.noise, instrumentTerms: spec.instrumentTerms,
  }).catch((err: unknown) => {
    // the fitter names the offending option (a prior on a fixed parameter, a fixed phase without a value…)
    if (err instanceof ComputeError && err.remoteName === 'RangeError') throw new ValidationError(`spec: ${err.message}`, 'spec')
    throw err
  })
  const result = fitJson(out.fit, data, ids, star, sel)
  const activity = out.activity
  if (activity) result.residuals = result.residuals.map((r, i) => ({ ...r, activity: activity[i]! }))
  return { ...result, noise: out.noise }
}

/** Fits the current version's spec in the worker pool and stores the result as the next version. */
export async function fitModel(s: Services, actor: User, star: Star, model: FitModel, req: FitModelRequest): Promise<ModelDetail> {
  const cur = (await M(s).FitModelVersion.findOne({ where: { modelId: model.id, version: model.currentVersion } }))!
  const spec = cur.spec
  const result = await fitSpecJson(s, star, spec, req.maxIterations)
  const sel = result.data
  const status = result.stats.status === 'failed' ? 'failed' : 'fitted'
  await s.sequelize.transaction(async (transaction) => {
    const m = await lockModel(s, model.id, transaction)
    if (m.currentVersion !== cur.version) {
      throw new ConflictError(`The model changed (version ${m.currentVersion}) while version ${cur.version} was being fitted: fit again.`, 'version')
    }
    const v = await addVersion(s, actor, m, { name: cur.name, spec, status, result, note: 'fitted' }, transaction)
    await record(s, {
      teamId: star.teamId, userId: actor.id, action: 'model.fit', entity: 'model', entityId: m.id,
      detail: {
        starId: star.id, version: v.version, status, converged: result.stats.converged, bic: result.stats.bic, nPoints: sel.nPoints, dataHash: sel.hash,
        noise: result.noise?.kind ?? 'white',
      },
    }, transaction)
  })
  return modelDetail(s, model.id)
}

export async function duplicateModel(s: Services, actor: User, star: Star, model: FitModel, req: DuplicateModelRequest): Promise<ModelDetail> {
  const cur = (await M(s).FitModelVersion.findOne({ where: { modelId: model.id, version: model.currentVersion } }))!
  return createModel(s, actor, star, { name: req.name ?? `${cur.name} (copy)`.slice(0, 120), spec: cur.spec }, {
    status: cur.status, result: cur.result, note: `duplicated from model ${model.id} version ${cur.version}`,
    action: 'model.duplicate', detail: { fromModelId: model.id, fromVersion: cur.version },
  })
}

export async function archiveModel(s: Services, actor: User, star: Star, model: FitModel): Promise<void> {
  await s.sequelize.transaction(async (transaction) => {
    const m = await lockModel(s, model.id, transaction)
    m.archivedAt = new Date()
    await m.save({ transaction })
    await record(s, { teamId: star.teamId, userId: actor.id, action: 'model.archive', entity: 'model', entityId: m.id, detail: { starId: star.id, name: m.name, version: m.currentVersion } }, transaction)
  })
}

// ---------------------------------------------------------------------------------------------
// Search

/** Runs the numerical core's search (in the pool) and saves the chosen solution as a fitted model. */
export async function search(s: Services, actor: User, star: Star, req: SearchRequest): Promise<SearchResponse> {
  const { data, ids, used, selection: sel } = await loadRv(s, star, req.instruments, 'instruments', 10)
  // The core's defaults (SEARCH_DEFAULTS) unless the request sets an option: the same as the CLI.
  // With activity indicators every signal is vetted against them (activity candidates left out of the model).
  const indicators = indicatorColumns(used)
  const options = { trend: req.trend, maxPlanets: req.maxPlanets, falseAlarm: req.falseAlarm, fapThreshold: req.fapThreshold, minPeriod: req.minPeriod, maxPeriod: req.maxPeriod }
  const out: ActivitySearchOutput = await (indicators.length ? pool(s).run('activitySearch', { data, options, indicators }) : pool(s).run('search', { data, options })).catch((err: unknown) => {
    if (err instanceof ComputeError && err.remoteName === 'RangeError') {
      const field = /minPeriod|maxPeriod/.exec(err.message)?.[0] ?? 'minPeriod'
      throw new ValidationError(`${field}: ${err.message}`, field)
    }
    throw err
  })
  const result = { ...fitJson(out.fit, data, ids, star, sel), search: out.report, noise: out.fitNoise ?? whiteNoise(data, out.fit, data.instrumentNames.map(() => null)) }
  const rows = out.activityRows
  if (rows) result.residuals = result.residuals.map((r, i) => ({ ...r, activity: rows[i]! }))
  const name = `Search: ${out.planets} planet${out.planets === 1 ? '' : 's'}`
  const spec = { ...specFromFit(out.fit, out.trend, req.instruments ?? null), ...(out.noise ? { noise: out.noise } : {}) }
  const model = await createModel(s, actor, star, { name: out.noise ? `${name} + GP` : name, spec }, {
    status: out.fit.status === 'failed' ? 'failed' : 'fitted', result, note: 'search', action: 'model.search',
    detail: {
      planets: out.planets, trend: out.trend, steps: out.steps.length, dataHash: sel.hash,
      activityCandidates: out.report.activity?.candidates.filter((c) => c.activity).map((c) => c.period) ?? [],
    },
  })
  return {
    model,
    steps: out.steps.map((st) => ({ ...st, nextPeakFap: st.nextPeakFap ?? null, nextPeakPeriod: st.nextPeakPeriod ?? null })),
    chosen: { planets: out.planets, trend: out.trend },
    report: out.report,
  }
}

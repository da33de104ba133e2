// Activity in the model's history: overruling an activity label of the search (the signal is counted
// as a planet: a new, fitted model version whose note says who, which signal, why it was labelled and
// why it is overruled; audited), and "planets + GP" beside "planets + white noise" (the same planets
// with a GP noise model, the rotation period taken from the strongest significant indicator peak).
import type { Services } from '../services.ts'
import type { Star, User } from '../db/models.ts'
import type { FitModel } from '../db/models-analysis.ts'
import { ConflictError, ValidationError } from '../errors.ts'
import { record } from '../audit/service.ts'
import { addVersion, createModel, fitModel, fitSpecJson, lockModel, M, modelDetail, pool } from './service.ts'
import { indicatorColumns, loadRv } from './data.ts'
import type { ActivityCandidate, GpNoiseSpec, GpVariantRequest, ModelDetail, ModelSpec, OverruleRequest, PlanetSpec } from '../../shared/api/analyses.ts'
import { modelSpecSchema } from '../../shared/api/analyses.ts'

const fmtP = (p: number): string => p.toPrecision(4)

/** Longest change note a model version keeps (the column's size); the full evidence is in the audit entry. */
const NOTE_MAX = 200

type Match = ActivityCandidate['matches'][number]
/** "Ana overruled the 23.48-d activity label (same period as 'bisector_span' peak 23.4 d): a planet. Reason: …", at most NOTE_MAX characters. */
export function overruleNote(who: string, period: number, matches: Match[], reason: string): string {
  const one = (m: Match) => (m.kind === 'correlation' ? `follows '${m.indicator}'`
    : `${m.kind === 'harmonic' ? 'harmonic of ' : ''}'${m.indicator}' peak at ${m.indicatorPeriod?.toPrecision(3)} d`)
  const why = matches.length ? `${one(matches[0]!)}${matches.length > 1 ? ` and ${matches.length - 1} more` : ''}` : 'an activity indicator'
  const tail = `: counted as a planet. Reason: ${reason}`
  const head = `${who} overruled the ${fmtP(period)}-d activity label (${why})`
  const full = head + tail
  return full.length <= NOTE_MAX ? full : `${head.slice(0, Math.max(40, NOTE_MAX - tail.length - 2))}…)${tail}`.slice(0, NOTE_MAX)
}

/**
 * Counts an activity candidate of the search as a planet: the candidate's orbit (as the search fitted
 * it) is added to the current spec, the spec is fitted, and the fitted version is stored with a note
 * naming the analyst, the signal, the evidence that labelled it and the analyst's reason.
 */
export async function overrule(s: Services, actor: User, star: Star, model: FitModel, req: OverruleRequest): Promise<ModelDetail> {
  const cur = (await M(s).FitModelVersion.findOne({ where: { modelId: model.id, version: model.currentVersion } }))!
  const report = cur.result?.search?.activity
  if (!report) throw new ValidationError('signal: this model version has no activity candidates (only a search on a star with activity indicators makes them).', 'signal')
  const cand = report.candidates.find((c) => c.signal === req.signal)
  if (!cand) throw new ValidationError(`signal: no candidate ${req.signal}; the search judged signals ${report.candidates.map((c) => c.signal).join(', ')}.`, 'signal')
  if (!cand.activity) throw new ValidationError(`signal: the ${fmtP(cand.period)}-d signal was not labelled activity; it is already counted as a planet.`, 'signal')
  if (cand.overruled) throw new ConflictError(`The ${fmtP(cand.period)}-d signal was already counted as a planet (by ${cand.overruled.by?.name ?? 'someone'}).`, 'signal')
  const planet: PlanetSpec = { period: cand.period, K: cand.K, e: cand.e, omegaDeg: cand.omegaDeg, tc: cand.tc }
  const spec: ModelSpec = modelSpecSchema.parse({ ...cur.spec, planets: [...cur.spec.planets, planet] })
  const result = await fitSpecJson(s, star, spec)
  const at = new Date().toISOString()
  const marked = { ...report, candidates: report.candidates.map((c) => (c.signal === req.signal ? { ...c, overruled: { by: { id: actor.id, name: actor.name }, at, reason: req.reason } } : c)) }
  const note = overruleNote(actor.name, cand.period, cand.matches, req.reason)
  const status = result.stats.status === 'failed' ? 'failed' : 'fitted'
  await s.sequelize.transaction(async (transaction) => {
    const m = await lockModel(s, model.id, transaction)
    if (m.currentVersion !== cur.version) throw new ConflictError(`The model changed (version ${m.currentVersion}) meanwhile: reload and overrule again.`, 'version')
    const v = await addVersion(s, actor, m, { name: cur.name, spec, status, result: { ...result, search: { ...cur.result!.search!, activity: marked } }, note }, transaction)
    await record(s, {
      teamId: star.teamId, userId: actor.id, action: 'model.overrule', entity: 'model', entityId: m.id,
      detail: {
        starId: star.id, version: v.version, from: cur.version, signal: req.signal, period: cand.period, reason: req.reason,
        labelledBy: cand.matches.map((x) => `${x.kind}:${x.indicator}`), evidence: cand.cautions, bic: result.stats.bic,
      },
    }, transaction)
  })
  return modelDetail(s, model.id)
}

/**
 * "Planets + GP": a new model with the current version's planets (the fitted values when there are
 * some), the same trend, instruments and pinned jitters, and a GP noise model; fitted at once.
 * The rotation period is the request's or the strongest significant indicator peak (named as the source).
 */
export async function gpVariant(s: Services, actor: User, star: Star, model: FitModel, req: GpVariantRequest): Promise<ModelDetail> {
  const cur = (await M(s).FitModelVersion.findOne({ where: { modelId: model.id, version: model.currentVersion } }))!
  let period = req.period, source = 'the analyst'
  if (period === undefined) {
    const { data, used } = await loadRv(s, star, cur.spec.instruments, 'spec.instruments', 3)
    const indicators = indicatorColumns(used)
    const guess = indicators.length ? await pool(s).run('rotationGuess', { data, indicators }) : null
    if (!guess) {
      throw new ValidationError(`period: ${indicators.length ? 'no activity indicator of this star has a significant periodogram peak (FAP < 0.001)' : 'this star has no activity indicators'}; give the rotation period (d) to start the GP from.`, 'period')
    }
    period = guess.period; source = guess.source
  }
  const fitted = cur.status === 'fitted' && cur.result?.planets.length === cur.spec.planets.length ? cur.result.planets : null
  // from the fitted orbits where there are (e capped at 0.9 unless held), keeping the model's fixes and priors
  const planets: PlanetSpec[] = cur.spec.planets.map((p, k) => {
    const f = fitted?.[k]
    const keep = { ...(p.fix?.length ? { fix: p.fix } : {}), ...(p.priors?.length ? { priors: p.priors } : {}) }
    if (!f) return { period: p.period, K: p.K, e: p.e, omegaDeg: p.omegaDeg, tc: p.tc, tp: p.tp, ...keep }
    const phase = p.fix?.includes('tp') ? { tp: f.tp } : { tc: f.tc }
    return { period: f.period, K: Math.max(f.K, 0), e: p.fix?.includes('e') ? f.e : Math.min(f.e, 0.9), omegaDeg: f.omegaDeg, ...phase, ...keep }
  })
  const noise: GpNoiseSpec = {
    kind: 'gp', kernel: req.kernel ?? 'rotation',
    period: { value: period, ...(req.sigma !== undefined ? { sigma: req.sigma } : {}), source },
  }
  const spec = modelSpecSchema.parse({ ...cur.spec, planets, noise })
  const name = (req.name ?? `${cur.name} + GP`).slice(0, 120)
  const note = `planets + GP from model ${model.id} version ${cur.version}: rotation period ${fmtP(period)} d from ${source}`
  const created = await createModel(s, actor, star, { name, spec }, {
    note, action: 'model.gp-variant', detail: { fromModelId: model.id, fromVersion: cur.version, rotationPeriod: period, source },
  })
  const fresh = (await M(s).FitModel.findByPk(created.id))!
  return fitModel(s, actor, star, fresh, {})
}

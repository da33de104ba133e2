import type { Services } from '../services.ts'
import type { Star } from '../db/models.ts'
import { analysisModels } from '../db/models-analysis.ts'
import type { CompareResponse, CompareRow } from '../../shared/api/analyses.ts'

/** An extra planet must lower BIC by at least this (common practice; "very strong" on the Kass & Raftery 1995 scale). */
export const BIC_THRESHOLD = 10

/**
 * Grade of a BIC difference, read as 2 ln B (Schwarz 1978 approximation of the Bayes factor;
 * Kass & Raftery 1995, JASA 90, 773, §3.2 table of 2 ln B): 0–2 not worth more than a bare
 * mention, 2–6 positive, 6–10 strong, > 10 very strong.
 */
export function evidence(deltaBic: number): CompareRow['evidence'] {
  const d = Math.abs(deltaBic)
  return d < 2 ? 'bare mention' : d < 6 ? 'positive' : d < 10 ? 'strong' : 'very strong'
}

const EVIDENCE_WORDS: Record<NonNullable<CompareRow['evidence']>, string> = {
  'bare mention': 'not worth more than a bare mention',
  positive: 'positive', strong: 'strong', 'very strong': 'very strong',
}

export const RULE = `Among models fitted to the same data, the preferred one starts as the lowest-BIC model with the fewest planets; a model with more planets replaces it only if it lowers BIC by at least ${BIC_THRESHOLD}. ΔBIC is read as 2 ln B on the scale of Kass & Raftery (1995): 0–2 not worth more than a bare mention, 2–6 positive, 6–10 strong, above 10 very strong.`

const planetsWord = (n: number) => `${n} planet${n === 1 ? '' : 's'}`

/** Equal to 1 part in 10⁶ (or 10⁻⁶ absolute near 0): what a refit of the same model on the same data gives. */
const same = (a: number, b: number) => Math.abs(a - b) <= 1e-6 * Math.max(1, Math.abs(a), Math.abs(b))

/**
 * Marks the rows that repeat an earlier model (lower id) exactly: same data, planets, trend and
 * noise model, BIC and ln L equal to 10⁻⁶ (a copy fitted again, or "fit as a new model" of an unchanged form).
 */
export function markDuplicates(rows: CompareRow[]): void {
  const byId = [...rows].sort((a, b) => a.modelId - b.modelId)
  for (const [i, r] of byId.entries()) {
    const first = byId.slice(0, i).find((q) => !q.sameAs && q.dataHash === r.dataHash && q.planets === r.planets && q.trend === r.trend &&
      (q.noise ?? 'white') === (r.noise ?? 'white') && same(q.bic, r.bic) && same(q.lnL, r.lnL))
    if (first) r.sameAs = { modelId: first.modelId, name: first.name, version: first.version }
  }
}

/** The comparison table of a star's fitted models (current versions), preferred one by the BIC rule. */
export async function compareModels(s: Services, star: Star): Promise<CompareResponse> {
  const { FitModel, FitModelVersion } = analysisModels(s.sequelize, s.models)
  const models = await FitModel.findAll({ where: { starId: star.id, archivedAt: null } })
  const versions = models.length
    ? await FitModelVersion.findAll({ where: { modelId: models.map((m) => m.id), status: 'fitted' } })
    : []
  const rows: CompareRow[] = []
  for (const m of models) {
    const v = versions.find((x) => x.modelId === m.id && x.version === m.currentVersion)
    const r = v?.result
    if (!v || !r || r.stats.bic === null || r.stats.lnL === null) continue
    rows.push({
      modelId: m.id, name: v.name, version: v.version, planets: v.spec.planets.length, trend: v.spec.trend,
      lnL: r.stats.lnL, bic: r.stats.bic, deltaBic: null, rms: r.stats.rms ?? NaN,
      jitters: r.instruments.map((i) => ({ instrument: i.name, jitter: i.jitter ?? 0 })),
      nPoints: r.stats.nPoints, dataHash: r.data.hash, comparable: false, preferred: false, evidence: null, reading: '',
      noise: v.spec.noise?.kind === 'gp' ? 'gp' : 'white', sameAs: null,
    })
  }
  markDuplicates(rows)
  rows.sort((a, b) => a.bic - b.bic || a.modelId - b.modelId)
  if (!rows.length) {
    return { rows, preferredModelId: null, rule: RULE, reading: 'No fitted models yet: fit a model or run the search.' }
  }
  // reference data: the hash most models share (ties: the one of the lowest BIC)
  const counts = new Map<string, number>()
  for (const r of rows) counts.set(r.dataHash, (counts.get(r.dataHash) ?? 0) + 1)
  let refHash = rows[0]!.dataHash
  for (const r of rows) if (counts.get(r.dataHash)! > counts.get(refHash)!) refHash = r.dataHash
  for (const r of rows) if (r.dataHash === refHash) r.comparable = true
  // a duplicate is read through the model it repeats, never compared with it (ΔBIC ~1e-11 means nothing)
  const group = rows.filter((r) => r.dataHash === refHash && !r.sameAs)
  // the BIC rule over planet counts
  const best = new Map<number, CompareRow>()
  for (const r of group) if (!best.has(r.planets) || r.bic < best.get(r.planets)!.bic) best.set(r.planets, r)
  const counts2 = [...best.keys()].sort((a, b) => a - b)
  let chosen = best.get(counts2[0]!)!
  for (const k of counts2.slice(1)) {
    const cand = best.get(k)!
    if (cand.bic <= chosen.bic - BIC_THRESHOLD) chosen = cand
  }
  chosen.preferred = true
  for (const r of rows) {
    if (r.sameAs) {
      r.reading = `Same model as "${r.sameAs.name}" (v${r.sameAs.version}): the same fit to the same data, shown once.`
      continue
    }
    if (!r.comparable) {
      r.reading = 'Fitted to different data (other instruments, exclusions or new points): its BIC cannot be compared with the preferred model\'s.'
      continue
    }
    r.deltaBic = r.bic - chosen.bic
    if (r === chosen) { r.reading = `Preferred by the BIC rule (${planetsWord(r.planets)}, trend ${r.trend}).`; continue }
    r.evidence = evidence(r.deltaBic)
    const d = Math.abs(r.deltaBic).toFixed(1)
    r.reading = r.deltaBic >= 0
      ? `BIC higher by ${d} than the preferred model: ${EVIDENCE_WORDS[r.evidence!]} evidence for the preferred model.`
      : `BIC lower by ${d} than the preferred model (${EVIDENCE_WORDS[r.evidence!]} evidence), but with more planets it must be lower by at least ${BIC_THRESHOLD}.`
  }
  const others = group.filter((r) => r !== chosen)
  let reading = `"${chosen.name}" (${planetsWord(chosen.planets)}, trend ${chosen.trend}) is preferred.`
  if (others.length) {
    const next = others.reduce((a, b) => (Math.abs(b.deltaBic!) < Math.abs(a.deltaBic!) ? b : a))
    const d = next.deltaBic!
    reading += ` The closest alternative, "${next.name}" (${planetsWord(next.planets)}), has ΔBIC = ${d >= 0 ? '+' : '−'}${Math.abs(d).toFixed(1)}: ` +
      (d >= 0 ? `${EVIDENCE_WORDS[next.evidence!]} evidence for the preferred model (Kass & Raftery 1995).`
        : `it fits better, but not by the ${BIC_THRESHOLD} that an extra planet must gain.`)
  } else reading += ' It is the only fitted model on these data.'
  const dups = rows.filter((r) => r.sameAs).length
  if (dups) reading += ` ${dups} model${dups === 1 ? ' repeats' : 's repeat'} another one exactly and ${dups === 1 ? 'is' : 'are'} shown with it.`
  const excluded = rows.filter((r) => !r.comparable).length
  if (excluded) reading += ` ${excluded} model${excluded === 1 ? ' was' : 's were'} fitted to different data and are not compared.`
  return { rows, preferredModelId: chosen.modelId, rule: RULE, reading }
}

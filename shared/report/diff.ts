import type { ReportSnapshot, SnapshotChange } from '../api/reports.ts'
import { formatPlain } from './round.ts'

const PLANET_PARAMS = ['period', 'K', 'e', 'omegaDeg', 'tc', 'msiniMjup', 'aAu'] as const

function fmt(x: unknown): string {
  if (x === null || x === undefined) return '—'
  if (typeof x === 'number') return formatPlain(x, 8)
  if (typeof x === 'string') return x
  return JSON.stringify(x)
}

/**
 * What differs between two frozen versions of a report, field by field, in plain words: the data
 * (hash, points, exclusions), the model (version, spec), the fitted values, the instruments, the
 * statistics, the sampling run and the product version. Empty when nothing that is reported changed.
 */
export function diffSnapshots(prev: ReportSnapshot, next: ReportSnapshot): SnapshotChange[] {
  const out: SnapshotChange[] = []
  const add = (field: string, a: unknown, b: unknown) => {
    const fa = fmt(a), fb = fmt(b)
    if (fa !== fb) out.push({ field, from: fa, to: fb })
  }
  add('data.hash', prev.data.hash.slice(0, 12), next.data.hash.slice(0, 12))
  add('data.nIncluded', prev.data.nIncluded, next.data.nIncluded)
  const ex = (s: ReportSnapshot) => new Map(s.data.exclusions.map((x) => [x.id, x.reason ?? '']))
  const pa = ex(prev), pb = ex(next)
  const added = [...pb.keys()].filter((id) => !pa.has(id))
  const removed = [...pa.keys()].filter((id) => !pb.has(id))
  const reworded = [...pb.keys()].filter((id) => pa.has(id) && pa.get(id) !== pb.get(id))
  if (added.length || removed.length || reworded.length) {
    out.push({
      field: 'data.exclusions',
      from: `${pa.size} excluded`,
      to: [`${pb.size} excluded`, added.length ? `newly excluded ${added.join(', ')}` : '', removed.length ? `restored ${removed.join(', ')}` : '',
        reworded.length ? `reason changed for ${reworded.join(', ')}` : ''].filter(Boolean).join('; '),
    })
  }
  add('model.version', prev.model.version, next.model.version)
  add('model.spec', prev.model.spec, next.model.spec)
  add('planets', prev.result.planets.length, next.result.planets.length)
  next.result.planets.forEach((p, k) => {
    const q = prev.result.planets[k]
    if (!q) return
    for (const name of PLANET_PARAMS) add(`${p.label}.${name}`, q[name], p[name])
  })
  for (const inst of next.result.instruments) {
    const old = prev.result.instruments.find((i) => i.name === inst.name)
    if (!old) { out.push({ field: `${inst.name}`, from: '—', to: 'added' }); continue }
    add(`${inst.name}.n`, old.n, inst.n)
    add(`${inst.name}.offset`, old.offset, inst.offset)
    add(`${inst.name}.jitter`, old.jitter, inst.jitter)
  }
  for (const inst of prev.result.instruments) if (!next.result.instruments.some((i) => i.name === inst.name)) out.push({ field: inst.name, from: 'present', to: 'removed' })
  add('stats.bic', prev.result.stats.bic, next.result.stats.bic)
  add('stats.rms', prev.result.stats.rms, next.result.stats.rms)
  add('sampling.runId', prev.sampling?.runId ?? null, next.sampling?.runId ?? null)
  add('periodogram.id', prev.periodogram?.id ?? null, next.periodogram?.id ?? null)
  add('product.version', `${prev.product.version} ${prev.product.commit ?? ''}`.trim(), `${next.product.version} ${next.product.commit ?? ''}`.trim())
  return out
}

/** What decides whether freezing again makes a new version: the data, the model version, the sampling run, the periodograms. */
export function snapshotFingerprint(s: Pick<ReportSnapshot, 'data' | 'model' | 'sampling' | 'periodogram' | 'residualPeriodogram'>): string {
  return [s.data.hash, s.model.versionId, s.sampling?.runId ?? '-', s.periodogram?.id ?? '-', s.residualPeriodogram?.id ?? '-'].join('|')
}

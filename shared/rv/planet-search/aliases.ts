/**
 * Alias partners of a detected period: the frequencies the sampling can confuse with it,
 * f ± 1/(1 solar day), f ± 1/(1 sidereal day), f ± 1/(1 year), and the harmonics 2f and f/2
 * (Dawson & Fabrycky 2010, ApJ 722, 937, §3–5: fit each partner and compare the likelihoods
 * rather than guess from the periodogram heights). The fitting is done by the search; this
 * module lists the partners.
 */
import { ALIAS_SOURCES } from '../periodogram-peaks.ts'

/** A period that the sampling can confuse with the detected one, and how it is related. */
export interface AliasPartner {
  period: number
  /** e.g. 'f + 1/(1 solar day)', '2f (half the period)'. */
  relation: string
}

const YEAR = ALIAS_SOURCES.find((s) => s.source === '1 year')!.period
const SIDEREAL = ALIAS_SOURCES.find((s) => s.source === '1 sidereal day')!.period

/**
 * Partners of `period` within [minPeriod, maxPeriod], distinct from it and from each other
 * by more than `minSeparation` in frequency (default: a tenth of 1/baseline given by the caller).
 */
export function aliasPartners(period: number, range: { minPeriod: number; maxPeriod: number; minSeparation: number }): AliasPartner[] {
  if (!(period > 0)) throw new RangeError(`period must be > 0 (got ${period})`)
  const f = 1 / period
  const raw: Array<{ f: number; relation: string }> = []
  for (const [name, p] of [['1 solar day', 1], ['1 sidereal day', SIDEREAL], ['1 year', YEAR]] as const) {
    raw.push({ f: f + 1 / p, relation: `f + 1/(${name})` })
    raw.push({ f: Math.abs(f - 1 / p), relation: `|f − 1/(${name})|` })
  }
  raw.push({ f: 2 * f, relation: '2f (half the period)' }, { f: f / 2, relation: 'f/2 (twice the period)' })
  const out: Array<{ f: number; relation: string }> = []
  for (const r of raw) {
    if (!(r.f > 0)) continue
    const p = 1 / r.f
    if (p < range.minPeriod || p > range.maxPeriod) continue
    if (Math.abs(r.f - f) <= range.minSeparation) continue
    if (out.some((o) => Math.abs(o.f - r.f) <= range.minSeparation)) continue
    out.push(r)
  }
  return out.map((r) => ({ period: 1 / r.f, relation: r.relation }))
}

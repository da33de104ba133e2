// The comparison's duplicate rule (server/analyses/compare.ts markDuplicates): a model that repeats
// an earlier one exactly (same data, planets, trend, noise; BIC and ln L equal to 10⁻⁶) names it,
// and nothing else does. Pure: no database.
import { describe, expect, it } from 'vitest'
import { markDuplicates } from '../../server/analyses/compare.ts'
import type { CompareRow } from '../../shared/api/analyses.ts'

const row = (modelId: number, over: Partial<CompareRow> = {}): CompareRow => ({
  modelId, name: `m${modelId}`, version: 1, planets: 2, trend: 'none', lnL: -533.7, bic: 1142.9, deltaBic: null, rms: 2.9, jitters: [],
  nPoints: 220, dataHash: 'h', comparable: false, preferred: false, evidence: null, reading: '', noise: 'white', sameAs: null, ...over,
})

describe('duplicate models in the comparison', () => {
  it('marks the later of two identical fits (ΔBIC 1.27e-11) as the same model as the earlier', () => {
    const rows = [row(5, { bic: 1142.9 - 1.27e-11 }), row(2)]
    markDuplicates(rows)
    expect(rows[0]!.sameAs).toEqual({ modelId: 2, name: 'm2', version: 1 })
    expect(rows[1]!.sameAs).toBeNull()
  })

  it('keeps models apart that differ in data, planets, trend, noise or fit', () => {
    const rows = [row(1), row(2, { dataHash: 'other' }), row(3, { planets: 1 }), row(4, { trend: 'linear' }), row(5, { noise: 'gp' }), row(6, { bic: 1142.95, lnL: -533.72 })]
    markDuplicates(rows)
    expect(rows.map((r) => r.sameAs)).toEqual([null, null, null, null, null, null])
  })
})

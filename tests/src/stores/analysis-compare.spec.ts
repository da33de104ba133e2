// The comparison is live: "Fit as a new model" refreshes the compare table with the new model in
// it (no reload). The API module is replaced by a small in-memory server.
import { beforeEach, describe, expect, it, vi } from 'vitest'
import { createPinia, setActivePinia } from 'pinia'

const state = vi.hoisted(() => ({ models: [] as Array<{ id: number; name: string; status: string }>, next: 10 }))
vi.mock('@/api/analyses.ts', () => {
  const detail = (id: number, name: string) => ({ id, name, current: { id: id * 100, version: 1, status: 'fitted', spec: { planets: [], trend: 'none' }, result: null } })
  return {
    listModels: vi.fn(async () => state.models.map((m) => ({ ...m }))),
    compareModels: vi.fn(async () => ({
      rows: state.models.map((m, i) => ({ modelId: m.id, name: m.name, version: 1, planets: 1, trend: 'none', lnL: -10 - i, bic: 30 + 5 * i, deltaBic: 5 * i, rms: 3, jitters: [], nPoints: 40, dataHash: 'h', comparable: true, preferred: i === 0, evidence: null, reading: '' })),
      preferredModelId: state.models[0]?.id ?? null, rule: 'rule', reading: 'reading',
    })),
    createModel: vi.fn(async (_star: number, body: { name: string }) => { const m = { id: state.next++, name: body.name, status: 'draft' }; state.models.push(m); return detail(m.id, m.name) }),
    fitModel: vi.fn(async (id: number) => { const m = state.models.find((x) => x.id === id)!; m.status = 'fitted'; return detail(id, m.name) }),
    fetchModel: vi.fn(async (id: number) => detail(id, state.models.find((x) => x.id === id)!.name)),
    updateModel: vi.fn(async () => undefined),
    listPeriodograms: vi.fn(async () => []),
    fetchPeriodogram: vi.fn(async () => null),
    runPeriodogram: vi.fn(async () => null),
  }
})

import { useAnalysisStore } from '@/stores/analysis.ts'

beforeEach(() => {
  setActivePinia(createPinia())
  state.models = [{ id: 1, name: 'One planet', status: 'fitted' }]
})

describe('compare table after "Fit as a new model"', () => {
  it('holds the new model as soon as its fit returns', async () => {
    const store = useAnalysisStore()
    await store.load(7, ['Kestrel'])
    expect(store.compare.data!.rows.map((r) => r.modelId)).toEqual([1])
    await store.fit('One planet (variant)', { planets: [{ period: 12.3, K: 20 }], trend: 'none' } as never, true)
    expect(store.compare.data!.rows.map((r) => r.modelId)).toEqual([1, 10])
    expect(store.compare.data!.rows[1]!.name).toBe('One planet (variant)')
  })
})

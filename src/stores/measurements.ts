import { defineStore } from 'pinia'
import { computed } from 'vue'
import * as api from '@/api/measurements.ts'
import { fetchModel, listModels } from '@/api/analyses.ts'
import type { FittedOffsets } from '@/components/data/zero-points.ts'
import type { Measurement } from '@/api/types.ts'
import { asyncState, track } from './async-state.ts'

/** The velocities of one star, and excluding or restoring single points. */
export const useMeasurementsStore = defineStore('measurements', () => {
  const items = asyncState<Measurement[]>([])
  const change = asyncState<Measurement>()
  /** Instrument offsets of the star's best fitted model (lowest BIC), for the offset-corrected view; null when none. */
  const fitted = asyncState<FittedOffsets | null>(null)
  let starId: number | null = null

  const instruments = computed(() => [...new Set((items.data ?? []).map((m) => m.instrument))].sort())
  const excludedCount = computed(() => (items.data ?? []).filter((m) => m.excluded).length)

  async function load(id: number) {
    if (starId !== id) items.data = []
    starId = id
    await track(items, () => api.listMeasurements(id))
  }

  /** Excludes (with a reason) or restores one point and puts the server's answer in the list. */
  async function setExcluded(id: number, excluded: boolean, reason?: string) {
    const updated = await track(change, () => api.setExcluded(id, excluded ? { excluded, reason } : { excluded }))
    if (updated && items.data) {
      items.data = items.data.map((m) => (m.id === updated.id ? updated : m))
    }
    return updated
  }

  async function loadFittedOffsets(id: number) {
    fitted.data = null
    await track(fitted, async () => {
      const models = (await listModels(id)).filter((m) => m.status === 'fitted')
      if (!models.length) return null
      const best = [...models].sort((a, b) => (a.bic ?? Infinity) - (b.bic ?? Infinity))[0]!
      const detail = await fetchModel(best.id)
      const offsets: Record<string, number> = {}
      for (const i of detail.current.result?.instruments ?? []) if (i.offset !== null) offsets[i.name] = i.offset
      return Object.keys(offsets).length ? { modelName: detail.name, offsets } : null
    })
  }

  return { items, change, fitted, instruments, excludedCount, load, setExcluded, loadFittedOffsets }
})

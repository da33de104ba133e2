import { defineStore } from 'pinia'
import { computed } from 'vue'
import * as api from '@/api/measurements.ts'
import type { Measurement } from '@/api/types.ts'
import { asyncState, track } from './async-state.ts'

/** The velocities of one star, and excluding or restoring single points. */
export const useMeasurementsStore = defineStore('measurements', () => {
  const items = asyncState<Measurement[]>([])
  const change = asyncState<Measurement>()
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

  return { items, change, instruments, excludedCount, load, setExcluded }
})

import { defineStore } from 'pinia'
import * as api from '@/api/stars.ts'
import type { Dataset, Star, StarInput, StarSummary } from '@/api/types.ts'
import { asyncState, track } from './async-state.ts'

/** The team's star list and the star being looked at. */
export const useStarsStore = defineStore('stars', () => {
  const list = asyncState<StarSummary[]>([])
  const star = asyncState<Star>()
  const datasets = asyncState<Dataset[]>([])
  const saving = asyncState<Star>()

  const loadList = (teamId: number) => track(list, () => api.listStars(teamId))

  async function loadStar(starId: number) {
    if (star.data?.id !== starId) star.data = null
    await Promise.all([
      track(star, () => api.fetchStar(starId)),
      track(datasets, () => api.listDatasets(starId)),
    ])
  }

  /** Creates a star; the error (with the offending field) stays in `saving` for the form. */
  async function create(teamId: number, input: StarInput) {
    const created = await track(saving, () => api.createStar(teamId, input))
    if (created) await loadList(teamId)
    return created
  }

  async function update(starId: number, input: Partial<StarInput>) {
    const updated = await track(saving, () => api.updateStar(starId, input))
    if (updated) star.data = updated
    return updated
  }

  return { list, star, datasets, saving, loadList, loadStar, create, update }
})

import { defineStore } from 'pinia'
import * as api from '@/api/stars.ts'
import type { Dataset, DatasetUsage, Star, StarInput, StarSummary } from '@/api/types.ts'
import { asyncState, track } from './async-state.ts'

/** The team's star list and the star being looked at. */
export const useStarsStore = defineStore('stars', () => {
  const list = asyncState<StarSummary[]>([])
  const star = asyncState<Star>()
  const datasets = asyncState<Dataset[]>([])
  const saving = asyncState<Star>()
  /** The dataset being considered for deletion: what uses it. */
  const usage = asyncState<DatasetUsage>()
  /** Archiving the star or deleting a dataset (the error stays in the dialog). */
  const removal = asyncState<boolean>()
  /** The team's archived stars, and restoring one. */
  const archived = asyncState<StarSummary[]>([])
  const restoring = asyncState<Star>()

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

  const loadUsage = (datasetId: number) => { usage.data = null; return track(usage, () => api.fetchDatasetUsage(datasetId)) }

  /** Deletes an unused dataset; on success the dataset list is reloaded (the caller reloads the points). */
  async function deleteDataset(starId: number, datasetId: number, reason?: string) {
    const ok = await track(removal, async () => { await api.deleteDataset(datasetId, reason); return true })
    if (ok) await track(datasets, () => api.listDatasets(starId))
    return ok === true
  }

  /** Archives the star (owner): hidden from lists, data kept. */
  async function archive(starId: number) {
    const ok = await track(removal, async () => { await api.archiveStar(starId); return true })
    if (ok && star.data?.id === starId) star.data = null
    return ok === true
  }

  const loadArchived = (teamId: number) => track(archived, () => api.listArchivedStars(teamId))
  async function restore(teamId: number, starId: number) {
    const back = await track(restoring, () => api.restoreStar(teamId, starId))
    if (back) await Promise.all([loadList(teamId), loadArchived(teamId)])
    return back
  }

  return {
    list, star, datasets, saving, usage, removal, archived, restoring,
    loadList, loadStar, create, update, loadUsage, deleteDataset, archive, loadArchived, restore,
  }
})

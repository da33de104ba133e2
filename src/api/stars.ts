import { request } from './http.ts'
import type { Dataset, DatasetUsage, Star, StarInput, StarSummary, UpdateStarRequest } from './types.ts'

export const listStars = (teamId: number) => request<StarSummary[]>(`/teams/${teamId}/stars`)
export const createStar = (teamId: number, body: StarInput) =>
  request<Star>(`/teams/${teamId}/stars`, { method: 'POST', body })
export const fetchStar = (starId: number) => request<Star>(`/stars/${starId}`)
export const updateStar = (starId: number, body: UpdateStarRequest) =>
  request<Star>(`/stars/${starId}`, { method: 'PATCH', body })
export const archiveStar = (starId: number) => request<void>(`/stars/${starId}`, { method: 'DELETE' })
export const listDatasets = (starId: number) => request<Dataset[]>(`/stars/${starId}/datasets`)
/** Link for the browser to download an uploaded file exactly as it was sent. */
export const datasetRawUrl = (datasetId: number) => `/api/datasets/${datasetId}/raw`
/** What uses a dataset's measurements, and whether it may be deleted. */
export const fetchDatasetUsage = (datasetId: number) => request<DatasetUsage>(`/datasets/${datasetId}/usage`)
/** Deletes an unused dataset and its measurements (the raw file stays on the server). */
export const deleteDataset = (datasetId: number, reason?: string) =>
  request<void>(`/datasets/${datasetId}`, { method: 'DELETE', body: reason ? { reason } : {} })
/** The team's archived stars. */
export const listArchivedStars = (teamId: number) => request<StarSummary[]>(`/teams/${teamId}/stars/archived`)
/** Brings an archived star back (owner). */
export const restoreStar = (teamId: number, starId: number) => request<Star>(`/teams/${teamId}/stars/${starId}/restore`, { method: 'POST', body: {} })

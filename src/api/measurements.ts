import { request } from './http.ts'
import type { Measurement } from './types.ts'

export const listMeasurements = (starId: number) => request<Measurement[]>(`/stars/${starId}/measurements`)
export const setExcluded = (measurementId: number, body: { excluded: boolean; reason?: string }) =>
  request<Measurement>(`/measurements/${measurementId}`, { method: 'PATCH', body })

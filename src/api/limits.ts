// Detection-limit runs: start one from a fitted model, list a star's runs, read, cancel, resume.
import { request } from './http.ts'
import type { LimitsRun, StartLimitsRequest } from '@shared/api/limits.ts'

export const startLimits = (modelId: number, body: StartLimitsRequest = {}) => request<LimitsRun>(`/models/${modelId}/limits`, { method: 'POST', body })
export const listLimits = (starId: number) => request<LimitsRun[]>(`/stars/${starId}/limits`)
export const fetchLimits = (runId: number) => request<LimitsRun>(`/limits/${runId}`)
export const cancelLimits = (runId: number) => request<LimitsRun>(`/limits/${runId}/cancel`, { method: 'POST', body: {} })
export const resumeLimits = (runId: number) => request<LimitsRun>(`/limits/${runId}/resume`, { method: 'POST', body: {} })

import { request } from './http.ts'
import type {
  CompareResponse, CreateModelRequest, FitModelRequest, GpVariantRequest, ModelDetail, OverruleRequest, ModelSummary, ModelVersion,
  PeriodogramRun, PeriodogramSummary, RunPeriodogramRequest, SearchRequest, SearchResponse, UpdateModelRequest,
} from '@shared/api/analyses.ts'

export const runPeriodogram = (starId: number, body: RunPeriodogramRequest) =>
  request<PeriodogramRun>(`/stars/${starId}/periodograms`, { method: 'POST', body })
export const listPeriodograms = (starId: number) => request<PeriodogramSummary[]>(`/stars/${starId}/periodograms`)
export const fetchPeriodogram = (periodogramId: number) => request<PeriodogramRun>(`/periodograms/${periodogramId}`)

export const listModels = (starId: number) => request<ModelSummary[]>(`/stars/${starId}/models`)
export const createModel = (starId: number, body: CreateModelRequest) =>
  request<ModelDetail>(`/stars/${starId}/models`, { method: 'POST', body })
export const fetchModel = (modelId: number) => request<ModelDetail>(`/models/${modelId}`)
export const fetchModelVersion = (modelId: number, version: number) =>
  request<ModelVersion>(`/models/${modelId}/versions/${version}`)
export const updateModel = (modelId: number, body: UpdateModelRequest) =>
  request<ModelDetail>(`/models/${modelId}`, { method: 'PATCH', body })
export const fitModel = (modelId: number, body: FitModelRequest = {}) =>
  request<ModelDetail>(`/models/${modelId}/fit`, { method: 'POST', body })
export const duplicateModel = (modelId: number, name?: string) =>
  request<ModelDetail>(`/models/${modelId}/duplicate`, { method: 'POST', body: name ? { name } : {} })
export const archiveModel = (modelId: number) => request<void>(`/models/${modelId}`, { method: 'DELETE' })

export const searchSignals = (starId: number, body: SearchRequest = {}) =>
  request<SearchResponse>(`/stars/${starId}/search`, { method: 'POST', body })
export const compareModels = (starId: number) => request<CompareResponse>(`/stars/${starId}/models/compare`)
export const overruleSignal = (modelId: number, body: OverruleRequest) =>
  request<ModelDetail>(`/models/${modelId}/overrule`, { method: 'POST', body })
export const gpVariant = (modelId: number, body: GpVariantRequest = {}) =>
  request<ModelDetail>(`/models/${modelId}/gp-variant`, { method: 'POST', body })

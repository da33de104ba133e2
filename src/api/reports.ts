import { request } from './http.ts'
import type {
  FreezeRequest, ReportDetail, ReportSummary, ReportVersion, Review, ReviewRequest, Share, ShareRequest,
} from '@shared/api/reports.ts'

export const freezeReport = (modelId: number, body: FreezeRequest = {}) =>
  request<ReportDetail & { created: boolean }>(`/models/${modelId}/report`, { method: 'POST', body })
export const listReports = (starId: number) => request<ReportSummary[]>(`/stars/${starId}/reports`)
export const fetchReport = (reportId: number) => request<ReportDetail>(`/reports/${reportId}`)
export const fetchReportVersion = (reportId: number, version: number) => request<ReportVersion>(`/reports/${reportId}/versions/${version}`)
export const shareReport = (reportId: number, body: ShareRequest) => request<Share>(`/reports/${reportId}/shares`, { method: 'POST', body })
export const reviewReport = (reportId: number, body: ReviewRequest) => request<Review>(`/reports/${reportId}/reviews`, { method: 'POST', body })

export type ExportFormat = 'pdf' | 'latex' | 'csv' | 'ecsv' | 'json'
/** Link of one export of a version (opened or downloaded by the browser with the session cookie). */
export const reportExportUrl = (reportId: number, version: number, format: ExportFormat) =>
  `/api/reports/${reportId}/versions/${version}/${format}`

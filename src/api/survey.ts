// Survey triage: upload many stars at once, queue the automatic search, read the team table and the queue.
import { request } from './http.ts'
import type { StartTriageResponse, SurveyUploadOptions, SurveyUploadResponse, TriageQueueStatus, TriageRow } from '@shared/api/survey.ts'

export function uploadSurvey(teamId: number, files: File[], options: SurveyUploadOptions): Promise<SurveyUploadResponse> {
  const data = new FormData()
  data.append('options', JSON.stringify(options))
  for (const file of files) data.append('files', file, file.name)
  return request<SurveyUploadResponse>(`/teams/${teamId}/survey/upload`, { method: 'POST', body: data })
}
export const queueTriage = (teamId: number, starIds?: number[]) => request<StartTriageResponse>(`/teams/${teamId}/survey/runs`, { method: 'POST', body: starIds ? { starIds } : {} })
export const fetchTriageTable = (teamId: number) => request<TriageRow[]>(`/teams/${teamId}/survey`)
export const fetchTriageQueue = (teamId: number) => request<TriageQueueStatus>(`/teams/${teamId}/survey/queue`)

import { request } from './http.ts'
import type { CommitResponse, DetectHints, PreviewResponse, TableMapping } from './types.ts'

function form(files: File[], extra: Record<string, unknown>): FormData {
  const data = new FormData()
  for (const [key, value] of Object.entries(extra)) data.append(key, JSON.stringify(value))
  for (const file of files) data.append('files', file, file.name)
  return data
}

/** Detects each file's layout; `hints` carries the user's corrections per file name (what is known; the rest is detected). */
export const previewUpload = (starId: number, files: File[], hints?: Record<string, DetectHints>) =>
  request<PreviewResponse>(`/stars/${starId}/uploads/preview`, {
    method: 'POST', body: form(files, hints ? { hints } : {}),
  })

/** Stores all files in one transaction with the confirmed mappings. */
export const commitUpload = (starId: number, files: File[], mappings: Record<string, TableMapping>) =>
  request<CommitResponse>(`/stars/${starId}/uploads/commit`, { method: 'POST', body: form(files, { mappings }) })

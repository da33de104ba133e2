import { request } from './http.ts'
import type { CommitOptions, CommitResponse, DetectHints, PreviewResponse, TableMapping } from './types.ts'

function form(files: File[], extra: Record<string, unknown>): FormData {
  const data = new FormData()
  for (const [key, value] of Object.entries(extra)) data.append(key, JSON.stringify(value))
  for (const file of files) data.append('files', file, file.name)
  return data
}

/**
 * Reads each file. Without `mappings` the server detects the layout (with `hints` if given); with
 * `mappings` it reads each file with the user's mapping exactly as sent (no re-detection).
 */
export const previewUpload = (starId: number, files: File[], hints?: Record<string, DetectHints>, mappings?: Record<string, TableMapping>) =>
  request<PreviewResponse>(`/stars/${starId}/uploads/preview`, {
    method: 'POST', body: form(files, { ...(hints ? { hints } : {}), ...(mappings ? { mappings } : {}) }),
  })

/** Stores all files in one transaction with the confirmed mappings and the choices of `options`. */
export const commitUpload = (starId: number, files: File[], mappings: Record<string, TableMapping>, options: CommitOptions = {}) =>
  request<CommitResponse>(`/stars/${starId}/uploads/commit`, { method: 'POST', body: form(files, { mappings, options }) })

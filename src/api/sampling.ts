// Posterior sampling runs: start from a fitted model, list a star's runs, read one, cancel, and
// follow its progress through the server-sent event stream.
import { request } from './http.ts'
import type {
  SamplingEstimate, SamplingEvent, SamplingRun, SamplingRunSummary, StartSamplingRequest,
} from '@shared/api/sampling.ts'

export const startSampling = (modelId: number, body: StartSamplingRequest = {}) =>
  request<SamplingRun>(`/models/${modelId}/sampling`, { method: 'POST', body })
export const listSampling = (starId: number) => request<SamplingRunSummary[]>(`/stars/${starId}/sampling`)
export const fetchSampling = (runId: number) => request<SamplingRun>(`/sampling/${runId}`)
export const cancelSampling = (runId: number) => request<SamplingRun>(`/sampling/${runId}/cancel`, { method: 'POST', body: {} })
/** What a run of the model would sample (free parameters) and how long it would take. */
export const estimateSampling = (modelId: number, q: { walkers?: number; steps?: number; untilConverged?: boolean } = {}) => {
  const params = new URLSearchParams()
  for (const [k, v] of Object.entries(q)) if (v !== undefined) params.set(k, String(v))
  const qs = params.toString()
  return request<SamplingEstimate>(`/models/${modelId}/sampling/estimate${qs ? `?${qs}` : ''}`)
}
/** Address of the run's kept chain as CSV (a plain download link). */
export const samplingChainCsvUrl = (runId: number) => `/api/sampling/${runId}/chain.csv`

export interface SamplingSubscription { close(): void }

/**
 * Follows GET /api/sampling/:runId/events. `onEvent` gets every `progress` event, `onDone` the final
 * one; `onFailure` is called once when the stream cannot be used (no EventSource, or it broke before
 * the run finished) so the caller can poll instead. Returns null where EventSource does not exist.
 */
export function followSampling(
  runId: number,
  handlers: { onEvent: (e: SamplingEvent) => void; onDone: (e: SamplingEvent) => void; onFailure: () => void },
): SamplingSubscription | null {
  if (typeof EventSource === 'undefined') return null
  const source = new EventSource(`/api/sampling/${runId}/events`, { withCredentials: true })
  let finished = false
  const parse = (ev: MessageEvent): SamplingEvent | null => {
    try { return JSON.parse(String(ev.data)) as SamplingEvent } catch { return null }
  }
  source.addEventListener('progress', (ev) => { const e = parse(ev as MessageEvent); if (e) handlers.onEvent(e) })
  source.addEventListener('done', (ev) => {
    finished = true
    source.close()
    const e = parse(ev as MessageEvent)
    if (e) handlers.onDone(e)
  })
  source.onerror = () => {
    if (finished) return
    finished = true
    source.close()
    handlers.onFailure()
  }
  return { close: () => { finished = true; source.close() } }
}

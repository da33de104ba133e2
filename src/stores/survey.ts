import { defineStore } from 'pinia'
import * as api from '@/api/survey.ts'
import type { StartTriageResponse, SurveyUploadOptions, SurveyUploadResponse, TriageQueueStatus, TriageRow } from '@shared/api/survey.ts'
import { asyncState, track } from './async-state.ts'

const POLL_MS = 3000

/** The team's triage table (polled while stars are queued or running), the queue (owners), uploads and re-queues. */
export const useSurveyStore = defineStore('survey', () => {
  const table = asyncState<TriageRow[]>([])
  const queue = asyncState<TriageQueueStatus>()
  const upload = asyncState<SurveyUploadResponse>()
  const start = asyncState<StartTriageResponse>()
  let teamId: number | null = null
  let withQueue = false
  let timer: ReturnType<typeof setTimeout> | null = null

  function stop() { if (timer !== null) clearTimeout(timer); timer = null }
  const busy = () => (table.data ?? []).some((r) => r.state === 'queued' || r.state === 'running')

  async function refresh() {
    if (teamId === null) return
    const id = teamId
    await track(table, () => api.fetchTriageTable(id))
    if (withQueue) await track(queue, () => api.fetchTriageQueue(id))
    stop()
    if (busy() && teamId === id) timer = setTimeout(() => { timer = null; void refresh() }, POLL_MS)
  }

  async function load(id: number, owner: boolean) {
    teamId = id
    withQueue = owner
    queue.data = null
    await refresh()
  }

  async function send(files: File[], options: SurveyUploadOptions) {
    if (teamId === null) return null
    const id = teamId
    const r = await track(upload, () => api.uploadSurvey(id, files, options))
    await refresh()
    return r
  }

  async function requeue(starIds?: number[]) {
    if (teamId === null) return null
    const id = teamId
    const r = await track(start, () => api.queueTriage(id, starIds))
    await refresh()
    return r
  }

  return { table, queue, upload, start, load, refresh, send, requeue, stop }
})

import { defineStore } from 'pinia'
import * as api from '@/api/limits.ts'
import { LIMITS_DONE_STATES, type LimitsRun, type StartLimitsRequest } from '@shared/api/limits.ts'
import { asyncState, track } from './async-state.ts'

const POLL_MS = 2000

/** Detection limits of one star: its runs, the run on screen (polled until it finishes), start, cancel, resume. */
export const useLimitsStore = defineStore('limits', () => {
  let starId: number | null = null
  const runs = asyncState<LimitsRun[]>([])
  const run = asyncState<LimitsRun>()
  const action = asyncState<LimitsRun>()
  let timer: ReturnType<typeof setTimeout> | null = null

  function stopPolling() { if (timer !== null) clearTimeout(timer); timer = null }

  function follow(id: number) {
    stopPolling()
    const r = run.data
    if (!r || r.id !== id || LIMITS_DONE_STATES.includes(r.state)) return
    timer = setTimeout(async () => {
      timer = null
      if (run.data?.id !== id) return
      await track(run, () => api.fetchLimits(id))
      if (run.data && LIMITS_DONE_STATES.includes(run.data.state) && starId !== null) await track(runs, () => api.listLimits(starId!))
      follow(id)
    }, POLL_MS)
  }

  async function load(id: number) {
    starId = id
    stopPolling()
    run.data = null
    await track(runs, () => api.listLimits(id))
    const first = runs.data?.[0]
    if (first) await open(first.id)
  }

  async function open(id: number) {
    await track(run, () => api.fetchLimits(id))
    follow(id)
  }

  async function start(modelId: number, body: StartLimitsRequest) {
    const r = await track(action, () => api.startLimits(modelId, body))
    if (!r) return
    run.data = r
    if (starId !== null) await track(runs, () => api.listLimits(starId!))
    follow(r.id)
  }

  async function cancel() {
    const id = run.data?.id
    if (id === undefined) return
    const r = await track(action, () => api.cancelLimits(id))
    if (r) { run.data = r; stopPolling() }
  }

  async function resume() {
    const id = run.data?.id
    if (id === undefined) return
    const r = await track(action, () => api.resumeLimits(id))
    if (r) { run.data = r; follow(id) }
  }

  return { runs, run, action, load, open, start, cancel, resume, stopPolling }
})

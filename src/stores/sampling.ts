import { defineStore } from 'pinia'
import { ref } from 'vue'
import * as api from '@/api/sampling.ts'
import { SAMPLING_DONE_STATES } from '@shared/api/sampling.ts'
import type { SamplingEstimate, SamplingEvent, SamplingRun, SamplingRunSummary, StartSamplingRequest } from '@shared/api/sampling.ts'
import { asyncState, track } from './async-state.ts'
import { fetchModelVersion } from '@/api/analyses.ts'
import type { ModelVersion } from '@shared/api/analyses.ts'

const POLL_MS = 1500
/** After cancelling a running run: how often to look for its partial result (20 tries). */
const PARTIAL_POLL_MS = 500

/**
 * Posterior sampling of one star: its runs, the run on screen (followed live through the event
 * stream, or by polling every 1.5 s when the stream is not available), starting and cancelling.
 */
export const useSamplingStore = defineStore('sampling', () => {
  let starId: number | null = null
  const runs = asyncState<SamplingRunSummary[]>([])
  /** The run on screen, with its result once it has one. */
  const run = asyncState<SamplingRun>()
  const starting = asyncState<SamplingRun>()
  const cancelling = asyncState<SamplingRun>()
  /** The server's estimate for the selected fitted model (free parameters, expected steps and time). */
  const estimate = asyncState<SamplingEstimate>()
  let estimateFor: number | null = null
  /** How the open run is followed: 'stream', 'polling' or null (finished or none). */
  const following = ref<'stream' | 'polling' | null>(null)

  let subscription: api.SamplingSubscription | null = null
  let timer: ReturnType<typeof setTimeout> | null = null

  function stopFollowing() {
    subscription?.close()
    subscription = null
    if (timer !== null) clearTimeout(timer)
    timer = null
    following.value = null
  }

  const isDone = (r: { state: SamplingRun['state'] }) => SAMPLING_DONE_STATES.includes(r.state)

  function applyEvent(e: SamplingEvent) {
    const current = run.data
    if (!current || current.id !== e.id) return
    current.state = e.state
    current.progress = e.progress
    current.error = e.error
  }

  async function finish(runId: number) {
    stopFollowing()
    if (run.data?.id !== runId) return
    await track(run, () => api.fetchSampling(runId))
    if (starId !== null) await track(runs, () => api.listSampling(starId!))
  }

  function poll(runId: number) {
    following.value = 'polling'
    timer = setTimeout(async () => {
      timer = null
      if (run.data?.id !== runId) return
      try {
        const fresh = await api.fetchSampling(runId)
        if (run.data?.id !== runId) return
        run.data = fresh
        run.error = null
        if (isDone(fresh)) { await finish(runId); return }
      } catch (e) {
        run.error = (e as Error).message
      }
      if (run.data?.id === runId && following.value === 'polling') poll(runId)
    }, POLL_MS)
  }

  function follow(r: SamplingRun) {
    stopFollowing()
    if (isDone(r)) return
    subscription = api.followSampling(r.id, {
      onEvent: applyEvent,
      onDone: (e) => { applyEvent(e); void finish(e.id) },
      onFailure: () => { subscription = null; if (run.data?.id === r.id) poll(r.id) },
    })
    if (subscription) following.value = 'stream'
    else poll(r.id)
  }

  /** Opens a star: its runs, and the newest one (or `runId` when given) on screen. */
  async function load(id: number, runId?: number) {
    if (starId !== id) {
      stopFollowing()
      run.data = null; run.error = null
      starting.error = null; cancelling.error = null
    }
    starId = id
    const list = await track(runs, () => api.listSampling(id))
    const wanted = runId ?? list?.[0]?.id
    if (wanted !== undefined && run.data?.id !== wanted) await open(wanted)
  }

  async function open(runId: number) {
    stopFollowing()
    const r = await track(run, () => api.fetchSampling(runId))
    if (r) follow(r)
  }

  async function start(modelId: number, body: StartSamplingRequest) {
    const r = await track(starting, () => api.startSampling(modelId, body))
    if (!r) return null
    run.data = r
    run.error = null
    if (starId !== null) void track(runs, () => api.listSampling(starId!))
    follow(r)
    return r
  }

  async function cancel() {
    const current = run.data
    if (!current) return
    const wasRunning = current.state === 'running'
    const r = await track(cancelling, () => api.cancelSampling(current.id))
    if (r && run.data?.id === r.id) {
      await finish(r.id)
      // a running sampler stores its partial result within about a second of the cancel: wait for it
      for (let i = 0; wasRunning && i < 20 && run.data?.id === r.id && !run.data.result; i++) {
        await new Promise((res) => setTimeout(res, PARTIAL_POLL_MS))
        if (run.data?.id !== r.id) break
        try { run.data = await api.fetchSampling(r.id) } catch { break }
      }
    }
  }

  /** Asks the server what a run of this model would sample and how long it would take (its defaults). */
  async function loadEstimate(modelId: number | null) {
    estimateFor = modelId
    if (modelId === null) { estimate.data = null; estimate.error = null; return null }
    const e = await track(estimate, () => api.estimateSampling(modelId))
    if (estimateFor !== modelId) return null
    return e
  }

  /** Only the star's runs (e.g. to choose one for a report), without opening one. */
  async function loadRuns(id: number) {
    if (starId !== id) { stopFollowing(); run.data = null; run.error = null }
    starId = id
    return track(runs, () => api.listSampling(id))
  }

  /** Address of a run's chain as CSV. */
  const chainCsvUrl = (runId: number) => api.samplingChainCsvUrl(runId)

  /** The fitted model version a run sampled (its points and offsets for the band plot). */
  const runVersion = asyncState<ModelVersion>()
  async function loadRunVersion(modelId: number, version: number): Promise<ModelVersion | null> {
    return track(runVersion, () => fetchModelVersion(modelId, version))
  }

  return { runs, run, starting, cancelling, estimate, following, runVersion, load, loadRuns, open, start, cancel, stopFollowing, loadEstimate, loadRunVersion, chainCsvUrl }
})

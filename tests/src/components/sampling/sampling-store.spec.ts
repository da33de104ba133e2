// The sampling store follows a run by polling where there is no EventSource (here: Node), and
// reloads the run with its result when it has finished. The API module is replaced by a fake.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { createPinia, setActivePinia } from 'pinia'
import type { SamplingRun } from '@shared/api/sampling.ts'
import { makeResult } from './fixture.ts'

const calls: string[] = []
let polls = 0
/** 'cancel-running': the run is running; after the cancel its partial result arrives on the third read. */
let mode: 'normal' | 'cancel-running' = 'normal'
function run(state: SamplingRun['state'], stepsDone: number, withResult = false): SamplingRun {
  return {
    id: 7, starId: 1, modelId: 2, modelVersionId: 3, modelVersion: 1, settings: { walkers: 32, steps: 300, burn: 75, thin: 1, seed: 4 },
    state, progress: { stepsDone, stepsTotal: 300, tau: null, etaSeconds: null, acceptance: null, updatedAt: '' },
    estimateSeconds: 3, attempts: 1, checkpointStep: 0, resumedFromStep: null, error: null, requestedBy: null,
    createdAt: '', startedAt: null, finishedAt: null, result: withResult ? makeResult(false) : null,
  }
}

vi.mock('@/api/sampling.ts', () => ({
  followSampling: () => null,
  listSampling: async () => { calls.push('list'); return [] },
  startSampling: async (modelId: number, body: unknown) => { calls.push(`start ${modelId} ${JSON.stringify(body)}`); return run('queued', 0) },
  fetchSampling: async () => {
    polls++; calls.push('fetch')
    if (mode === 'cancel-running') return polls < 4 ? run(polls === 1 ? 'running' : 'cancelled', 100) : run('cancelled', 120, true)
    return polls < 3 ? run('running', 100 * polls) : run('succeeded', 300, true)
  },
  cancelSampling: async () => { calls.push('cancel'); return run('cancelled', 100) },
}))

beforeEach(() => { setActivePinia(createPinia()); calls.length = 0; polls = 0; mode = 'normal'; vi.useFakeTimers() })
afterEach(() => { vi.useRealTimers() })

describe('sampling store', () => {
  it('starts a run, polls its progress and loads the result when it has succeeded', async () => {
    const { useSamplingStore } = await import('@/stores/sampling.ts')
    const store = useSamplingStore()
    await store.load(1)
    await store.start(2, { walkers: 32, steps: 300 })
    expect(calls).toContain('start 2 {"walkers":32,"steps":300}')
    expect(store.following).toBe('polling')
    expect(store.run.data?.state).toBe('queued')
    await vi.advanceTimersByTimeAsync(1600)
    expect(store.run.data?.progress?.stepsDone).toBe(100)
    await vi.advanceTimersByTimeAsync(1600)
    await vi.advanceTimersByTimeAsync(1600)
    expect(store.run.data?.state).toBe('succeeded')
    expect(store.run.data?.result?.parameters.length).toBeGreaterThan(0)
    expect(store.following).toBeNull()
    const fetches = calls.filter((c) => c === 'fetch').length
    await vi.advanceTimersByTimeAsync(5000)
    expect(calls.filter((c) => c === 'fetch').length).toBe(fetches)
  })

  it('cancel stops following the run', async () => {
    const { useSamplingStore } = await import('@/stores/sampling.ts')
    const store = useSamplingStore()
    await store.load(1)
    await store.start(2, {})
    await store.cancel()
    expect(calls).toContain('cancel')
    expect(store.following).toBeNull()
  })

  it('after cancelling a running run, waits for its partial result (stored within about a second)', async () => {
    mode = 'cancel-running'
    const { useSamplingStore } = await import('@/stores/sampling.ts')
    const store = useSamplingStore()
    await store.load(1)
    await store.open(7)
    expect(store.run.data?.state).toBe('running')
    const done = store.cancel()
    await vi.advanceTimersByTimeAsync(3000)
    await done
    expect(store.run.data?.state).toBe('cancelled')
    expect(store.run.data?.result).not.toBeNull()
    const fetches = calls.filter((c) => c === 'fetch').length
    await vi.advanceTimersByTimeAsync(5000)
    expect(calls.filter((c) => c === 'fetch').length).toBe(fetches)
  })
})

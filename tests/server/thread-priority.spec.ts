// Background threads run below the API's main thread: lowerThreadPriority() in a worker thread sets
// that thread's nice value (Linux: per thread, setpriority(2)) and leaves the main thread's alone.
import { getPriority } from 'node:os'
import { Worker } from 'node:worker_threads'
import { describe, expect, it } from 'vitest'
import { BACKGROUND_NICE, lowerThreadPriority } from '../../server/compute/thread-priority.ts'

const moduleUrl = new URL('../../server/compute/thread-priority.ts', import.meta.url).href

function inWorker(): Promise<{ lowered: boolean; nice: number }> {
  const code = `
    const { parentPort } = require('node:worker_threads')
    const { getPriority } = require('node:os')
    import('tsx/esm/api').then(({ register }) => { register(); return import(${JSON.stringify(moduleUrl)}) })
      .then((m) => parentPort.postMessage({ lowered: m.lowerThreadPriority(), nice: getPriority(0) }))`
  return new Promise((resolve, reject) => {
    const w = new Worker(code, { eval: true })
    w.once('message', (m) => { resolve(m); void w.terminate() })
    w.once('error', reject)
  })
}

describe.runIf(process.platform === 'linux')('background thread priority', () => {
  it('lowers a worker thread only, never the main thread', async () => {
    const before = getPriority(0)
    expect(lowerThreadPriority()).toBe(false) // this file runs on its process's main thread
    const r = await inWorker()
    expect(r.lowered).toBe(true)
    expect(r.nice).toBe(Math.max(BACKGROUND_NICE, before))
    expect(getPriority(0)).toBe(before)
  }, 60_000)
})

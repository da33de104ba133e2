// Worker-thread side of a parallel run's merge (merge.ts): the ensembles' rows are merged, checked
// and summarised off the event loop. `mergeInThread` is what the coordinator (ensembles.ts) calls.
import { parentPort, workerData, Worker } from 'node:worker_threads'
import { mergeRun, type MergeOutcome, type MergeRequest } from './merge.ts'
import { lowerThreadPriority } from '../compute/thread-priority.ts'

lowerThreadPriority() // below the API's main thread (thread-priority.ts)

function threadScript(): URL {
  const ts = import.meta.url.endsWith('.ts')
  return new URL(ts ? './merge-thread-boot.mjs' : './merge-thread.js', import.meta.url)
}

/** Runs `mergeRun` in a worker thread of its own (a few hundred ms of numerics for thousands of rows). */
export function mergeInThread(req: MergeRequest): Promise<MergeOutcome> {
  return new Promise((resolve, reject) => {
    const worker = new Worker(threadScript(), { workerData: { merge: req } })
    let settled = false
    worker.once('message', (msg: { ok: true; out: MergeOutcome } | { ok: false; message: string }) => {
      settled = true
      if (msg.ok) resolve(msg.out); else reject(new Error(msg.message))
      void worker.terminate()
    })
    worker.once('error', (err) => { if (!settled) { settled = true; reject(err) } })
    worker.once('exit', (code) => { if (!settled) { settled = true; reject(new Error(`the merge thread stopped (exit code ${code})`)) } })
  })
}

if (parentPort && (workerData as { merge?: MergeRequest } | null)?.merge) {
  const port = parentPort
  try { port.postMessage({ ok: true, out: mergeRun((workerData as { merge: MergeRequest }).merge) }) } catch (err) {
    port.postMessage({ ok: false, message: err instanceof Error ? err.message : String(err) })
  }
}

// Worker-thread side of the compute pool: runs one task at a time and answers with its output and
// the size of this thread's heap afterwards (the pool replaces a worker whose heap grew too large).
import { parentPort } from 'node:worker_threads'
import { getHeapStatistics } from 'node:v8'
import { TASKS, type TaskName } from './tasks.ts'
import { lowerThreadPriority } from './thread-priority.ts'

lowerThreadPriority() // below the API's main thread (thread-priority.ts)

if (!parentPort) throw new Error('server/compute/worker.ts must run in a worker thread')
const port = parentPort

/** Bytes this thread holds: V8's committed heap plus memory outside it (typed arrays' buffers). */
function heapBytes(): number {
  const h = getHeapStatistics()
  return h.total_heap_size + h.external_memory
}

port.on('message', (msg: { id: number; task: TaskName; input: unknown }) => {
  try {
    const fn = TASKS[msg.task] as ((input: unknown) => unknown) | undefined
    if (!fn) throw new RangeError(`unknown task ${String(msg.task)}`)
    const output = fn(msg.input)
    port.postMessage({ id: msg.id, ok: true, output, heap: heapBytes() })
  } catch (err) {
    const e = err instanceof Error ? err : new Error(String(err))
    port.postMessage({ id: msg.id, ok: false, error: { name: e.name, message: e.message }, heap: heapBytes() })
  }
})

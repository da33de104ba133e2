// Worker-thread side of the compute pool: runs one task at a time and answers with its output.
import { parentPort } from 'node:worker_threads'
import { TASKS, type TaskName } from './tasks.ts'

if (!parentPort) throw new Error('server/compute/worker.ts must run in a worker thread')
const port = parentPort

port.on('message', (msg: { id: number; task: TaskName; input: unknown }) => {
  try {
    const fn = TASKS[msg.task] as ((input: unknown) => unknown) | undefined
    if (!fn) throw new RangeError(`unknown task ${String(msg.task)}`)
    port.postMessage({ id: msg.id, ok: true, output: fn(msg.input) })
  } catch (err) {
    const e = err instanceof Error ? err : new Error(String(err))
    port.postMessage({ id: msg.id, ok: false, error: { name: e.name, message: e.message } })
  }
})

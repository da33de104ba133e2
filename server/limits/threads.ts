// A few persistent worker threads for the CPU-heavy parts of detection limits and planning, so the
// event loop of the API (and of the job workers) stays free. Tasks are queued; each thread runs
// one at a time. Threads are unref'd: they never keep a process alive.
import { Worker } from 'node:worker_threads'
import { fileURLToPath } from 'node:url'
import type { ThreadTask, ThreadInput, ThreadOutput } from './thread.ts'

interface Pending { id: number; task: ThreadTask; input: unknown; resolve: (v: unknown) => void; reject: (e: Error) => void }
interface Slot { worker: Worker; busy: Pending | null }

const BOOT = fileURLToPath(new URL('./thread-boot.mjs', import.meta.url))
const slots: Slot[] = []
const queue: Pending[] = []
let nextId = 1
let size = 2

/** Threads used at most (default 2; the job workers raise it to their concurrency). */
export function setThreadCount(n: number): void { size = Math.max(size, Math.max(1, Math.floor(n))) }

function spawnSlot(): Slot {
  const worker = new Worker(BOOT)
  worker.unref()
  const slot: Slot = { worker, busy: null }
  worker.on('message', (msg: { id: number; ok: boolean; out?: unknown; error?: string }) => {
    const p = slot.busy
    slot.busy = null
    if (p && p.id === msg.id) { if (msg.ok) p.resolve(msg.out); else p.reject(new Error(msg.error)) }
    pump()
  })
  worker.on('error', (err) => {
    const p = slot.busy
    slot.busy = null
    slots.splice(slots.indexOf(slot), 1)
    if (p) p.reject(err instanceof Error ? err : new Error(String(err)))
    pump()
  })
  slots.push(slot)
  return slot
}

function pump(): void {
  while (queue.length) {
    const slot = slots.find((s) => !s.busy) ?? (slots.length < size ? spawnSlot() : null)
    if (!slot) return
    const p = queue.shift()!
    slot.busy = p
    slot.worker.postMessage({ id: p.id, task: p.task, input: p.input })
  }
}

/** Runs `task` on a thread; rejects with the thread's error message. */
export function runInThread<T extends ThreadTask>(task: T, input: ThreadInput<T>): Promise<ThreadOutput<T>> {
  return new Promise((resolve, reject) => {
    queue.push({ id: nextId++, task, input, resolve: resolve as (v: unknown) => void, reject })
    pump()
  })
}

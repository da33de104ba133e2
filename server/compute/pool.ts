import { Worker } from 'node:worker_threads'
import { availableParallelism } from 'node:os'
import { HttpError } from '../errors.ts'
import type { TaskName, TaskInput, TaskOutput } from './tasks.ts'

/** A computation failed inside a worker (a bug or data the numerical core refused). */
export class ComputeError extends HttpError {
  constructor(readonly task: string, message: string, readonly remoteName = 'Error') {
    super(500, 'internal', `The ${task} computation failed: ${message}`)
  }
}
/** A computation ran past its time limit; its worker was stopped. */
export class ComputeTimeoutError extends HttpError {
  constructor(readonly task: string, readonly timeoutMs: number) {
    super(503, 'internal', `The ${task} computation took longer than its limit of ${timeoutMs >= 10_000 ? Math.round(timeoutMs / 1000) : (timeoutMs / 1000).toFixed(1)} s and was stopped: narrow the period range or lower the oversampling, or try again later.`)
  }
}
/** Too many computations waiting. */
export class ComputeBusyError extends HttpError {
  constructor(queued: number) { super(503, 'internal', `The server is busy with ${queued} computations: try again in a minute.`) }
}

export interface PoolOptions {
  /** Number of worker threads (default: cores − 1, at least 1). */
  size?: number
  /** Default time limit per task, ms (default 120 000). */
  timeoutMs?: number
  /** Longest queue before new tasks are refused (default 200). */
  maxQueue?: number
  /**
   * A worker whose heap (V8 committed heap + external buffers, measured after each task) exceeds
   * this many bytes is replaced after that task, so the memory of a large job returns to the
   * system (default 320 MiB, env COMPUTE_RECYCLE_MB: a worker holds ~90 MiB idle and ~160 MiB after a
   * periodogram of the demo data with its full curve, so ordinary jobs do not trigger it).
   */
  recycleHeapBytes?: number
}

interface Job {
  id: number
  task: TaskName
  input: unknown
  timeoutMs: number
  /** Replace the worker after this job whatever its heap (a job known to be large). */
  recycle: boolean
  resolve: (v: unknown) => void
  reject: (e: unknown) => void
}

interface Slot { worker: Worker; job: Job | null; timer: NodeJS.Timeout | null }

type Reply = ({ id: number; ok: true; output: unknown } | { id: number; ok: false; error: { name: string; message: string } }) & { heap?: number }

function workerScript(): URL {
  // Under tsx or vitest the sources are .ts: worker-boot.mjs registers tsx inside the worker first
  // (execArgv ['--import', 'tsx'] is not honoured by worker threads on Node 20). A compiled build has .js.
  const ts = import.meta.url.endsWith('.ts')
  return new URL(ts ? './worker-boot.mjs' : './worker.js', import.meta.url)
}

/**
 * A small pool of worker threads running the numerical core's heavy functions (periodograms,
 * fits, the planet search) off the event loop. Tasks queue first-in first-out; each has a time
 * limit after which its worker is terminated and replaced; errors come back as typed HttpErrors.
 * Workers start lazily and are unref'd, so an idle pool never keeps the process alive.
 */
export class ComputePool {
  readonly size: number
  private readonly timeoutMs: number
  private readonly maxQueue: number
  private readonly recycleHeapBytes: number
  private recycled = 0
  private lastHeap = 0
  private readonly slots: Slot[] = []
  private readonly queue: Job[] = []
  private nextId = 1
  private closed = false

  constructor(opts: PoolOptions = {}) {
    const size = opts.size ?? Math.max(1, availableParallelism() - 1)
    if (!(Number.isInteger(size) && size >= 1)) throw new RangeError(`size must be an integer >= 1 (got ${size})`)
    this.size = size
    this.timeoutMs = opts.timeoutMs ?? 120_000
    if (!(this.timeoutMs > 0)) throw new RangeError(`timeoutMs must be > 0 (got ${opts.timeoutMs})`)
    this.maxQueue = opts.maxQueue ?? 200
    this.recycleHeapBytes = opts.recycleHeapBytes ?? Number(process.env.COMPUTE_RECYCLE_MB ?? 320) * 1024 * 1024
    if (!(this.recycleHeapBytes > 0)) throw new RangeError(`recycleHeapBytes must be > 0 (got ${opts.recycleHeapBytes})`)
  }

  /** Runs `task` in a worker; rejects with ComputeError, ComputeTimeoutError or ComputeBusyError. */
  run<K extends TaskName>(task: K, input: TaskInput<K>, opts: { timeoutMs?: number; recycle?: boolean } = {}): Promise<TaskOutput<K>> {
    if (this.closed) return Promise.reject(new ComputeError(task, 'the compute pool is closed'))
    if (this.queue.length >= this.maxQueue) return Promise.reject(new ComputeBusyError(this.queue.length))
    return new Promise<TaskOutput<K>>((resolve, reject) => {
      this.queue.push({ id: this.nextId++, task, input, timeoutMs: opts.timeoutMs ?? this.timeoutMs, recycle: !!opts.recycle, resolve: resolve as (v: unknown) => void, reject })
      this.dispatch()
    })
  }

  /** `recycled`: workers replaced after a job for their heap; `lastHeap`: bytes a worker held after the last job. */
  stats(): { size: number; workers: number; busy: number; queued: number; recycled: number; lastHeap: number } {
    return {
      size: this.size, workers: this.slots.length, busy: this.slots.filter((s) => s.job).length, queued: this.queue.length,
      recycled: this.recycled, lastHeap: this.lastHeap,
    }
  }

  /** Stops every worker; queued and running tasks are rejected. */
  async close(): Promise<void> {
    this.closed = true
    for (const job of this.queue.splice(0)) job.reject(new ComputeError(job.task, 'the compute pool was closed'))
    await Promise.all(this.slots.splice(0).map(async (s) => {
      if (s.timer) clearTimeout(s.timer)
      s.job?.reject(new ComputeError(s.job.task, 'the compute pool was closed'))
      s.job = null
      await s.worker.terminate()
    }))
  }

  private spawn(): Slot {
    const worker = new Worker(workerScript())
    worker.unref()
    const slot: Slot = { worker, job: null, timer: null }
    worker.on('message', (msg: Reply) => {
      const job = slot.job
      if (!job || job.id !== msg.id) return
      this.lastHeap = msg.heap ?? 0
      if (job.recycle || this.lastHeap > this.recycleHeapBytes) this.retire(slot)
      this.finish(slot)
      if (msg.ok) job.resolve(msg.output)
      else job.reject(new ComputeError(job.task, msg.error.message, msg.error.name))
    })
    const lost = (why: string) => {
      const i = this.slots.indexOf(slot)
      if (i >= 0) this.slots.splice(i, 1)
      const job = slot.job
      if (slot.timer) clearTimeout(slot.timer)
      slot.job = null
      job?.reject(new ComputeError(job.task, why))
      this.dispatch()
    }
    worker.on('error', (err) => lost(`the worker crashed (${err.message})`))
    worker.on('exit', (code) => { if (this.slots.includes(slot)) lost(`the worker stopped (exit code ${code})`) })
    this.slots.push(slot)
    return slot
  }

  /** Takes a worker out of the pool and lets its thread exit; a fresh one starts on demand. */
  private retire(slot: Slot): void {
    const i = this.slots.indexOf(slot)
    if (i >= 0) this.slots.splice(i, 1)
    this.recycled++
    void slot.worker.terminate()
  }

  private finish(slot: Slot): void {
    if (slot.timer) clearTimeout(slot.timer)
    slot.timer = null
    slot.job = null
    slot.worker.unref()
    queueMicrotask(() => this.dispatch())
  }

  private dispatch(): void {
    while (this.queue.length && !this.closed) {
      let slot = this.slots.find((s) => !s.job)
      if (!slot) {
        if (this.slots.length >= this.size) return
        slot = this.spawn()
      }
      const job = this.queue.shift()!
      slot.job = job
      slot.worker.ref()
      const s = slot
      s.timer = setTimeout(() => {
        // the only way to stop a busy thread: terminate it; a fresh worker takes its place on demand
        const i = this.slots.indexOf(s)
        if (i >= 0) this.slots.splice(i, 1)
        s.job = null
        s.timer = null
        void s.worker.terminate()
        job.reject(new ComputeTimeoutError(job.task, job.timeoutMs))
        this.dispatch()
      }, job.timeoutMs)
      s.timer.unref()
      s.worker.postMessage({ id: job.id, task: job.task, input: job.input })
    }
  }
}

let shared: ComputePool | null = null
/** The process-wide pool (created on first use). */
export function defaultPool(): ComputePool {
  if (!shared) shared = new ComputePool()
  return shared
}

// The one request/reply protocol between the page and its Web Workers: each request carries an id,
// each reply the same id with `output` or `error`. Where Workers are missing (component tests,
// old browsers) the computation runs inline instead, with the same promise interface.

interface Reply<O> { id: number; output?: O; error?: string }

/**
 * A function that sends `input` to the worker made by `spawn` and resolves with its output.
 * `spawn` must contain the literal `new Worker(new URL('./x.worker.ts', import.meta.url), …)`
 * so that Vite bundles the worker file.
 */
export function workerFunction<I, O>(spawn: () => Worker, compute: (input: I) => O, what: string): (input: I) => Promise<O> {
  let worker: Worker | null = null
  let unavailable = false
  let nextId = 1
  const pending = new Map<number, { resolve: (o: O) => void; reject: (e: Error) => void }>()

  const get = (): Worker | null => {
    if (worker || unavailable) return worker
    if (typeof Worker === 'undefined' || typeof window === 'undefined' || !('document' in window) || import.meta.env?.MODE === 'test') {
      unavailable = true
      return null
    }
    try {
      worker = spawn()
    } catch {
      unavailable = true
      return null
    }
    worker.onmessage = (event: MessageEvent<Reply<O>>) => {
      const job = pending.get(event.data.id)
      if (!job) return
      pending.delete(event.data.id)
      if (event.data.error !== undefined) job.reject(new Error(event.data.error))
      else job.resolve(event.data.output as O)
    }
    worker.onerror = (event) => {
      for (const job of pending.values()) job.reject(new Error(event.message || `The ${what} worker failed`))
      pending.clear()
    }
    return worker
  }

  return (input: I) => {
    const w = get()
    if (!w) return Promise.resolve().then(() => compute(input))
    const id = nextId++
    return new Promise<O>((resolve, reject) => {
      pending.set(id, { resolve, reject })
      w.postMessage({ id, input })
    })
  }
}

/** The worker side: answers each request with `compute(input)` or the error's message. */
export function serveWorker<I, O>(compute: (input: I) => O): void {
  self.onmessage = (event: MessageEvent<{ id: number; input: I }>) => {
    const { id, input } = event.data
    try {
      self.postMessage({ id, output: compute(input) } satisfies Reply<O>)
    } catch (error) {
      self.postMessage({ id, error: (error as Error).message } satisfies Reply<O>)
    }
  }
}

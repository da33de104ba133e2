// Asks the curves worker for a model's plot data; computes inline where Workers are missing (tests).
import { computeCurves, type CurvesInput, type CurvesOutput } from './model-curves.ts'

let worker: Worker | null = null
let nextId = 1
const pending = new Map<number, { resolve: (o: CurvesOutput) => void; reject: (e: Error) => void }>()

function getWorker(): Worker | null {
  if (worker) return worker
  if (typeof Worker === 'undefined' || typeof window === 'undefined' || !('document' in window) || import.meta.env?.MODE === 'test') return null
  try {
    worker = new Worker(new URL('./model-curves.worker.ts', import.meta.url), { type: 'module' })
  } catch {
    return null
  }
  worker.onmessage = (event: MessageEvent<{ id: number; output?: CurvesOutput; error?: string }>) => {
    const job = pending.get(event.data.id)
    if (!job) return
    pending.delete(event.data.id)
    if (event.data.error !== undefined) job.reject(new Error(event.data.error))
    else job.resolve(event.data.output!)
  }
  worker.onerror = (event) => {
    for (const job of pending.values()) job.reject(new Error(event.message || 'The plot worker failed'))
    pending.clear()
  }
  return worker
}

export function modelCurves(input: CurvesInput): Promise<CurvesOutput> {
  const w = getWorker()
  if (!w) return Promise.resolve().then(() => computeCurves(input))
  const id = nextId++
  return new Promise((resolve, reject) => {
    pending.set(id, { resolve, reject })
    w.postMessage({ id, input })
  })
}

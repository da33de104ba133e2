// Asks the band worker for the posterior model band; computes inline where Workers are missing (tests).
import { computeBand, type BandInput, type BandOutput } from './posterior-band.ts'

let worker: Worker | null = null
let nextId = 1
const pending = new Map<number, { resolve: (o: BandOutput) => void; reject: (e: Error) => void }>()

function getWorker(): Worker | null {
  if (worker) return worker
  if (typeof Worker === 'undefined' || typeof window === 'undefined' || !('document' in window) || import.meta.env?.MODE === 'test') return null
  try {
    worker = new Worker(new URL('./posterior-band.worker.ts', import.meta.url), { type: 'module' })
  } catch {
    return null
  }
  worker.onmessage = (event: MessageEvent<{ id: number; output?: BandOutput; error?: string }>) => {
    const job = pending.get(event.data.id)
    if (!job) return
    pending.delete(event.data.id)
    if (event.data.error !== undefined) job.reject(new Error(event.data.error))
    else job.resolve(event.data.output!)
  }
  worker.onerror = (event) => {
    for (const job of pending.values()) job.reject(new Error(event.message || 'The band worker failed'))
    pending.clear()
  }
  return worker
}

export function posteriorBand(input: BandInput): Promise<BandOutput> {
  const w = getWorker()
  if (!w) return Promise.resolve().then(() => computeBand(input))
  const id = nextId++
  return new Promise((resolve, reject) => {
    pending.set(id, { resolve, reject })
    w.postMessage({ id, input })
  })
}

// bcrypt hashing and comparison off the event loop: one worker thread (hash-worker.mjs) started on
// first use, unref'd while idle. bcryptjs's own async mode still runs on the main thread in slices
// of up to 100 ms, which stalled every other request during sign-ins under load (issue 11).
import { Worker } from 'node:worker_threads'

type Op = { op: 'hash'; password: string; cost: number } | { op: 'compare'; password: string; hash: string }
interface Pending { resolve: (v: string | boolean) => void; reject: (e: Error) => void }

let worker: Worker | null = null
const pending = new Map<number, Pending>()
let nextId = 1

function failAll(why: string): void {
  for (const p of pending.values()) p.reject(new Error(`password hashing failed: ${why}`))
  pending.clear()
}

function thread(): Worker {
  if (worker) return worker
  const w = new Worker(new URL('./hash-worker.mjs', import.meta.url))
  w.unref()
  w.on('message', (msg: { id: number; ok: true; out: string | boolean } | { id: number; ok: false; message: string }) => {
    const p = pending.get(msg.id)
    if (!p) return
    pending.delete(msg.id)
    if (!pending.size) w.unref()
    if (msg.ok) p.resolve(msg.out)
    else p.reject(new Error(msg.message))
  })
  const lost = (why: string) => { if (worker === w) worker = null; failAll(why) }
  w.on('error', (err) => lost(err.message))
  w.on('exit', (code) => lost(`the hashing thread stopped (exit code ${code})`))
  worker = w
  return w
}

function run(op: Op): Promise<string | boolean> {
  return new Promise((resolve, reject) => {
    const id = nextId++
    pending.set(id, { resolve, reject })
    const w = thread()
    w.ref()
    w.postMessage({ id, ...op })
  })
}

/** bcrypt hash of `password` at `cost` (bcryptjs, in the hashing thread). */
export async function hashPassword(password: string, cost: number): Promise<string> {
  return (await run({ op: 'hash', password, cost })) as string
}

/** Whether `password` matches the bcrypt `hash` (in the hashing thread). */
export async function comparePassword(password: string, hash: string): Promise<boolean> {
  return (await run({ op: 'compare', password, hash })) as boolean
}

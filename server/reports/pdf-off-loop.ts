import { Worker } from 'node:worker_threads'
import type { PdfInput } from './pdf.ts'
import { UnavailableError } from '../errors.ts'

/** Longest a PDF may take before its worker is stopped. */
const PDF_TIMEOUT_MS = 120_000

function threadScript(): URL {
  const ts = import.meta.url.endsWith('.ts')
  return new URL(ts ? './pdf-boot.mjs' : './pdf-thread.js', import.meta.url)
}

/**
 * Builds a report PDF (reportPdf, unchanged) in a worker thread of its own that exits afterwards:
 * the seconds of layout and chart rendering never block the event loop (issue 11: a PDF export
 * blocked it 3.7 s), and the worker's memory is returned when it ends.
 */
export function pdfOffLoop(input: PdfInput): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const worker = new Worker(threadScript(), { workerData: input })
    let settled = false
    const done = (fn: () => void) => { if (!settled) { settled = true; clearTimeout(timer); fn(); void worker.terminate() } }
    const timer = setTimeout(() => done(() => reject(new UnavailableError(`Building the PDF took longer than ${PDF_TIMEOUT_MS / 1000} s and was stopped: try again later.`, 30))), PDF_TIMEOUT_MS)
    worker.on('message', (msg: { ok: true; bytes: Uint8Array } | { ok: false; error: { name: string; message: string } }) => {
      done(() => (msg.ok ? resolve(Buffer.from(msg.bytes.buffer, msg.bytes.byteOffset, msg.bytes.byteLength)) : reject(Object.assign(new Error(msg.error.message), { name: msg.error.name }))))
    })
    worker.on('error', (err) => done(() => reject(err)))
    worker.on('exit', (code) => done(() => reject(new Error(`the PDF worker stopped (exit code ${code}) before answering`))))
  })
}

// Worker-thread side of pdfOffLoop: builds one PDF with reportPdf and answers with its bytes.
import { parentPort, workerData } from 'node:worker_threads'
import { reportPdf, type PdfInput } from './pdf.ts'
import { lowerThreadPriority } from '../compute/thread-priority.ts'

lowerThreadPriority() // below the API's main thread (thread-priority.ts)

if (!parentPort) throw new Error('server/reports/pdf-thread.ts must run in a worker thread')
const port = parentPort
try {
  const bytes = await reportPdf(workerData as PdfInput)
  const out = new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength)
  port.postMessage({ ok: true, bytes: out })
} catch (err) {
  const e = err instanceof Error ? err : new Error(String(err))
  port.postMessage({ ok: false, error: { name: e.name, message: e.message } })
}

// Web Worker: the band of posterior model curves, off the main thread.
import { computeBand } from './posterior-band.ts'
import { serveWorker } from './rpc.ts'

serveWorker(computeBand)

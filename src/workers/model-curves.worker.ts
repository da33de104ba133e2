// Web Worker: computes the plot curves of a fitted model off the main thread.
import { computeCurves } from './model-curves.ts'
import { serveWorker } from './rpc.ts'

serveWorker(computeCurves)

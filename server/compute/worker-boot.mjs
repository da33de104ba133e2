// Starts a compute worker from the TypeScript sources: registers tsx's loader inside this worker
// thread (an `--import tsx` in the worker's execArgv is not applied to workers on Node 20), then
// loads worker.ts.
import { register } from 'tsx/esm/api'

register()
await import('./worker.ts')

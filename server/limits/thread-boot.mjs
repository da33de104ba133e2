// Starts a limits/planning thread from the TypeScript sources: registers tsx's loader inside the
// worker thread (Node 20 does not apply `--import tsx` to workers), then loads thread.ts.
import { register } from 'tsx/esm/api'

register()
await import('./thread.ts')

// Starts the PDF worker from the TypeScript sources (tsx's loader registered inside the worker,
// as server/compute/worker-boot.mjs does for the compute pool).
import { register } from 'tsx/esm/api'

register()
await import('./pdf-thread.ts')

// Starts a merge thread from the TypeScript sources (tsx's loader registered inside the thread), then loads merge-thread.ts.
import { register } from 'tsx/esm/api'

register()
await import('./merge-thread.ts')

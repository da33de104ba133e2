// Asks the band worker for the posterior model band; computes inline where Workers are missing (tests).
import { computeBand, type BandInput, type BandOutput } from './posterior-band.ts'
import { workerFunction } from './rpc.ts'

export const posteriorBand = workerFunction<BandInput, BandOutput>(
  () => new Worker(new URL('./posterior-band.worker.ts', import.meta.url), { type: 'module' }),
  computeBand,
  'band',
)

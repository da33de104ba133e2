// Web Worker: the band of posterior model curves, off the main thread.
import { computeBand, type BandInput } from './posterior-band.ts'

self.onmessage = (event: MessageEvent<{ id: number; input: BandInput }>) => {
  const { id, input } = event.data
  try {
    self.postMessage({ id, output: computeBand(input) })
  } catch (error) {
    self.postMessage({ id, error: (error as Error).message })
  }
}

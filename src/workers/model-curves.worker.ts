// Web Worker: computes the plot curves of a fitted model off the main thread.
import { computeCurves, type CurvesInput } from './model-curves.ts'

self.onmessage = (event: MessageEvent<{ id: number; input: CurvesInput }>) => {
  const { id, input } = event.data
  try {
    self.postMessage({ id, output: computeCurves(input) })
  } catch (error) {
    self.postMessage({ id, error: (error as Error).message })
  }
}

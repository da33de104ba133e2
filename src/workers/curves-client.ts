// Asks the curves worker for a model's plot data; computes inline where Workers are missing (tests).
import { computeCurves, type CurvesInput, type CurvesOutput } from './model-curves.ts'
import { workerFunction } from './rpc.ts'

export const modelCurves = workerFunction<CurvesInput, CurvesOutput>(
  () => new Worker(new URL('./model-curves.worker.ts', import.meta.url), { type: 'module' }),
  computeCurves,
  'plot',
)

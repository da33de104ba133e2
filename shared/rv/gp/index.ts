/** Public API of the Gaussian-process noise models (re-exports only). */
export {
  type QuasiPeriodicShape, type RotationShape, type KernelShape, type SemiseparableTerm,
  checkKernelShape, quasiPeriodic, rotation, rotationTerms, termsValue, kernelValue,
} from './kernels.ts'
export {
  type DenseFactor, denseCovariance, denseFactor, denseSolve, denseLogLikelihood, densePredict,
} from './dense.ts'
export {
  type SemiseparableFactor, semiseparableLogLikelihood, semiseparableGram, semiseparableFactor, semiseparableSolve,
  semiseparableFactorLogLikelihood, semiseparablePredict,
} from './semiseparable.ts'
export {
  type GpNoiseModel, type GpSeries, type GpMethod, type GpFactor, type GpPrediction, GP_DENSE_MAX,
  rowScales, gpLogLikelihood, gpFactor, gpLogDeterminant, gpSolve, gpFactorLogLikelihood, gpPredict, gpActivityAtData,
} from './noise-model.ts'

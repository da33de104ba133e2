/** Public API of Starsway's numerical core (re-exports only; helpers stay private). */
export { GM_SUN, GM_JUPITER, GM_EARTH, AU, DAY, G, M_SUN_KG } from './constants.ts'
export {
  type VettingCandidate, type ActivityMatch, type CandidateVetting, type ActivityVetting, type VettingOptions,
  VETTING_DEFAULTS, periodRelation, activityVetting,
} from './activity-vetting.ts'
  type IndicatorColumn, type IndicatorPeak, type IndicatorDiagnostics, type IndicatorOptions, type InstrumentCorrelation,
  INDICATOR_MIN_ROWS, indicatorDiagnostics, centrePerInstrument,
} from './activity-indicators.ts'
export { type Correlation, correlate, averageRanks, incompleteBeta, correlationPValue } from './correlation.ts'
  solveKepler, solveKeplerArray, trueAnomaly, trueAnomalyArray, eccentricFromTrue, wrapPi, KEPLER_TOLERANCE,
} from './kepler.ts'
export { type Keplerian, radialVelocity, radialVelocityAt, addKeplerian, tpToTc, tcToTp, nearestEpoch } from './model.ts'
export { type RvData, type RvRowsInput, toRvData, checkRvData, baseline } from './orbit-data.ts'
export {
  type TrendKind, type PlanetParam, type PlanetStart, type Prior, type FitOptions, type PlanetFit,
  type InstrumentFit, type FitStats, type FitResult, fitKeplerians, fitBaseline, jitterMle, E_MAX,
} from './orbit-fit.ts'
export { type StartOptions, type ScoredStart, planetStarts } from './orbit-start.ts'
export * from './search/index.ts'
export { type MinimumMass, type DerivedPlanet, minimumMass, semiAmplitude, semiMajorAxis, derivedPlanet } from './derived.ts'
export * from './periodogram.ts'
export {
  type StatefulRandom, type SamplerState, type ChainSoFar, type ProgressCallback, type EnsembleOptions, type EnsembleResult,
  runEnsemble, stateToJson, stateFromJson,
} from './sampler.ts'
export {
  type ChainShape, type RhatOptions,
  autocorrelation, windowedTau, integratedTime1d, integratedTime, normalQuantile, classicRhat, splitRhat, acceptanceFraction,
} from './diagnostics.ts'
export {
  type SamplingParam, type SamplingPrior, type PosteriorSpec, type PosteriorLayout, type LogPosterior,
  createLogPosterior, specFromFit, samplingScales, planetLabel,
} from './posterior.ts'
export { type SampleOptions, type ParameterSummary, type SampleDiagnostics, type SampleResult, samplePosterior } from './mcmc.ts'
export * from './gp/index.ts'
export {
  type IndicatorColumn, type IndicatorPeak, type IndicatorDiagnostics, type IndicatorOptions, type InstrumentCorrelation,
  INDICATOR_MIN_ROWS, indicatorDiagnostics, centrePerInstrument,
} from './activity-indicators.ts'
export {
  type VettingCandidate, type ActivityMatch, type CandidateVetting, type ActivityVetting, type VettingOptions,
  VETTING_DEFAULTS, periodRelation, activityVetting,
} from './activity-vetting.ts'
export {
  type GpHyperSpec, type GpFitOptions, type GpPlanetFit, type GpFitResult, fitWithGp, trainGpOnIndicator,
} from './gp-fit.ts'

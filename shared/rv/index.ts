/** Public API of Starsway's numerical core (re-exports only; helpers stay private). */
export { GM_SUN, GM_JUPITER, GM_EARTH, AU, DAY, G, M_SUN_KG } from './constants.ts'
export {
  solveKepler, solveKeplerArray, trueAnomaly, trueAnomalyArray, eccentricFromTrue, wrapPi, KEPLER_TOLERANCE,
} from './kepler.ts'
export { type Keplerian, radialVelocity, radialVelocityAt, addKeplerian, tpToTc, tcToTp, nearestEpoch } from './model.ts'
export { type RvData, type RvRowsInput, toRvData, checkRvData, baseline } from './orbit-data.ts'
export {
  type TrendKind, type PlanetParam, type PlanetStart, type Prior, type FitOptions, type PlanetFit,
  type InstrumentFit, type FitStats, type FitResult, fitKeplerians, fitBaseline, jitterMle, E_MAX,
} from './orbit-fit.ts'
export { type StartOptions, type ScoredStart, planetStarts } from './orbit-start.ts'
export * from './planet-search/index.ts'
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
  type SamplingParam, type SamplingPrior, type PosteriorSpec, type PosteriorLayout, type PlanetCoords, type LogPosterior,
  createLogPosterior, specFromFit, samplingScales, planetLabel, fixedInFit,
} from './posterior.ts'
export {
  type SampleOptions, type SampleProgress, type ConvergenceCheck, type ParameterSummary, type SampleDiagnostics, type SampleResult,
  samplePosterior, checkConvergence, defaultRhatGroups, physicalColumns, MIN_N_OVER_TAU, MAX_RHAT, DEFAULT_MAX_STEPS, DEFAULT_FIXED_STEPS, DEFAULT_KEPT_ROWS,
} from './mcmc.ts'
export { ChainStore, type ChainRows } from './chain-store.ts'
export * from './gp/index.ts'
export { centreByInstrument } from './centring.ts'
export {
  type PlanetElements, keplerianOf, elementsOfFit, elementsOfStart, startOfElements, OMEGA_START_DEG,
} from './planet-elements.ts'
export {
  type PlanetPrior, type PlanetSpecInput, type SpecFitOptions, meanEpoch, flattenPriors, startsFromSpec, fitSpec,
} from './model-spec.ts'
export {
  type PeriodogramReportInput, type PeriodogramReport, type ReportPeak, type KeplerianReport,
  periodogramReport, downsampleCurve, CURVE_POINTS, FAP_LEVELS, REPORT_PEAKS,
} from './periodogram-report.ts'
export {
  type CurveTrend, type CurveSampling, CURVE_DEFAULTS, curveTimes, modelVelocity, phaseOf, phaseCurve,
} from './model-curve.ts'
export { type Coincidence, COINCIDENCE_FAP, PERIOD_RELATIONS, coincidences, peakWidth, periodRelation } from './peak-coincidence.ts'
export { type FitWarningCode, type FitWarningItem, E_WARN, planetLetter, fitWarnings } from './orbit-fit-warnings.ts'
export { type Correlation, correlate, averageRanks, incompleteBeta, correlationPValue } from './correlation.ts'
export {
  type IndicatorColumn, type IndicatorPeak, type IndicatorDiagnostics, type IndicatorOptions, type InstrumentCorrelation,
  INDICATOR_MIN_ROWS, indicatorDiagnostics, centrePerInstrument,
} from './activity-indicators.ts'
export {
  type VettingCandidate, type ActivityMatch, type CandidateVetting, type ActivityVetting, type VettingOptions,
  VETTING_DEFAULTS, activityVetting, vetOrbits,
} from './activity-vetting.ts'
export {
  type GpHyperSpec, type GpFitOptions, type GpPlanetFit, type GpFitResult, type GpPosterior, fitWithGp, trainGpOnIndicator, gpLogPosterior,
} from './gp-fit.ts'
export { type GpPeriodogram, type GpPeriodogramPeak, type GpPeriodogramOptions, gpResidualPeriodogram } from './gp-periodogram.ts'
export {
  type ActivitySearchOptions, type ActivityCandidate, type ActivitySearchResult, type ActivitySearchStep, type GpHyperparameters, type GpQuantity,
  ACTIVITY_SEARCH_DEFAULTS, searchWithActivity, gpHyperparameters,
} from './activity-search.ts'
export { type SearchSummary, searchSummary } from './planet-search-summary.ts'

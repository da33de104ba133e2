/** Public API of detection limits by injection and recovery (re-exports only). */
export {
  type LimitGridInput, type LimitGrid, MAX_TRIALS, logSpace, makeGrid, trialIndices, cellOf, chunkRanges, earthToJupiter,
} from './grid.ts'
export {
  type RecoveryCriterion, type RecoveryOptions, type LimitsData, type Recovery, type RecoveryOutcome,
  RECOVERY_DEFAULTS, limitsDataFromFit, checkLimitsData, prepareRecovery, recoverInjected, recoverInjectedFull,
} from './recovery.ts'
export { type Injection, trialSeed, injectionOf, injectInto } from './inject.ts'
export { defaultMassRange } from './mass-range.ts'
export {
  type LimitsProblem, type PreparedLimits, type ChunkResult, type LimitMap,
  prepareLimits, runChunk, mergeChunks, computeLimitMap,
} from './run.ts'
export { type ContourFlag, type ContourPoint, type LimitTableRow, TABLE_EDGES, completenessContour, limitTable } from './completeness.ts'
export { type ChartPlanet, solarSystemGiants } from './solar-system.ts'
export { nonCentralChi2Sf2, detectionProbability, detectionProbabilityChi2 } from './analytic.ts'

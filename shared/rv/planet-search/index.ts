/** The planet search: Keplerian periodogram, alias partners, warrant checks, defaults, the search. */
export { SEARCH_DEFAULTS, type SearchDefaults } from './defaults.ts'
export {
  type EccentricityCell, type KeplerianPeriodogramOptions, type KeplerianPeriodogramResult, type KeplerianPeak,
  KEPLERIAN_PERIODOGRAM_DEFAULTS, keplerianPeriodogram, keplerianPeriodogramDirect, keplerianPeaks,
} from './keplerian-periodogram.ts'
export { independentFrequencies, keplerianFap, chiSquareTailEven, FALSE_ALARM_LAW } from './significance.ts'
export { type AliasPartner, aliasPartners } from './aliases.ts'
export { type SignalFlag, type SignalFlagKind, type InstrumentShare, instrumentShares, carryingPoints, rejections, warnings, candidateDoubts, CARRIER_SHARE, SHORT_ECCENTRIC, E_SPIKE, E_HIGH, SHORT_SPAN_SHARE, CONFIRM_LNL, MIN_CARRYING_POINTS } from './warrant.ts'
export {
  type SearchOptions, type SearchStep, type SearchResult, type SignalReport, type AliasTrial, type AlternativeModel, type CandidateSignal, searchPlanets,
} from './search.ts'

/** The planet search (its home is ./planet-search/search.ts; this name is kept for existing imports). */
export { type SearchOptions, type SearchStep, type SearchResult, type SignalReport, type AliasTrial, type AlternativeModel, type CandidateSignal, searchPlanets } from './planet-search/search.ts'

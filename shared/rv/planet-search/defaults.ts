/**
 * Defaults of the planet search — the one home for the CLI, the server and the browser. Each
 * value is explained where it is used; the period range follows the periodogram grid defaults
 * ({@link GRID_DEFAULTS}: 0.5 d, or 0.2 d for dense nightly sampling, up to 5× the baseline).
 */
import { GRID_DEFAULTS } from '../periodogram-core.ts'
import type { TrendKind } from '../orbit-fit.ts'

export const SEARCH_DEFAULTS = Object.freeze({
  /** 'auto': as many planets as the BIC rule and the warrant checks allow. */
  planets: 'auto' as number | 'auto',
  /** 'auto': none, linear or quadratic by the BIC rule. */
  trend: 'auto' as TrendKind | 'auto',
  /**
   * An extra planet must lower BIC by at least this (Schwarz 1978; 10 is "very strong" evidence
   * on the scale of Kass & Raftery 1995). The same bar applies to each extra trend term.
   */
  bicThreshold: 10,
  /** A new planet's likelihood gain must have a false-alarm probability over the periods searched below this (./significance.ts). */
  falseAlarm: 1e-3,
  /** Largest number of planets tried in 'auto' mode. */
  maxPlanets: 5,
  /** Keplerian-periodogram peaks refined by the non-linear fit at each step (multi-start). */
  keplerianPeaks: 6,
  /** Sinusoid (GLS) peaks of the residuals added as candidates at each step. */
  sinusoidPeaks: 3,
  /** Starts per candidate period from the exact (e, phase) scan. */
  startsPerPeriod: 2,
  /** Starts refined by the non-linear fit at each step (best by the scan's χ², plus the strongest Keplerian cell). */
  refineStarts: 6,
  /**
   * Iteration cap of the screening fits (the multi-start refinements and the alias partners): the
   * best of them is then continued to convergence, and the chosen model is refitted in full with
   * each trend, so the cap changes which start wins only between starts that are still far apart.
   */
  screeningIterations: 30,
  /** Alias partners fitted in full at each step (the most promising by their exact scan). */
  aliasFits: 3,
  /** Oversampling of the Keplerian periodogram's period grid. */
  keplerianOversample: 3,
  /** Screening jitter of an instrument is capped at this many times its median quoted error. */
  screeningJitterCap: 1,
  /** Fraction of a planet's likelihood gain from one instrument above which it is "carried by one instrument". */
  oneInstrumentShare: 0.8,
  /** An instrument's jitter above this many times the median of its peers' (and above its median error) is flagged. */
  jitterPeerFactor: 3,
  /** Periodogram grid defaults (shared with the periodogram). */
  grid: GRID_DEFAULTS,
})

export type SearchDefaults = typeof SEARCH_DEFAULTS

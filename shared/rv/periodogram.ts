/**
 * Public periodogram API of the numerical core: generalised Lomb–Scargle (Zechmeister & Kürster
 * 2009), fast evaluation (Press & Rybicki 1989), grid (VanderPlas 2018), false-alarm probability
 * (Baluev 2008, bootstrap), spectral window and aliases (Dawson & Fabrycky 2010).
 */
export {
  type PeriodogramOptions, type FrequencyGrid, type PeriodogramResult, type FastSettings,
  frequencyGrid, periodogram, periodogramDirect, periodogramFast, gls, chooseMethod, estimateCostNs,
  releasePeriodogramBuffers, MAX_FREQUENCIES, FAST_DEFAULTS, GRID_DEFAULTS, defaultMinPeriod, defaultMaxPeriod,
} from './periodogram-core.ts'
export { type Peak, type Alias, type FindPeaksOptions, findPeaks, ALIAS_SOURCES } from './periodogram-peaks.ts'
export { type FapOptions, type BootstrapOptions, baluevFap, falseAlarmLevel, bootstrapFap, lnGamma } from './fap.ts'
export { windowFunction, windowPowerAt } from './window.ts'

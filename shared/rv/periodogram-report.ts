/**
 * A periodogram as the product shows it, the one home for the CLI, the server and the browser:
 * instrument centring (`centring.ts`), the generalised Lomb–Scargle power (Zechmeister & Kürster
 * 2009) on the core's default grid (`GRID_DEFAULTS`), its peaks with aliases (Dawson & Fabrycky
 * 2010), Baluev (2008) false-alarm levels, the spectral window and a plot-sized copy of the curves;
 * on request the Keplerian periodogram (Zechmeister & Kürster 2009 §4; O'Toole et al. 2009) over
 * the same range, the search's detection statistic, so the screen shows what the search sees.
 */
import { centreByInstrument } from './centring.ts'
import { keplerianPeriodogram, keplerianPeaks, KEPLERIAN_PERIODOGRAM_DEFAULTS } from './planet-search/index.ts'
import {
  periodogram, findPeaks, falseAlarmLevel, windowFunction, defaultMinPeriod, defaultMaxPeriod, GRID_DEFAULTS,
} from './periodogram.ts'

/** Largest number of points kept for one plotted curve. */
export const CURVE_POINTS = 4000
/** False-alarm probabilities whose power levels are reported. */
export const FAP_LEVELS = [0.1, 0.01, 0.001] as const
/** Peaks listed by default. */
export const REPORT_PEAKS = 10

export interface PeriodogramReportInput {
  t: ArrayLike<number>
  y: ArrayLike<number>
  dy: ArrayLike<number>
  /**
   * Instrument index per point: each instrument's weighted mean is removed first
   * (`centreByInstrument`). Omit for series that are already centred (residuals).
   */
  instrument?: ArrayLike<number>
  /** Days; default `defaultMinPeriod(t)` (0.5 d, 0.2 d for dense sampling). */
  minPeriod?: number
  /** Days; default `defaultMaxPeriod(baseline)` (5× the baseline). */
  maxPeriod?: number
  /** Grid step 1/(oversample · baseline); default 10. */
  oversample?: number
  /** Explicit grid size (overrides `oversample`; the CLI's `--frequencies`). */
  frequencies?: number
  /** Number of peaks listed (default {@link REPORT_PEAKS}). */
  peaks?: number
  /**
   * Also the Keplerian periodogram (eccentric orbits, one offset per instrument fitted at every
   * trial period; `keplerianPeriodogram`) over the same period range (needs `instrument`).
   */
  keplerian?: boolean
  /** Also the whole curves (every grid frequency) for storage: `PeriodogramReport.full`. */
  full?: boolean
}

/** Every computed power (not down-sampled): the GLS on its regular grid, the Keplerian with its frequencies. */
export interface FullCurves {
  grid: { f0: number; df: number; power: Float32Array }
  keplerian: { frequency: Float64Array; power: Float32Array } | null
}

/** The Keplerian periodogram as the product shows it beside the GLS. */
export interface KeplerianReport {
  /** Plot copy of Δχ²/χ²(offsets only), 0…1, increasing period. */
  curve: { period: number[]; power: number[] }
  /** Highest peaks (side lobes merged): period, power, Δχ² and the best cell's eccentricity. */
  peaks: Array<{ period: number; frequency: number; power: number; dchi2: number; e: number }>
  count: number
  oversample: number
  /** Eccentricities of the cell grid and the shortest period each is tried at (d). */
  cells: Array<{ e: number; minPeriod: number }>
}

export interface ReportPeak {
  period: number; frequency: number; power: number; fap: number
  aliases: Array<{ period: number; frequency: number; source: string; windowPower: number; power: number }>
}

export interface PeriodogramReport {
  /** The grid actually used (the defaults resolved). */
  settings: { minPeriod: number; maxPeriod: number; oversample: number }
  grid: { minFrequency: number; maxFrequency: number; count: number; method: 'direct' | 'fast' }
  /** Plot copy, increasing period (see {@link downsampleCurve}). */
  curve: { period: number[]; power: number[] }
  window: { period: number[]; power: number[] }
  windowPeaks: Array<{ period: number; power: number }>
  peaks: ReportPeak[]
  fapLevels: Array<{ fap: number; power: number }>
  downsampling: string
  keplerian: KeplerianReport | null
  /** Present when asked for (`full: true`). */
  full?: FullCurves
}

/**
 * Down-samples a curve on a regular frequency grid for plotting on a logarithmic period axis: the
 * range is cut into ≤ max/2 bins of equal width in ln f (equal width on the plot) and each bin
 * keeps its minimum and its maximum (in grid order), so every local maximum's top survives and the
 * envelope looks as on the full grid. Bins at long periods hold few grid points and keep them
 * all, so the curve is drawn over the whole range (bins equal in f would leave the long-period end,
 * e.g. 3290–7237 d of a 7237-d grid, as one straight segment). Returned in increasing period.
 */
export function downsampleCurve(frequency: ArrayLike<number>, power: ArrayLike<number>, max = CURVE_POINTS): { period: number[]; power: number[] } {
  const m = power.length
  const keep: number[] = []
  if (m <= max) for (let k = 0; k < m; k++) keep.push(k)
  else {
    const bins = Math.floor((max - 2) / 2) // two more for the ends
    const l0 = Math.log(frequency[0]), span = Math.log(frequency[m - 1]) - l0
    const binOf = (k: number): number => Math.min(bins - 1, Math.floor(((Math.log(frequency[k]) - l0) / span) * bins))
    let lo = 0
    while (lo < m) {
      const b = binOf(lo)
      let hi = lo + 1
      while (hi < m && binOf(hi) === b) hi++
      let kMin = lo, kMax = lo
      for (let k = lo; k < hi; k++) {
        if (power[k] < power[kMin]) kMin = k
        if (power[k] > power[kMax]) kMax = k
      }
      if (kMin === kMax) keep.push(kMin)
      else keep.push(Math.min(kMin, kMax), Math.max(kMin, kMax))
      lo = hi
    }
    if (keep[0] !== 0) keep.unshift(0)
    if (keep[keep.length - 1] !== m - 1) keep.push(m - 1)
  }
  keep.reverse()
  return { period: keep.map((k) => 1 / frequency[k]), power: keep.map((k) => power[k]) }
}

function topMaxima(power: ArrayLike<number>, count: number): number[] {
  const idx: number[] = []
  for (let k = 1; k < power.length - 1; k++) if (power[k] > power[k - 1] && power[k] >= power[k + 1]) idx.push(k)
  return idx.sort((a, b) => power[b] - power[a]).slice(0, count)
}

function baselineOf(t: ArrayLike<number>): number {
  let lo = Infinity, hi = -Infinity
  for (let i = 0; i < t.length; i++) { lo = Math.min(lo, t[i]); hi = Math.max(hi, t[i]) }
  return hi - lo
}

/** The periodogram, peaks, false-alarm levels and window of a velocity (or indicator) series. */
export function periodogramReport(inp: PeriodogramReportInput): PeriodogramReport {
  const t = Float64Array.from(inp.t)
  const dy = Float64Array.from(inp.dy)
  const y = inp.instrument ? centreByInstrument(inp.y, dy, inp.instrument) : Float64Array.from(inp.y)
  const minPeriod = inp.minPeriod ?? defaultMinPeriod(t)
  const maxPeriod = inp.maxPeriod ?? defaultMaxPeriod(baselineOf(t))
  const oversample = inp.oversample ?? GRID_DEFAULTS.oversample
  const pg = periodogram(t, y, dy, { minPeriod, maxPeriod, oversample, frequencies: inp.frequencies })
  const { grid } = pg
  const fmax = grid.f0 + (grid.count - 1) * grid.df
  const peaks = findPeaks(t, y, dy, pg, { count: inp.peaks ?? REPORT_PEAKS })
  const win = windowFunction(t, grid)
  let keplerian: KeplerianReport | null = null
  let fullKeplerian: FullCurves['keplerian'] = null
  if (inp.keplerian) {
    if (!inp.instrument) throw new RangeError('the Keplerian periodogram needs the instrument of every point')
    let nInst = 0
    for (let i = 0; i < inp.instrument.length; i++) nInst = Math.max(nInst, inp.instrument[i] + 1)
    const data = { t, y: Float64Array.from(inp.y), dy, instrument: Int32Array.from(inp.instrument), instrumentNames: Array.from({ length: nInst }, (_, k) => `#${k + 1}`) }
    const kp = keplerianPeriodogram(data, { minPeriod, maxPeriod })
    const chi2 = kp.chi2Null
    if (inp.full) fullKeplerian = { frequency: Float64Array.from(kp.frequency), power: Float32Array.from(kp.power) }
    keplerian = {
      curve: downsampleCurve(kp.frequency, kp.power),
      peaks: keplerianPeaks(kp, inp.peaks ?? REPORT_PEAKS).map((p) => ({ period: p.period, frequency: p.frequency, power: chi2 > 0 ? p.dchi2 / chi2 : 0, dchi2: p.dchi2, e: p.e })),
      count: kp.period.length,
      oversample: KEPLERIAN_PERIODOGRAM_DEFAULTS.oversample,
      cells: kp.cells.map((c) => ({ e: c.e, minPeriod: c.minPeriod })),
    }
  }
  return {
    keplerian,
    ...(inp.full ? { full: { grid: { f0: grid.f0, df: grid.df, power: Float32Array.from(pg.power) }, keplerian: fullKeplerian } } : {}),
    settings: { minPeriod, maxPeriod, oversample },
    grid: { minFrequency: grid.f0, maxFrequency: fmax, count: grid.count, method: pg.method },
    curve: downsampleCurve(pg.frequency, pg.power),
    window: downsampleCurve(pg.frequency, win),
    windowPeaks: topMaxima(win, 5).map((k) => ({ period: 1 / pg.frequency[k], power: win[k] })),
    peaks: peaks.map((p) => ({
      period: p.period, frequency: p.frequency, power: p.power, fap: p.fap,
      aliases: p.aliases.map((a) => ({ period: a.period, frequency: a.frequency, source: a.source, windowPower: a.windowPower, power: a.power })),
    })),
    fapLevels: FAP_LEVELS.map((fap) => ({ fap, power: falseAlarmLevel(fap, t.length, t, fmax, { dy }) })),
    downsampling: grid.count <= CURVE_POINTS
      ? `full grid (${grid.count} frequencies)`
      : `minimum and maximum of each of ${Math.floor(CURVE_POINTS / 2)} bins equal in log period of the ${grid.count}-frequency grid, plus both ends`,
  }
}

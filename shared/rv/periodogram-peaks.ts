/**
 * Peaks of a periodogram: local maxima refined between grid points, their Baluev 2008
 * false-alarm probability and their likely aliases (Dawson & Fabrycky 2010).
 */
import { glsPrepared, prepare, type PeriodogramResult, type Prepared } from './periodogram-core.ts'
import { baluevFap } from './fap.ts'
import { windowPowerAt } from './window.ts'

/** A frequency that the sampling can confuse with the peak: f_peak ± f_source. */
export interface Alias {
  period: number
  frequency: number
  /** Which periodicity of the sampling makes it: '1 solar day', '1 sidereal day', '1 synodic month', '1 year'. */
  source: string
  /** Spectral window |W|² at the source frequency (highest within half a peak width of it), 0…1. */
  windowPower: number
  /** The data's periodogram power at the alias frequency. */
  power: number
}

export interface Peak {
  frequency: number
  period: number
  power: number
  /** Baluev 2008 false-alarm probability for a peak this high anywhere up to the grid's top frequency. */
  fap: number
  aliases: Alias[]
  /** Grid index of the local maximum the peak was refined from. */
  gridIndex: number
}

export interface FindPeaksOptions {
  /** How many peaks (default 5). */
  count?: number
  jitter?: number
  floatingMean?: boolean
  /** Sources whose window power is below this are not listed as aliases (default 0.1). */
  minWindowPower?: number
}

/**
 * Periodicities of ground-based sampling, in days (common practice; values from memory:
 * mean solar day, sidereal day 23 h 56 m 4.09 s, mean synodic month, sidereal year).
 */
export const ALIAS_SOURCES: ReadonlyArray<{ source: string; period: number }> = [
  { source: '1 solar day', period: 1 },
  { source: '1 sidereal day', period: 0.99726958 },
  { source: '1 synodic month', period: 29.530589 },
  { source: '1 year', period: 365.25636 },
]

const GOLD = (Math.sqrt(5) - 1) / 2

/** Golden-section maximum of f on [a, b]; returns [x, f(x)]. */
function goldenMax(f: (x: number) => number, a: number, b: number, iterations: number): [number, number] {
  let x1 = b - GOLD * (b - a), x2 = a + GOLD * (b - a)
  let f1 = f(x1), f2 = f(x2)
  for (let i = 0; i < iterations; i++) {
    if (f1 < f2) { a = x1; x1 = x2; f1 = f2; x2 = a + GOLD * (b - a); f2 = f(x2) }
    else { b = x2; x2 = x1; f2 = f1; x1 = b - GOLD * (b - a); f1 = f(x1) }
  }
  return f1 > f2 ? [x1, f1] : [x2, f2]
}

/** Window power of each alias source: the highest |W|² within ±0.5/baseline of its frequency. */
export function aliasSourcePowers(t: Float64Array, baseline: number): Array<{ source: string; frequency: number; windowPower: number }> {
  const half = baseline > 0 ? 0.5 / baseline : 0
  return ALIAS_SOURCES.map(({ source, period }) => {
    const f0 = 1 / period
    if (half === 0) return { source, frequency: f0, windowPower: windowPowerAt(t, f0) }
    // coarse scan then golden refinement around the best sample
    let best = f0, bestP = -1
    const steps = 16
    for (let i = 0; i <= steps; i++) {
      const f = f0 - half + (2 * half * i) / steps
      const pw = windowPowerAt(t, f)
      if (pw > bestP) { bestP = pw; best = f }
    }
    const h = (2 * half) / steps
    const [f, pw] = goldenMax((x) => windowPowerAt(t, x), Math.max(1e-9, best - h), best + h, 30)
    return pw > bestP ? { source, frequency: f, windowPower: pw } : { source, frequency: best, windowPower: bestP }
  })
}

/**
 * The `count` highest local maxima of `result.power`, each refined to sub-grid precision by
 * golden-section search of the exact GLS power (Zechmeister & Kürster 2009) between its grid
 * neighbours, sorted by power (descending), with the Baluev 2008 FAP (f_max = the grid's top
 * frequency) and the aliases f ± f_s of the sampling periodicities whose spectral window is
 * strong (Dawson & Fabrycky 2010, ApJ 722, 937, §3).
 */
export function findPeaks(t: Float64Array, y: Float64Array, dy: Float64Array, result: PeriodogramResult, opts: FindPeaksOptions = {}): Peak[] {
  const count = opts.count ?? 5
  if (!(Number.isInteger(count) && count >= 0)) throw new RangeError(`count must be an integer >= 0 (got ${count})`)
  const minWin = opts.minWindowPower ?? 0.1
  const floating = opts.floatingMean ?? true
  const p: Prepared = prepare(t, y, dy, opts.jitter ?? 0)
  const { power, grid } = result
  const m = grid.count
  if (power.length !== m) throw new RangeError(`result.power has ${power.length} values but the grid has ${m}`)
  if (p.n !== result.nPoints) throw new RangeError(`result was computed for ${result.nPoints} points but t has ${p.n}`)
  // top-`count` local maxima by insertion into a short sorted list
  const top: number[] = []
  for (let k = 0; k < m && count > 0; k++) {
    const v = power[k]
    if ((k > 0 && !(v > power[k - 1])) || (k < m - 1 && v < power[k + 1])) continue
    if (top.length === count && v <= power[top[count - 1]]) continue
    let i = top.length < count ? top.length : count - 1
    top[i] = k
    while (i > 0 && power[top[i - 1]] < v) { top[i] = top[i - 1]; top[i - 1] = k; i-- }
  }
  const fmax = grid.f0 + (m - 1) * grid.df
  const sources = top.length > 0 ? aliasSourcePowers(t, p.baseline).filter((s) => s.windowPower >= minWin) : []
  const peaks: Peak[] = top.map((k) => {
    const a = grid.f0 + Math.max(0, k - 1) * grid.df
    const b = grid.f0 + Math.min(m - 1, k + 1) * grid.df
    let f = grid.f0 + k * grid.df, pw = glsPrepared(p, f, floating)
    if (b > a && a >= 0) {
      const [fr, pr] = goldenMax((x) => glsPrepared(p, x, floating), a, b, 40)
      if (pr > pw) { f = fr; pw = pr }
    }
    const aliases: Alias[] = []
    for (const s of sources) {
      for (const fa of [f + s.frequency, Math.abs(f - s.frequency)]) {
        if (!(fa > 1e-12)) continue
        aliases.push({ period: 1 / fa, frequency: fa, source: s.source, windowPower: s.windowPower, power: glsPrepared(p, fa, floating) })
      }
    }
    aliases.sort((u, v) => v.windowPower - u.windowPower || v.power - u.power)
    return {
      frequency: f, period: 1 / f, power: pw,
      fap: p.n >= 4 ? baluevFap(pw, p.n, t, fmax, { dy, jitter: opts.jitter }) : 1,
      aliases, gridIndex: k,
    }
  })
  peaks.sort((u, v) => v.power - u.power)
  return peaks
}

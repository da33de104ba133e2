/**
 * The synthetic survey of the search tests (issue 9): one seeded case per hard class. Invented
 * stars and instruments. `scripts/reference/search_survey.ts` writes each case to
 * fixtures/search/survey-<name>.json, where scripts/reference/search_reference.py fits it
 * independently (scipy differential_evolution + least_squares).
 */
import { createRandom } from '../../../../shared/math/random.ts'
import { radialVelocity, type Keplerian } from '../../../../shared/rv/model.ts'
import type { RvData } from '../../../../shared/rv/orbit-data.ts'
import type { TrendKind } from '../../../../shared/rv/orbit-fit.ts'

const DEG = Math.PI / 180
const T0 = 2456000

export interface SurveyInstrument { name: string; offset: number; jitter: number; err: [number, number] }

export interface SurveyCase {
  name: string
  /** What the case checks, in words. */
  what: string
  seed: number
  n: number
  baseline: number
  /** 'nightly': one visit per night near the same hour, seasons of 250 d; 'random': uniform in time. */
  sampling: 'nightly' | 'random'
  /** 'segments': instruments one after another (upgrades); 'interleaved': round robin. */
  instrumentLayout: 'segments' | 'interleaved'
  instruments: SurveyInstrument[]
  planets: Keplerian[]
  /** m/s per day about the middle of the baseline. */
  slope?: number
  /** Extra times (days after T0) added to the sampling, e.g. visits at periastron. */
  extraTimes?: number[]
  /** Quoted errors are this factor times the true noise (underestimated errors: < 1). */
  errorScale?: number
  /** The model the reference fits: trend kind. */
  trend: TrendKind
  /** Alias partner period (d) the reference also fits, to measure how much worse it is. */
  aliasPeriod?: number
}

const tp = (d: number): number => T0 + d

export const SURVEY: SurveyCase[] = [
  {
    name: 'long-eccentric', what: 'period 1.3× the baseline, e = 0.7, three instrument set-ups with free offsets',
    seed: 901, n: 90, baseline: 3000, sampling: 'nightly', instrumentLayout: 'segments', trend: 'none',
    instruments: [
      { name: 'Osprey-1', offset: 4810, jitter: 3, err: [4, 7] },
      { name: 'Osprey-2', offset: 4790, jitter: 3, err: [3, 5] },
      { name: 'Osprey-3', offset: 4835, jitter: 2, err: [2, 4] },
    ],
    planets: [{ period: 3900, K: 70, e: 0.7, omega: 200 * DEG, tp: tp(1200) }],
  },
  {
    name: 'periastron', what: 'e = 0.9, periastron caught by four points (two at each of two passages)',
    seed: 902, n: 46, baseline: 1500, sampling: 'nightly', instrumentLayout: 'interleaved', trend: 'none',
    instruments: [{ name: 'Kite', offset: 0, jitter: 2, err: [2, 3] }],
    planets: [{ period: 410, K: 45, e: 0.9, omega: 60 * DEG, tp: tp(300) }],
    extraTimes: [299.2, 300.9, 709.5, 710.8],
  },
  {
    name: 'usp', what: 'ultra-short period 0.74 d with one visit a night (daily alias at 2.85 d)',
    seed: 903, n: 110, baseline: 220, sampling: 'nightly', instrumentLayout: 'interleaved', trend: 'none',
    instruments: [{ name: 'Wren', offset: 0, jitter: 1, err: [1, 1.5] }],
    planets: [{ period: 0.74, K: 6, e: 0, omega: 0, tp: tp(0.3) }],
    aliasPeriod: 1 / (1 / 0.74 - 1),
  },
  {
    name: 'daily-alias', what: '1.05-d planet whose daily alias is at 21 d',
    seed: 904, n: 100, baseline: 400, sampling: 'nightly', instrumentLayout: 'interleaved', trend: 'none',
    instruments: [{ name: 'Wren', offset: 0, jitter: 1.5, err: [1.5, 2.5] }],
    planets: [{ period: 1.05, K: 9, e: 0, omega: 0, tp: tp(0.2) }],
    aliasPeriod: 1 / (1 - 1 / 1.05),
  },
  {
    name: 'resonant-pair', what: 'two planets near the 2:1 period ratio',
    seed: 905, n: 150, baseline: 900, sampling: 'nightly', instrumentLayout: 'interleaved', trend: 'none',
    instruments: [{ name: 'Heron', offset: -12, jitter: 1.5, err: [1.5, 2.5] }],
    planets: [
      { period: 30.2, K: 14, e: 0.1, omega: 40 * DEG, tp: tp(10) },
      { period: 61.1, K: 9, e: 0.15, omega: 250 * DEG, tp: tp(25) },
    ],
  },
  {
    name: 'weak-third', what: 'two clear planets and a weak third one',
    seed: 906, n: 200, baseline: 1500, sampling: 'nightly', instrumentLayout: 'interleaved', trend: 'none',
    instruments: [{ name: 'Heron', offset: 3, jitter: 1, err: [1, 1.5] }, { name: 'Lark', offset: -20, jitter: 1.5, err: [1.5, 2] }],
    planets: [
      { period: 4.6, K: 11, e: 0.02, omega: 10 * DEG, tp: tp(1) },
      { period: 44.3, K: 7, e: 0.2, omega: 130 * DEG, tp: tp(20) },
      { period: 212, K: 3, e: 0.1, omega: 300 * DEG, tp: tp(90) },
    ],
  },
  {
    name: 'noise-underestimated', what: 'pure noise, quoted errors a third of the true scatter: no planet',
    seed: 907, n: 100, baseline: 800, sampling: 'nightly', instrumentLayout: 'interleaved', trend: 'none',
    instruments: [{ name: 'Heron', offset: 0, jitter: 0, err: [4, 6] }, { name: 'Lark', offset: 15, jitter: 0, err: [3, 5] }],
    planets: [], errorScale: 1 / 3,
  },
  {
    name: 'trend-only', what: 'a linear trend (20 m/s over the baseline) and no planet',
    seed: 908, n: 100, baseline: 2000, sampling: 'nightly', instrumentLayout: 'interleaved', trend: 'linear',
    instruments: [{ name: 'Heron', offset: 0, jitter: 1, err: [1.5, 2.5] }],
    planets: [], slope: 0.01,
  },
  {
    name: 'large', what: '2000 points from four instruments, two planets',
    seed: 909, n: 2000, baseline: 4000, sampling: 'random', instrumentLayout: 'interleaved', trend: 'none',
    instruments: [
      { name: 'Heron', offset: 0, jitter: 1, err: [1, 2] },
      { name: 'Lark', offset: 25, jitter: 2, err: [2, 3] },
      { name: 'Kite', offset: -40, jitter: 1.5, err: [1.5, 2.5] },
      { name: 'Wren', offset: 10, jitter: 3, err: [3, 4] },
    ],
    planets: [
      { period: 12.3, K: 5, e: 0.05, omega: 20 * DEG, tp: tp(4) },
      { period: 340, K: 14, e: 0.3, omega: 110 * DEG, tp: tp(100) },
    ],
  },
]

/** The data of a case: same seed, same numbers, on every machine. */
export function makeCase(c: SurveyCase): RvData {
  const rng = createRandom(c.seed)
  const days: number[] = []
  if (c.sampling === 'nightly') {
    const used = new Set<number>()
    while (days.length < c.n) {
      const d = Math.floor(rng.next() * c.baseline)
      if (d % 365 > 250 || used.has(d)) continue
      used.add(d)
      days.push(d + 0.05 * rng.normal())
    }
  } else {
    while (days.length < c.n) days.push(rng.next() * c.baseline)
  }
  days.push(...(c.extraTimes ?? []))
  days.sort((a, b) => a - b)
  const m = days.length
  const t = Float64Array.from(days, (d) => T0 + d)
  const y = radialVelocity(t, c.planets)
  const dy = new Float64Array(m)
  const instrument = new Int32Array(m)
  const nI = c.instruments.length
  const tmid = T0 + c.baseline / 2
  for (let i = 0; i < m; i++) {
    const k = c.instrumentLayout === 'segments' ? Math.min(nI - 1, Math.floor((days[i] / c.baseline) * nI)) : i % nI
    const s = c.instruments[k]
    instrument[i] = k
    const sigma = s.err[0] + (s.err[1] - s.err[0]) * rng.next()
    dy[i] = sigma * (c.errorScale ?? 1)
    y[i] += s.offset + (c.slope ?? 0) * (t[i] - tmid) + Math.sqrt(sigma * sigma + s.jitter * s.jitter) * rng.normal()
  }
  return { t, y, dy, instrument, instrumentNames: c.instruments.map((s) => s.name) }
}

// Loader for fixtures/periodogram/*.json (made by scripts/reference/periodogram_reference.py).
import { readFileSync } from 'node:fs'

export interface PeriodogramFixture {
  name: string
  source: string
  t: number[]; y: number[]; dy: number[]
  grid: { f0: number; df: number; count: number }
  maxFrequency: number
  astropyFapMaxFrequency: number
  powerFloating: number[]
  powerClassic: number[]
  scipyClassicEqualErrors: number[]
  topPeaks: Array<{ index: number; frequency: number; power: number; fapBaluev: number }>
  fapAtLevels: Array<{ power: number; fapBaluev: number }>
  falseAlarmLevels: Array<{ fap: number; power: number }>
  generator: { period: number; nightly: boolean }
}

export const FIXTURE_NAMES = ['sparse', 'nightly', 'long'] as const

export function loadFixture(name: string): PeriodogramFixture {
  const url = new URL(`../../../fixtures/periodogram/synthetic-${name}.json`, import.meta.url)
  return JSON.parse(readFileSync(url, 'utf8')) as PeriodogramFixture
}

export const f64 = (a: number[]): Float64Array => Float64Array.from(a)

export function maxAbs(a: ArrayLike<number>): number {
  let m = 0
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i]))
  return m
}

export function maxAbsDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let m = 0
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i] - b[i]))
  return m
}

/**
 * The grid the reference fixtures were made on (scripts/reference/periodogram_reference.py):
 * 1.1 d to the baseline, 10× oversampled — the product's default before the 0.5 d – 5× baseline one.
 */
export function fixtureGrid(t: Float64Array): { minPeriod: number; maxPeriod: number } {
  let lo = Infinity, hi = -Infinity
  for (const v of t) { lo = Math.min(lo, v); hi = Math.max(hi, v) }
  return { minPeriod: 1.1, maxPeriod: hi - lo }
}

import type { Measurement } from '@/api/types.ts'

/** One instrument's zero point as removed in the offset-corrected view. */
export interface ZeroPoint {
  instrument: string
  /** m/s */
  value: number
  /** How it was found: the median of the points in use, or the offset of a fitted model. */
  source: 'median' | 'fitted'
  /** Points the median was taken over (in use ones; all of them when every point is excluded). */
  n: number
}

/** A fitted model's instrument offsets (m/s), named for the screen. */
export interface FittedOffsets { modelName: string; offsets: Record<string, number> }

/** Median of a non-empty list (the mean of the middle two for an even count). */
export function median(values: number[]): number {
  const v = [...values].sort((a, b) => a - b)
  const mid = v.length >> 1
  return v.length % 2 ? v[mid]! : (v[mid - 1]! + v[mid]!) / 2
}

/**
 * Each instrument's zero point: its fitted offset when a model gives one, else the median of its
 * points in use (the median, not the mean, so a few outliers do not move the set; common practice).
 */
export function zeroPoints(measurements: Measurement[], fitted?: FittedOffsets | null): ZeroPoint[] {
  const by = new Map<string, Measurement[]>()
  for (const m of measurements) by.set(m.instrument, [...(by.get(m.instrument) ?? []), m])
  return [...by.entries()].map(([instrument, list]) => {
    const fit = fitted?.offsets[instrument]
    const used = list.filter((m) => !m.excluded)
    const pool = used.length ? used : list
    if (fit !== undefined && Number.isFinite(fit)) return { instrument, value: fit, source: 'fitted' as const, n: pool.length }
    return { instrument, value: median(pool.map((m) => m.rv)), source: 'median' as const, n: pool.length }
  })
}

/** The points with their instrument's zero point removed (errors unchanged). */
export function removeZeroPoints(measurements: Measurement[], points: ZeroPoint[]): Measurement[] {
  const zp = new Map(points.map((p) => [p.instrument, p.value]))
  return measurements.map((m) => ({ ...m, rv: m.rv - (zp.get(m.instrument) ?? 0) }))
}

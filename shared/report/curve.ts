/**
 * The model curve of a frozen solution, from the snapshot alone (what the JSON export is for):
 *   v(t) = γ_inst + γ̇ (t − t₀) + γ̈ (t − t₀)² + Σ_planets K [cos(ν + ω) + e cos ω]
 * with t₀ the fit's epoch and ν the true anomaly of each orbit (shared/rv/model.ts).
 */
import type { FitResultJson } from '../api/analyses.ts'
import { radialVelocity, type Keplerian } from '../rv/model.ts'

const DEG = Math.PI / 180

export function orbitsOf(result: Pick<FitResultJson, 'planets'>, only?: number): Keplerian[] {
  return result.planets
    .filter((_, k) => only === undefined || k === only)
    .map((p) => ({ period: p.period, K: p.K, e: p.e, omega: p.omegaDeg * DEG, tp: p.tp }))
}

/** Sum of the Keplerians (no offset, no trend) at times t, optionally of one planet only. */
export function keplerianVelocity(result: Pick<FitResultJson, 'planets'>, times: readonly number[], only?: number): number[] {
  return Array.from(radialVelocity(Float64Array.from(times), orbitsOf(result, only)))
}

/** The trend γ̇ (t − t₀) + γ̈ (t − t₀)² at times t (zero without a trend). */
export function trendVelocity(result: Pick<FitResultJson, 'trend' | 'epoch'>, times: readonly number[]): number[] {
  const t = result.trend
  if (!t || t.kind === 'none') return times.map(() => 0)
  return times.map((x) => { const dt = x - t.epoch; return t.slope * dt + t.curvature * dt * dt })
}

/** The full model velocity of each point (its instrument's offset included; an unknown instrument gets offset 0). */
export function modelVelocity(result: Pick<FitResultJson, 'planets' | 'trend' | 'epoch' | 'instruments'>, times: readonly number[], instruments: readonly string[]): number[] {
  const kep = keplerianVelocity(result, times)
  const tr = trendVelocity(result, times)
  const off = new Map(result.instruments.map((i) => [i.name, i.offset ?? 0]))
  return times.map((_, i) => kep[i]! + tr[i]! + (off.get(instruments[i]!) ?? 0))
}

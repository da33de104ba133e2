// Plot data of a fitted model, computed from the fitted parameters with the numerical core: the
// model curve over time, each planet's phase-folded points with the other signals removed, and
// its curve over one orbit. Pure: runs in the browser worker, or inline where there is no Worker.
import { addKeplerian, type Keplerian } from '@shared/rv/index.ts'

export interface CurvePlanet { period: number; K: number; e: number; omegaDeg: number; tp: number; tc: number }
export interface CurveTrend { slope: number; curvature: number; epoch: number }
export interface CurvePoint { id: number; time: number; residual: number; instrument: string; error: number }

export interface CurvesInput {
  planets: CurvePlanet[]
  trend: CurveTrend | null
  points: CurvePoint[]
  /** Times (full JD) of the first and last point the curve spans. */
  start: number
  end: number
  /** Samples of the time curve (default 3000). */
  samples?: number
}

export interface FoldedPlanet {
  /** Per point: [phase in −0.5…0.5 from Tc, velocity of this planet alone + residual, error, id]. */
  points: Array<[number, number, number, number]>
  /** [phase, model velocity] over one orbit. */
  curve: Array<[number, number]>
  instruments: string[]
}

export interface CurvesOutput {
  /** [time, model velocity of all planets and the trend] (no instrument offset). */
  timeCurve: Array<[number, number]>
  folded: FoldedPlanet[]
}

const DEG = Math.PI / 180

function orbit(p: CurvePlanet): Keplerian {
  return { period: p.period, K: p.K, e: p.e, omega: p.omegaDeg * DEG, tp: p.tp }
}

/** Phase of `time` from the reference conjunction, in [−0.5, 0.5). */
export function phaseOf(time: number, period: number, tc: number): number {
  const x = (time - tc) / period
  return x - Math.floor(x + 0.5)
}

export function computeCurves(input: CurvesInput): CurvesOutput {
  const samples = Math.max(2, Math.min(20000, input.samples ?? 3000))
  // The time curve must resolve the shortest orbit: at least ~40 samples a period.
  const span = Math.max(input.end - input.start, 1e-6)
  const shortest = Math.min(...input.planets.map((p) => p.period), Infinity)
  const n = Number.isFinite(shortest) ? Math.min(20000, Math.max(samples, Math.ceil(40 * span / shortest))) : samples
  const t = new Float64Array(n)
  for (let i = 0; i < n; i++) t[i] = input.start + (span * i) / (n - 1)
  const v = new Float64Array(n)
  for (const p of input.planets) addKeplerian(t, orbit(p), v)
  if (input.trend) {
    for (let i = 0; i < n; i++) {
      const dt = t[i]! - input.trend.epoch
      v[i] = v[i]! + input.trend.slope * dt + input.trend.curvature * dt * dt
    }
  }
  const timeCurve: Array<[number, number]> = Array.from(t, (time, i) => [time, v[i]!])

  const pt = Float64Array.from(input.points, (p) => p.time)
  const folded = input.planets.map((p): FoldedPlanet => {
    const own = new Float64Array(pt.length)
    addKeplerian(pt, orbit(p), own)
    const points = input.points.map((q, i): [number, number, number, number] => [phaseOf(q.time, p.period, p.tc), own[i]! + q.residual, q.error, q.id])
    const m = 400
    const ct = new Float64Array(m + 1)
    for (let i = 0; i <= m; i++) ct[i] = p.tc + p.period * (i / m - 0.5)
    const cv = new Float64Array(m + 1)
    addKeplerian(ct, orbit(p), cv)
    const curve = Array.from(cv, (value, i): [number, number] => [i / m - 0.5, value])
    return { points, curve, instruments: input.points.map((q) => q.instrument) }
  })
  return { timeCurve, folded }
}

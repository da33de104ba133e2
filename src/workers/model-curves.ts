// Plot data of a fitted model, computed from the fitted parameters with the numerical core's
// model-curve functions (shared/rv/model-curve.ts, the same for reports and the CLI): the model
// over time — a regular grid when it resolves the shortest orbit, otherwise segments around the
// measurements with breaks across the gaps — each planet's phase-folded points with the other
// signals removed, and its curve over one orbit. Pure: runs in the browser worker, or inline.
import {
  addKeplerian, curveTimes, keplerianOf, modelVelocity, phaseCurve, phaseOf, type CurveTrend, type PlanetElements,
} from '@shared/rv/index.ts'
import { gpActivity, type GpCurveInput, type GpCurveOutput } from './gp-curve.ts'

export { phaseOf }
export type CurvePlanet = PlanetElements
export type { CurveTrend }
export interface CurvePoint { id: number; time: number; residual: number; instrument: string; error: number }

export interface CurvesInput {
  planets: CurvePlanet[]
  trend: CurveTrend | null
  points: CurvePoint[]
  /** Times (full JD) of the first and last point the curve spans. */
  start: number
  end: number
  /** Fewest samples of a regular time curve (default of the core, 2000). */
  samples?: number
  /** A GP noise model as fitted: its activity curve ±1σ is drawn, and removed from the folded points. */
  gp?: GpCurveInput | null
}

export interface FoldedPlanet {
  /** Per point: [phase in −0.5…0.5 from Tc, velocity of this planet alone + residual, error, id]. */
  points: Array<[number, number, number, number]>
  /** [phase, model velocity] over one orbit. */
  curve: Array<[number, number]>
  instruments: string[]
}

export interface CurvesOutput {
  /** [time, model velocity of all planets and the trend] (no instrument offset); null breaks the line. */
  timeCurve: Array<[number, number | null]>
  /** 'regular' grid, or 'segments' around the measurements (the orbit is too short for a grid over the whole span). */
  sampling: 'regular' | 'segments'
  folded: FoldedPlanet[]
  /** With a GP: the activity curve on the time grid and at each point. */
  gp?: GpCurveOutput | null
}

export function computeCurves(input: CurvesInput): CurvesOutput {
  const shortest = Math.min(...input.planets.map((p) => p.period), input.gp?.kernel.period ?? Infinity)
  const sampling = curveTimes(input.points.map((p) => p.time), input.start, input.end, shortest, input.samples ? { minSamples: input.samples } : {})
  const v = modelVelocity(input.planets, input.trend, sampling.time)
  const timeCurve: Array<[number, number | null]> = []
  let last = input.start
  for (let i = 0; i < sampling.time.length; i++) {
    const t = sampling.time[i]!
    if (Number.isNaN(t)) timeCurve.push([last, null])
    else { timeCurve.push([t, v[i]!]); last = t }
  }
  const pt = Float64Array.from(input.points, (p) => p.time)
  const gp = input.gp ? gpActivity(input.gp, input.points, sampling.time) : null
  const folded = input.planets.map((p): FoldedPlanet => {
    const own = new Float64Array(pt.length)
    addKeplerian(pt, keplerianOf(p), own)
    // with a GP, the planet's signal is shown with the GP prediction (the activity) removed
    const points = input.points.map((q, i): [number, number, number, number] => [phaseOf(q.time, p.period, p.tc), own[i]! + q.residual - (gp ? gp.atPoints[i]! : 0), q.error, q.id])
    return { points, curve: phaseCurve(p), instruments: input.points.map((q) => q.instrument) }
  })
  return { timeCurve, sampling: sampling.mode, folded, gp }
}

// The activity curve of a GP noise model for the plots, with the numerical core's GP functions
// (shared/rv/gp: the same factor, conditional mean and variance the fit uses): its mean ±1σ on the
// time grid as the first-listed instrument sees it, and its mean at every point (each point with its
// own instrument's amplitude). Pure: runs in the curves worker.
import { gpActivityAtData, gpFactor, gpPredict, type GpNoiseModel, type KernelShape } from '@shared/rv/index.ts'

/** The fitted GP as the API stores it (`FitResultJson.noise.model`). */
export interface GpCurveInput {
  kernel: { kind: 'rotation' | 'quasi-periodic'; period: number; decayTime: number; shape: number }
  amplitude: number[]
  jitter: number[]
  instruments: string[]
}

export interface GpCurveOutput {
  /** [time, mean, 1σ] on the grid; nulls break the line. */
  curve: Array<[number, number | null, number | null]>
  /** The GP mean at each point (input order). */
  atPoints: number[]
  /** The instrument whose amplitude the curve uses. */
  instrument: string
}

export function gpActivity(gp: GpCurveInput, points: Array<{ time: number; residual: number; instrument: string; error: number }>, grid: Float64Array): GpCurveOutput {
  const kernel: KernelShape = gp.kernel.kind === 'rotation'
    ? { kind: 'rotation', period: gp.kernel.period, decayTime: gp.kernel.decayTime, shape: gp.kernel.shape }
    : { kind: 'quasi-periodic', period: gp.kernel.period, decayTime: gp.kernel.decayTime, roughness: gp.kernel.shape }
  const model: GpNoiseModel = { kernel, amplitude: gp.amplitude, jitter: gp.jitter }
  const index = new Map(gp.instruments.map((name, k) => [name, k]))
  const rows = points.filter((p) => index.has(p.instrument))
  const series = {
    t: Float64Array.from(rows, (p) => p.time), dy: Float64Array.from(rows, (p) => p.error),
    instrument: Int32Array.from(rows, (p) => index.get(p.instrument)!), instrumentNames: gp.instruments,
  }
  const r = Float64Array.from(rows, (p) => p.residual)
  const f = gpFactor(series, model)
  const at = gpActivityAtData(f, r)
  const byPoint = new Map(rows.map((p, i) => [p, at[i]!]))
  const times = Array.from(grid).filter((t) => !Number.isNaN(t))
  const pred = gpPredict(f, r, Float64Array.from(times), { instrument: 0, variance: true })
  const curve: GpCurveOutput['curve'] = []
  let k = 0
  for (let i = 0; i < grid.length; i++) {
    const t = grid[i]!
    if (Number.isNaN(t)) { curve.push([curve.length ? curve[curve.length - 1]![0] : 0, null, null]); continue }
    curve.push([t, pred.mean[k]!, Math.sqrt(Math.max(0, pred.variance![k]!))])
    k++
  }
  return { curve, atPoints: points.map((p) => byPoint.get(p) ?? 0), instrument: gp.instruments[0] ?? '' }
}

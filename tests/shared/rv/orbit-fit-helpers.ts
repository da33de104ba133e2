/** Seeded synthetic velocity series for the fit and search tests. */
import { createRandom } from '../../../shared/math/random.ts'
import { radialVelocity, type Keplerian } from '../../../shared/rv/model.ts'
import type { RvData } from '../../../shared/rv/orbit-data.ts'

export interface SynthInstrument { name: string; offset: number; jitter: number; err: [number, number] }

export interface SynthOptions {
  seed: number
  n: number
  baseline: number
  planets: Keplerian[]
  instruments?: SynthInstrument[]
  /** m/s per day and m/s per day², about `t0 + baseline/2`. */
  slope?: number
  curvature?: number
  t0?: number
}

/** Nightly sampling (one visit a night near the same hour, seasonal gaps), Gaussian noise incl. jitter. */
export function synth(o: SynthOptions): { data: RvData; epoch: number } {
  const rng = createRandom(o.seed)
  const insts = o.instruments ?? [{ name: 'A', offset: 0, jitter: 0, err: [1, 2] as [number, number] }]
  const t0 = o.t0 ?? 2455000
  const times: number[] = []
  while (times.length < o.n) {
    const d = Math.floor(rng.next() * o.baseline)
    if (d % 365 > 250) continue
    times.push(t0 + d + 0.1 * rng.normal())
  }
  times.sort((a, b) => a - b)
  const t = Float64Array.from(times)
  const y = radialVelocity(t, o.planets)
  const dy = new Float64Array(o.n)
  const instrument = new Int32Array(o.n)
  const epoch = t0 + o.baseline / 2
  for (let i = 0; i < o.n; i++) {
    const k = i % insts.length
    const s = insts[k]
    instrument[i] = k
    dy[i] = s.err[0] + (s.err[1] - s.err[0]) * rng.next()
    const dt = t[i] - epoch
    y[i] += s.offset + (o.slope ?? 0) * dt + (o.curvature ?? 0) * dt * dt + Math.sqrt(dy[i] ** 2 + s.jitter ** 2) * rng.normal()
  }
  return { data: { t, y, dy, instrument, instrumentNames: insts.map((s) => s.name) }, epoch }
}

/** |a − b| within k standard errors. */
export function withinSigma(actual: number, truth: number, sigma: number, k = 3): boolean {
  return Math.abs(actual - truth) <= k * sigma
}

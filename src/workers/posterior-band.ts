// The band of posterior model curves: the velocity of every drawn parameter set (planets and
// trend, no instrument offset) on a time grid, and per time the 16th, 50th and 84th percentile.
// Pure: runs in the browser worker, or inline where there is no Worker.
import { keplerianOf, radialVelocity, type Keplerian, type PlanetElements } from '@shared/rv/index.ts'

export interface BandDraw {
  /** The core's planet elements without Tc (not needed to evaluate the orbit). */
  planets: Array<Omit<PlanetElements, 'tc'>>
  slope: number
  curvature: number
}

export interface BandInput {
  draws: BandDraw[]
  /** Reference time of the trend (full JD). */
  epoch: number
  start: number
  end: number
  /** Time samples (default 1500; raised so the shortest period gets ~30 samples, at most 6000). */
  samples?: number
}

export interface BandOutput {
  time: number[]
  lo: number[]
  median: number[]
  hi: number[]
  /** Draws that could be evaluated (a draw with an invalid orbit is skipped). */
  used: number
}

/** Linear-interpolation quantile of a sorted array (the usual "type 7" definition, common practice). */
export function quantileSorted(sorted: Float64Array, q: number): number {
  const n = sorted.length
  if (n === 0) return Number.NaN
  const h = (n - 1) * q
  const i = Math.floor(h)
  const f = h - i
  return i + 1 < n ? sorted[i]! + f * (sorted[i + 1]! - sorted[i]!) : sorted[i]!
}

export function computeBand(input: BandInput): BandOutput {
  if (!(input.end > input.start)) throw new RangeError('end must be after start')
  const shortest = Math.min(Infinity, ...input.draws.flatMap((d) => d.planets.map((p) => p.period)))
  const base = Math.max(2, input.samples ?? 1500)
  const span = input.end - input.start
  const n = Math.min(6000, Number.isFinite(shortest) && shortest > 0 ? Math.max(base, Math.ceil(30 * span / shortest)) : base)
  const t = new Float64Array(n)
  for (let i = 0; i < n; i++) t[i] = input.start + (span * i) / (n - 1)
  const curves: Float64Array[] = []
  const v = new Float64Array(n)
  for (const d of input.draws) {
    const orbits: Keplerian[] = d.planets.map(keplerianOf)
    try {
      radialVelocity(t, orbits, v)
    } catch {
      continue
    }
    const c = new Float64Array(n)
    for (let i = 0; i < n; i++) {
      const dt = t[i]! - input.epoch
      c[i] = v[i]! + d.slope * dt + d.curvature * dt * dt
    }
    curves.push(c)
  }
  const lo: number[] = [], median: number[] = [], hi: number[] = []
  const column = new Float64Array(curves.length)
  for (let i = 0; i < n; i++) {
    for (let k = 0; k < curves.length; k++) column[k] = curves[k]![i]!
    column.sort()
    lo.push(quantileSorted(column, 0.16)); median.push(quantileSorted(column, 0.5)); hi.push(quantileSorted(column, 0.84))
  }
  return { time: Array.from(t), lo, median, hi, used: curves.length }
}

/**
 * Up to `max` evenly spaced rows of the thinned posterior sample as parameter sets. Rows with a
 * missing value are skipped.
 */
export function drawsFromSample(sample: { names: string[]; columns: Array<Array<number | null>> }, max = 300): BandDraw[] {
  const col = (name: string) => { const j = sample.names.indexOf(name); return j >= 0 ? sample.columns[j]! : null }
  const labels = sample.names.filter((n) => /^P \S+$/.test(n)).map((n) => n.slice(2))
  const planets = labels.map((l) => ({ P: col(`P ${l}`), K: col(`K ${l}`), e: col(`e ${l}`), w: col(`ω ${l}`), tp: col(`Tp ${l}`) }))
  const slope = col('slope')
  const curvature = col('curvature')
  const rows = sample.columns[0]?.length ?? 0
  const every = Math.max(1, Math.ceil(rows / max))
  const draws: BandDraw[] = []
  for (let i = 0; i < rows; i += every) {
    const ps = planets.map((p) => ({ period: p.P?.[i], K: p.K?.[i], e: p.e?.[i], omegaDeg: p.w?.[i], tp: p.tp?.[i] }))
    if (!ps.every((p) => [p.period, p.K, p.e, p.omegaDeg, p.tp].every((x) => typeof x === 'number' && Number.isFinite(x)))) continue
    draws.push({
      planets: ps as BandDraw['planets'],
      slope: slope?.[i] ?? 0,
      curvature: curvature?.[i] ?? 0,
    })
  }
  return draws
}

/**
 * Expected information of one new velocity at time t, from posterior draws of the model
 * (Ford 2008, AJ 135, 1008: choose the time where the predictions of the posterior draws disagree
 * most, measured against the noise of the new measurement). With the predictive distribution
 * approximated as Gaussian, the expected information gain of a measurement with noise σ is the
 * mutual information between the measurement and the model,
 *
 *   I(t) = ½ ln(1 + s²(t)/σ²)   (nats),
 *
 * s²(t) the variance of the predicted velocity across draws (sample variance, n − 1) and σ² the
 * measurement error squared plus the jitter squared. Each time is scored as if it were the only new
 * measurement: two picks close together carry less than the sum of their scores (the schedule's
 * minimum spacing stands in for that redundancy, see schedule.ts).
 */
import { addKeplerian, radialVelocityAt, tcToTp, type Keplerian } from '../rv/index.ts'

const DEG = Math.PI / 180

/** Posterior draws, one entry per draw in every array (all the same length). */
export interface PosteriorDraws {
  planets: Array<{
    /** days */ period: ArrayLike<number>
    /** m/s */ K: ArrayLike<number>
    e: ArrayLike<number>
    /** degrees, the star's orbit */ omegaDeg: ArrayLike<number>
    /** time of periastron, days on the data's time scale */ tp: ArrayLike<number>
  }>
  /** Offset of the instrument that will observe (m/s); omitted → 0 for every draw. */
  offset?: ArrayLike<number>
  /** Trend slope (m/s/d) and curvature (m/s/d²) about `epoch`. */
  slope?: ArrayLike<number>
  curvature?: ArrayLike<number>
  epoch?: number
}

/** Number of draws; throws a RangeError naming the first array whose length disagrees. */
export function drawCount(d: PosteriorDraws): number {
  if (!d.planets.length && !d.slope && !d.curvature && !d.offset) throw new RangeError('draws must hold at least one planet, an offset or a trend')
  const first = d.planets[0]?.period ?? d.offset ?? d.slope ?? d.curvature!
  const n = first.length
  if (n < 2) throw new RangeError(`at least 2 posterior draws are needed, got ${n}`)
  const check = (name: string, a: ArrayLike<number> | undefined): void => {
    if (a && a.length !== n) throw new RangeError(`${name} has ${a.length} draws, expected ${n}`)
  }
  d.planets.forEach((p, k) => {
    for (const key of ['period', 'K', 'e', 'omegaDeg', 'tp'] as const) check(`planets[${k}].${key}`, p[key])
  })
  check('offset', d.offset); check('slope', d.slope); check('curvature', d.curvature)
  if ((d.slope || d.curvature) && !Number.isFinite(d.epoch)) throw new RangeError('epoch must be given with a trend')
  return n
}

function orbitOf(p: PosteriorDraws['planets'][number], i: number, k: number): Keplerian {
  const o = { period: p.period[i], K: p.K[i], e: p.e[i], omega: p.omegaDeg[i] * DEG, tp: p.tp[i] }
  if (!(o.period > 0 && o.e >= 0 && o.e < 1 && Number.isFinite(o.K) && Number.isFinite(o.tp) && Number.isFinite(o.omega))) {
    throw new RangeError(`draw ${i} of planet ${k} is not a valid orbit (P ${o.period}, K ${o.K}, e ${o.e})`)
  }
  return o
}

/** Trend and offset of draw i at time t. */
function baseAt(d: PosteriorDraws, i: number, t: number): number {
  const dt = t - (d.epoch ?? 0)
  return (d.offset ? d.offset[i] : 0) + (d.slope ? d.slope[i] * dt : 0) + (d.curvature ? d.curvature[i] * dt * dt : 0)
}

/** Predicted velocity of every draw at `times`: row-major [draw][time] (the readable reference, and for bands). */
export function predictDraws(draws: PosteriorDraws, times: Float64Array): Float64Array[] {
  const n = drawCount(draws)
  const out: Float64Array[] = []
  for (let i = 0; i < n; i++) {
    const v = new Float64Array(times.length)
    for (let j = 0; j < times.length; j++) v[j] = baseAt(draws, i, times[j])
    draws.planets.forEach((p, k) => addKeplerian(times, orbitOf(p, i, k), v))
    out.push(v)
  }
  return out
}

/**
 * Mean and variance (n − 1) of the predicted velocity across draws at each time. One pass over the
 * draws with Welford's update (one velocity array in memory, not draws × times).
 */
export function predictiveSpread(draws: PosteriorDraws, times: Float64Array): { mean: Float64Array; variance: Float64Array } {
  const n = drawCount(draws)
  const m = times.length
  const mean = new Float64Array(m), m2 = new Float64Array(m), v = new Float64Array(m)
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < m; j++) v[j] = baseAt(draws, i, times[j])
    draws.planets.forEach((p, k) => addKeplerian(times, orbitOf(p, i, k), v))
    for (let j = 0; j < m; j++) {
      const d = v[j] - mean[j]
      mean[j] += d / (i + 1)
      m2[j] += d * (v[j] - mean[j])
    }
  }
  for (let j = 0; j < m; j++) m2[j] /= n - 1
  return { mean, variance: m2 }
}

/** I = ½ ln(1 + s²/σ²) for one variance s² (m²/s²) and noise σ (m/s). */
export function informationFromVariance(variance: number, noise: number): number {
  if (!(noise > 0 && Number.isFinite(noise))) throw new RangeError(`noise must be a positive number of m/s, got ${noise}`)
  return 0.5 * Math.log1p(variance / (noise * noise))
}

/** Expected information (nats) of one new velocity with error `noise` (m/s, jitter included) at each time. */
export function expectedInformation(draws: PosteriorDraws, times: Float64Array, noise: number): Float64Array {
  informationFromVariance(0, noise)
  const { variance } = predictiveSpread(draws, times)
  return variance.map((s2) => informationFromVariance(s2, noise))
}

/**
 * The same criterion computed directly: for each time, every draw's velocity from the one-orbit
 * formula, then the two-pass sample variance. Slow and plain; the test holds the fast path to it.
 */
export function expectedInformationDirect(draws: PosteriorDraws, times: Float64Array, noise: number): Float64Array {
  const n = drawCount(draws)
  return times.map((t) => {
    const v: number[] = []
    for (let i = 0; i < n; i++) {
      let s = baseAt(draws, i, t)
      draws.planets.forEach((p, k) => { s += radialVelocityAt(t, orbitOf(p, i, k)) })
      v.push(s)
    }
    const mu = v.reduce((a, b) => a + b, 0) / n
    const s2 = v.reduce((a, b) => a + (b - mu) ** 2, 0) / (n - 1)
    return informationFromVariance(s2, noise)
  })
}

/** Quantiles (linear between order statistics) of the predicted velocity at each time: the posterior band. */
export function predictiveBand(draws: PosteriorDraws, times: Float64Array, probs: readonly number[] = [0.16, 0.5, 0.84]): Float64Array[] {
  probs.forEach((p) => { if (!(p >= 0 && p <= 1)) throw new RangeError(`probabilities must be in [0, 1], got ${p}`) })
  const rows = predictDraws(draws, times)
  const n = rows.length
  const out = probs.map(() => new Float64Array(times.length))
  const col = new Float64Array(n)
  for (let j = 0; j < times.length; j++) {
    for (let i = 0; i < n; i++) col[i] = rows[i][j]
    col.sort()
    probs.forEach((p, q) => {
      const h = (n - 1) * p, lo = Math.floor(h)
      out[q][j] = lo + 1 < n ? col[lo] + (h - lo) * (col[lo + 1] - col[lo]) : col[lo]
    })
  }
  return out
}

/** A sampling run's plot sample (columns named `P b`, `K b`, `e b`, `ω b`, `Tp b`, `offset NAME`, `slope`, `curvature`). */
export interface NamedSample { names: string[]; columns: ArrayLike<number>[] }

/**
 * Posterior draws from a sampling run's kept sample. `instrument` picks the offset column of the
 * instrument that will observe; `epoch` is the trend's reference time (required when the sample
 * has a slope or curvature). Throws naming the missing column.
 */
export function drawsFromSample(sample: NamedSample, opts: { instrument?: string; epoch?: number } = {}): PosteriorDraws {
  const col = (name: string): ArrayLike<number> | undefined => {
    const i = sample.names.indexOf(name)
    return i < 0 ? undefined : sample.columns[i]
  }
  const need = (name: string): ArrayLike<number> => {
    const c = col(name)
    if (!c) throw new RangeError(`the sample has no column "${name}"`)
    return c
  }
  const planets: PosteriorDraws['planets'] = []
  for (const name of sample.names) {
    const m = /^P (\S+)$/.exec(name)
    if (!m) continue
    const lab = m[1]
    const period = need(`P ${lab}`), e = need(`e ${lab}`), omegaDeg = need(`ω ${lab}`)
    let tp = col(`Tp ${lab}`)
    if (!tp) {
      const tc = need(`Tc ${lab}`)
      tp = Float64Array.from(tc, (v, i) => tcToTp(v, period[i], e[i], omegaDeg[i] * DEG))
    }
    planets.push({ period, K: need(`K ${lab}`), e, omegaDeg, tp })
  }
  const slope = col('slope'), curvature = col('curvature')
  if ((slope || curvature) && !Number.isFinite(opts.epoch)) throw new RangeError('epoch must be given: the sample has a trend')
  return {
    planets,
    offset: opts.instrument === undefined ? undefined : need(`offset ${opts.instrument}`),
    slope, curvature, epoch: opts.epoch,
  }
}

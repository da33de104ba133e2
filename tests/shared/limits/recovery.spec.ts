import { describe, it, expect } from 'vitest'
import { createRandom } from '../../../shared/math/index.ts'
import { gls } from '../../../shared/rv/index.ts'
import { prepareRecovery, recoverInjected, recoverInjectedFull, injectInto, detectionProbability, type LimitsData } from '../../../shared/limits/index.ts'

/**
 * White noise only, circular orbits: the recovered fraction against K must follow the exact
 * known-frequency detection probability at the search's threshold (Cumming 2004; noncentral F with
 * λ the Δχ² of the noise-free signal, see shared/limits/analytic.ts), within binomial error.
 * Fresh noise and phase per trial; one set of 200 times over 300 d; σ = 2 m/s.
 */
const N = 200, SIGMA = 2, PERIOD = 13.7
const rng = createRandom(2024)
const t = Float64Array.from({ length: N }, () => 2460000 + 300 * rng.next()).sort()
const dy = new Float64Array(N).fill(SIGMA)

function noise(r: ReturnType<typeof createRandom>): Float64Array {
  return Float64Array.from({ length: N }, () => SIGMA * r.normal())
}

/** λ: the Δχ² the noise-free signal removes at its own frequency. */
function lambdaOf(signal: Float64Array): number {
  let sw = 0, swy = 0
  for (let i = 0; i < N; i++) { sw += 1 / SIGMA ** 2; swy += signal[i] / SIGMA ** 2 }
  const mean = swy / sw
  let chi0 = 0
  for (let i = 0; i < N; i++) chi0 += ((signal[i] - mean) / SIGMA) ** 2
  return gls(t, signal, dy, 1 / PERIOD) * chi0
}

function runTrials(criterion: 'power' | 'peak', K: number, trials: number, seed: number) {
  const data: LimitsData = { t, residuals: new Float64Array(N), dy }
  const rec = prepareRecovery(data, { criterion })
  const r = createRandom(seed)
  const table = new Map<number, number>()
  const at = (i: number): number => {
    if (!table.has(i)) table.set(i, detectionProbability(i * 0.25, rec.level, N))
    return table.get(i)!
  }
  // the exact probability on a λ grid of step 0.25, linear in between (error < 1e-3)
  const prob = (lam: number): number => { const i = Math.floor(lam / 0.25), u = lam / 0.25 - i; return (1 - u) * at(i) + u * at(i + 1) }
  let hits = 0, expected = 0, variance = 0, lamSum = 0
  const y = new Float64Array(N)
  for (let k = 0; k < trials; k++) {
    const orbit = { period: PERIOD, K, e: 0, omega: 0, tp: t[0] + PERIOD * r.next() }
    const clean = injectInto(t, new Float64Array(N), orbit, new Float64Array(N))
    const lam = lambdaOf(clean)
    lamSum += lam
    const p = prob(lam)
    expected += p; variance += p * (1 - p)
    injectInto(t, noise(r), orbit, y)
    if (recoverInjected(rec, t, y, dy, 1 / PERIOD).recovered) hits++
  }
  return { fraction: hits / trials, expected: expected / trials, sd: Math.sqrt(variance) / trials, meanLambda: lamSum / trials, level: rec.level }
}

describe('recovery against the analytic detection probability (white noise, circular orbits)', () => {
  it('power at the injected period: recovered fraction within 3 binomial σ of the prediction at every K', () => {
    for (const K of [0.7, 1.0, 1.2, 1.4, 1.7, 2.2]) {
      const r = runTrials('power', K, 400, 1000 + Math.round(K * 100))
      expect(Math.abs(r.fraction - r.expected), `K=${K}: ${r.fraction} vs ${r.expected.toFixed(3)} ± ${r.sd.toFixed(3)}`).toBeLessThanOrEqual(3 * r.sd + 0.005)
      // the papers' λ = N K²/(2σ²) for evenly spread phases
      expect(Math.abs(r.meanLambda / (N * K * K / (2 * SIGMA * SIGMA)) - 1)).toBeLessThan(0.1)
    }
  })

  it('the search\'s highest-peak criterion follows the same curve (it may only gain a little near the threshold)', () => {
    for (const K of [0.9, 1.2, 1.5, 2.0]) {
      const r = runTrials('peak', K, 120, 2000 + Math.round(K * 100))
      expect(r.fraction, `K=${K}`).toBeGreaterThanOrEqual(r.expected - 3 * r.sd - 0.01)
      expect(r.fraction, `K=${K}`).toBeLessThanOrEqual(r.expected + 3 * r.sd + 0.08)
    }
  })

  it('noise alone is almost never recovered (the false-alarm threshold is 1e-3)', () => {
    const r = runTrials('peak', 0, 150, 77)
    expect(r.fraction).toBeLessThanOrEqual(0.01)
  })
})

describe('the shortcut of the highest-peak criterion', () => {
  it('gives the same outcome as the full periodogram on every trial', () => {
    const data: LimitsData = { t, residuals: new Float64Array(N), dy }
    const rec = prepareRecovery(data, { criterion: 'peak' })
    const r = createRandom(31)
    const y = new Float64Array(N)
    let recovered = 0
    for (let k = 0; k < 160; k++) {
      const K = 0.4 + 2.4 * r.next()
      const period = Math.exp(Math.log(0.6) + (Math.log(1500) - Math.log(0.6)) * r.next())
      const orbit = { period, K, e: 0, omega: 0, tp: t[0] + period * r.next() }
      injectInto(t, noise(r), orbit, y)
      const a = recoverInjected(rec, t, y, dy, 1 / period), b = recoverInjectedFull(rec, t, y, dy, 1 / period)
      expect(a.recovered, `trial ${k}: P ${period}, K ${K}`).toBe(b.recovered)
      if (a.recovered) recovered++
    }
    expect(recovered).toBeGreaterThan(20) // both outcomes occur
    expect(recovered).toBeLessThan(140)
  })
})

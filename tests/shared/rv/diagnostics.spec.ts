import { describe, it, expect } from 'vitest'
import {
  autocorrelation, integratedTime, integratedTime1d, windowedTau, splitRhat, classicRhat, normalQuantile, acceptanceFraction,
} from '../../../shared/rv/diagnostics.ts'
import { createRandom } from '../../../shared/math/random.ts'
import { expectClose } from '../../helpers/expect-close.ts'

/** AR(1) x_t = φ x_{t−1} + √(1−φ²) ε_t, started in its stationary law. */
function ar1(rng: ReturnType<typeof createRandom>, n: number, phi: number, mean = 0, scale = 1): Float64Array {
  const x = new Float64Array(n)
  x[0] = rng.normal()
  const s = Math.sqrt(1 - phi * phi)
  for (let i = 1; i < n; i++) x[i] = phi * x[i - 1] + s * rng.normal()
  for (let i = 0; i < n; i++) x[i] = mean + scale * x[i]
  return x
}

/** Ensemble chain (steps × walkers × 1) of independent AR(1) walkers; mean/scale per walker. */
function ensemble(seed: number, nSteps: number, nWalkers: number, phi: number, meanOf = (_w: number) => 0, scaleOf = (_w: number) => 1): Float64Array {
  const rng = createRandom(seed)
  const c = new Float64Array(nSteps * nWalkers)
  for (let w = 0; w < nWalkers; w++) {
    const x = ar1(rng, nSteps, phi, meanOf(w), scaleOf(w))
    for (let s = 0; s < nSteps; s++) c[s * nWalkers + w] = x[s]
  }
  return c
}

/** Slow reference: ρ(τ) = Σ_t (x_t − x̄)(x_{t+τ} − x̄) / Σ_t (x_t − x̄)², O(N²). */
function acfDirect(x: Float64Array): Float64Array {
  const n = x.length
  let m = 0
  for (const v of x) m += v / n
  const out = new Float64Array(n)
  for (let l = 0; l < n; l++) { let s = 0; for (let t = 0; t + l < n; t++) s += (x[t] - m) * (x[t + l] - m); out[l] = s }
  const c0 = out[0]
  return out.map((v) => v / c0)
}

describe('autocorrelation and integrated autocorrelation time', () => {
  it('FFT autocorrelation equals the direct O(N²) sum', () => {
    const x = ar1(createRandom(1), 777, 0.7)
    expectClose(autocorrelation(x), acfDirect(x), { atol: 1e-12 }, 'ρ')
  })

  it('ensemble τ (two walkers per complex FFT) equals the Sokal window on the walker-averaged direct ACF', () => {
    const nS = 300, nW = 5
    const c = ensemble(2, nS, nW, 0.8)
    const avg = new Float64Array(nS)
    for (let w = 0; w < nW; w++) {
      const x = Float64Array.from({ length: nS }, (_, s) => c[s * nW + w])
      acfDirect(x).forEach((v, i) => { avg[i] += v / nW })
    }
    expectClose(integratedTime(c, { nSteps: nS, nWalkers: nW, nDim: 1 })[0], windowedTau(avg, 5), { rtol: 1e-10 }, 'τ')
  })

  it('recovers the analytic τ = (1 + φ)/(1 − φ) of AR(1) chains', () => {
    // AR(1): ρ(t) = φ^t, so τ = 1 + 2 Σ φ^t = (1 + φ)/(1 − φ) (Sokal 1997, §3; common practice).
    // Estimator error: var τ̂ ≈ 2(2M + 1)/N τ² with window M ≈ 5τ (Sokal 1997, eq. 3.19); bounds
    // below are over 4 such standard errors.
    for (const phi of [0.5, 0.9]) {
      const truth = (1 + phi) / (1 - phi)
      const tau = integratedTime(ensemble(3, 20000, 16, phi), { nSteps: 20000, nWalkers: 16, nDim: 1 })[0]
      expectClose(tau, truth, { rtol: 0.08 }, `τ(φ=${phi})`)
    }
    expectClose(integratedTime1d(ar1(createRandom(4), 200000, 0.5)), 3, { rtol: 0.06 }, 'τ 1-D (φ=0.5)')
  })

  it('gives τ ≈ 1 for white noise and stops at the window for a constant series', () => {
    expectClose(integratedTime1d(ar1(createRandom(5), 50000, 0)), 1, { rtol: 0.05 }, 'τ white')
    expect(integratedTime1d(new Float64Array(100).fill(3))).toBe(1)
  })
})

describe('split-R̂ (Vehtari et al. 2021)', () => {
  it('matches a hand computation of eqs. 3–4 for two short chains', () => {
    // chains [1,2,3] and [4,5,6]: W = 1, B = 3·((2−3.5)² + (5−3.5)²) = 13.5, var⁺ = 2/3 + 4.5
    expectClose(classicRhat([1, 2, 3, 4, 5, 6], 2, 3), Math.sqrt(2 / 3 + 4.5), { rtol: 1e-14 }, 'R̂')
  })

  it('is ≈ 1 for converged chains', () => {
    const c = ensemble(6, 2000, 32, 0.5)
    const r = splitRhat(c, { nSteps: 2000, nWalkers: 32, nDim: 1 })[0]
    expect(r).toBeLessThan(1.01) // the threshold recommended by Vehtari et al. 2021
    expect(r).toBeGreaterThan(0.99)
  })

  it('is ≫ 1 when walker groups sit in different modes', () => {
    // walkers w mod 4 = 0, 1 around 0; = 2, 3 around 4 (two well separated modes)
    const c = ensemble(7, 1000, 32, 0.5, (w) => (w % 4 < 2 ? 0 : 4))
    const r = splitRhat(c, { nSteps: 1000, nWalkers: 32, nDim: 1 })[0]
    expect(r).toBeGreaterThan(1.5)
  })

  it('flags a drifting chain through the split halves', () => {
    const nS = 2000, nW = 8
    const c = ensemble(8, nS, nW, 0.5).map((v, i) => v + (3 * Math.floor(i / nW)) / nS)
    expect(splitRhat(c, { nSteps: nS, nWalkers: nW, nDim: 1 }, { groups: 2 })[0]).toBeGreaterThan(1.05)
  })

  it('catches groups that differ only in scale with the folded statistic, which the classic R̂ misses', () => {
    // Vehtari et al. 2021 §4.2: the classic R̂ compares means only; the folded, rank-normalised
    // version sees a difference in spread.
    const c = ensemble(9, 2000, 32, 0.3, () => 0, (w) => (w % 4 < 2 ? 1 : 3))
    const shape = { nSteps: 2000, nWalkers: 32, nDim: 1 }
    expect(splitRhat(c, shape, { rankNormalised: false })[0]).toBeLessThan(1.01)
    expect(splitRhat(c, shape)[0]).toBeGreaterThan(1.05)
  })

  it('throws on misuse, naming the parameter', () => {
    expect(() => splitRhat(new Float64Array(9), { nSteps: 5, nWalkers: 2, nDim: 1 })).toThrow(/chain has 9/)
    expect(() => splitRhat(new Float64Array(40), { nSteps: 10, nWalkers: 4, nDim: 1 }, { groups: 3 })).toThrow(/groups/)
    expect(() => classicRhat([1, 2], 1, 2)).toThrow(/\bm\b/)
  })
})

describe('helpers', () => {
  it('normalQuantile matches scipy.stats.norm.ppf (scipy 1.10.1) to 1e-8', () => {
    const ref: Array<[number, number]> = [
      [0.975, 1.959963984540054], [0.001, -3.090232306167813], [0.3, -0.5244005127080409], [1e-6, -4.753424308822899], [0.5, 0],
    ]
    for (const [p, z] of ref) expectClose(normalQuantile(p), z, { rtol: 1e-8, atol: 1e-9 }, `Φ⁻¹(${p})`)
    expect(() => normalQuantile(1)).toThrow(/p must/)
  })

  it('acceptanceFraction is the mean over walkers', () => {
    expect(acceptanceFraction([0.2, 0.4])).toBeCloseTo(0.3, 15)
    expect(() => acceptanceFraction([])).toThrow(/perWalker/)
  })
})

import { describe, it, expect } from 'vitest'
import { runEnsemble, stateToJson, stateFromJson } from '../../../shared/rv/sampler.ts'
import { integratedTime } from '../../../shared/rv/diagnostics.ts'
import { createRandom } from '../../../shared/math/random.ts'

/** ln N(x; 0, Σ) up to a constant, with Σ⁻¹ given row-major. */
function gaussian(prec: number[], d: number): (x: Float64Array) => number {
  return (x) => {
    let q = 0
    for (let i = 0; i < d; i++) for (let j = 0; j < d; j++) q += x[i] * prec[i * d + j] * x[j]
    return -0.5 * q
  }
}

function ball(seed: number, nW: number, d: number, scale: number): Float64Array {
  const r = createRandom(seed)
  return Float64Array.from({ length: nW * d }, () => scale * r.normal())
}

describe('ensemble sampler (Goodman & Weare 2010 stretch move)', () => {
  // Target: 3-D Gaussian with very different scales and strong correlation — the case the
  // affine-invariant move is designed for (Goodman & Weare 2010 §2). Known covariance Σ:
  const sd = [1, 10, 0.01]
  const rho = [[1, 0.95, -0.5], [0.95, 1, -0.3], [-0.5, -0.3, 1]]
  const d = 3
  const cov = rho.flatMap((row, i) => row.map((r, j) => r * sd[i] * sd[j]))
  // Σ⁻¹ computed once by Gauss–Jordan (test helper)
  const inv = ((): number[] => {
    const a = cov.slice(), b = [1, 0, 0, 0, 1, 0, 0, 0, 1]
    for (let c = 0; c < d; c++) {
      const p = a[c * d + c]
      for (let j = 0; j < d; j++) { a[c * d + j] /= p; b[c * d + j] /= p }
      for (let r = 0; r < d; r++) {
        if (r === c) continue
        const f = a[r * d + c]
        for (let j = 0; j < d; j++) { a[r * d + j] -= f * a[c * d + j]; b[r * d + j] -= f * b[c * d + j] }
      }
    }
    return b
  })()
  const nW = 32, steps = 6000, burn = 1000
  const res = runEnsemble({ logProb: gaussian(inv, d), nDim: d, nWalkers: nW, start: ball(3, nW, d, 0.01), steps, random: 11 })
  const post = res.chain.subarray(burn * nW * d)
  const nPost = steps - burn
  const tau = integratedTime(post, { nSteps: nPost, nWalkers: nW, nDim: d })
  const nEff = Array.from(tau, (t) => (nPost * nW) / t)

  it('recovers the means and the covariance of a correlated Gaussian within Monte-Carlo error', () => {
    const N = nPost * nW
    const mean = new Float64Array(d)
    for (let i = 0; i < N; i++) for (let k = 0; k < d; k++) mean[k] += post[i * d + k] / N
    const c = new Float64Array(d * d)
    for (let i = 0; i < N; i++) for (let a = 0; a < d; a++) for (let b = 0; b < d; b++) c[a * d + b] += (post[i * d + a] - mean[a]) * (post[i * d + b] - mean[b]) / (N - 1)
    // Monte-Carlo standard errors with N_eff = N/τ (Sokal 1997; Foreman-Mackey et al. 2013):
    // mean σ/√N_eff; variance σ²√(2/N_eff); correlation (1 − ρ²)/√N_eff (large-sample
    // normal theory, common practice). Bounds at 4 standard errors.
    for (let k = 0; k < d; k++) {
      expect(Math.abs(mean[k]), `mean[${k}]`).toBeLessThan(4 * sd[k] / Math.sqrt(nEff[k]))
      const v = cov[k * d + k]
      expect(Math.abs(c[k * d + k] - v), `var[${k}]`).toBeLessThan(4 * v * Math.sqrt(2 / nEff[k]))
    }
    for (let a = 0; a < d; a++) for (let b = a + 1; b < d; b++) {
      const r = c[a * d + b] / Math.sqrt(c[a * d + a] * c[b * d + b])
      const ne = Math.min(nEff[a], nEff[b])
      expect(Math.abs(r - rho[a][b]), `corr[${a}][${b}]`).toBeLessThan(4 * (1 - rho[a][b] ** 2) / Math.sqrt(ne) + 1e-3)
    }
  })

  it('accepts a sensible fraction of moves and mixes (τ well below the run length)', () => {
    const acc = res.acceptance.reduce((s, v) => s + v, 0) / nW
    // For a 3-D Gaussian the stretch move with a = 2 accepts roughly half of the moves (from
    // memory of emcee runs on such targets; any value in 0.3–0.8 means a healthy sampler).
    expect(acc).toBeGreaterThan(0.3)
    expect(acc).toBeLessThan(0.8)
    for (const t of tau) expect(nPost / t).toBeGreaterThan(50) // chain-length rule, Foreman-Mackey et al. 2013
  })

  it('gives the identical chain for the same seed and a different one for another seed', () => {
    const run = (seed: number) => runEnsemble({ logProb: gaussian(inv, d), nDim: d, nWalkers: 8, start: ball(5, 8, d, 0.1), steps: 200, random: seed })
    const a = run(7), b = run(7), c = run(8)
    expect(Array.from(a.chain)).toEqual(Array.from(b.chain))
    expect(Array.from(a.lnProb)).toEqual(Array.from(b.lnProb))
    expect(Array.from(a.chain)).not.toEqual(Array.from(c.chain))
  })

  it('resumes from a saved state (through JSON) exactly as an uninterrupted run', () => {
    const lp = gaussian(inv, d)
    const start = ball(6, 8, d, 0.1)
    const whole = runEnsemble({ logProb: lp, nDim: d, nWalkers: 8, start, steps: 100, random: 99, thin: 2 })
    const first = runEnsemble({ logProb: lp, nDim: d, nWalkers: 8, start, steps: 60, random: 99, thin: 2 })
    const saved = stateFromJson(JSON.parse(JSON.stringify(stateToJson(first.state))))
    const rest = runEnsemble({ logProb: lp, nDim: d, nWalkers: 8, start: saved, steps: 40, random: 12345, thin: 2 })
    expect([...first.chain, ...rest.chain]).toEqual(Array.from(whole.chain))
    expect(Array.from(rest.acceptance)).toEqual(Array.from(whole.acceptance))
    expect(rest.state.step).toBe(100)
  })

  it('reports progress every k steps and stops when the callback says so', () => {
    const calls: number[] = []
    const r = runEnsemble({
      logProb: gaussian(inv, d), nDim: d, nWalkers: 8, start: ball(7, 8, d, 0.1), steps: 100, random: 1, progressEvery: 10,
      onProgress: (done, total, state) => { calls.push(done); expect(total).toBe(100); expect(state.positions.length).toBe(8 * d); return done >= 30 ? 'stop' : undefined },
    })
    expect(calls).toEqual([10, 20, 30])
    expect(r.stopped).toBe(true)
    expect(r.nSteps).toBe(30)
    expect(r.nKept).toBe(30)
    expect(r.state.step).toBe(30)
  })

  it('never moves a walker to a point of zero probability', () => {
    // half-space x₀ > 0 of a Gaussian
    const r = runEnsemble({
      logProb: (x) => (x[0] > 0 ? -0.5 * (x[0] * x[0] + x[1] * x[1]) : -Infinity), nDim: 2, nWalkers: 8,
      start: Float64Array.from({ length: 16 }, (_, i) => (i % 2 === 0 ? 0.5 + 0.01 * i : 0.01 * i)), steps: 300, random: 4,
    })
    for (let i = 0; i < r.chain.length; i += 2) expect(r.chain[i]).toBeGreaterThan(0)
  })

  it('throws on misuse, naming the option', () => {
    const lp = gaussian(inv, d)
    expect(() => runEnsemble({ logProb: lp, nDim: d, nWalkers: 5, start: new Float64Array(15), steps: 1, random: 1 })).toThrow(/nWalkers/)
    expect(() => runEnsemble({ logProb: lp, nDim: d, nWalkers: 8, start: new Float64Array(10), steps: 1, random: 1 })).toThrow(/start/)
    expect(() => runEnsemble({ logProb: () => -Infinity, nDim: d, nWalkers: 8, start: new Float64Array(24), steps: 1, random: 1 })).toThrow(/start: walker 0/)
    expect(() => runEnsemble({ logProb: lp, nDim: d, nWalkers: 8, start: new Float64Array(24), steps: 1, random: 1, a: 1 })).toThrow(/\ba\b/)
    expect(() => runEnsemble({ logProb: lp, nDim: d, nWalkers: 8, start: new Float64Array(24), steps: -1, random: 1 })).toThrow(/steps/)
  })

  it('draws from a generator whose state can be saved and restored', () => {
    const a = createRandom(2024), b = createRandom(2024)
    for (let i = 0; i < 100; i++) expect(a.next()).toBe(b.next())
    a.normal()
    const s = a.getState()
    const x = [a.normal(), a.next(), a.normal()]
    a.setState(s)
    expect([a.normal(), a.next(), a.normal()]).toEqual(x)
  })
})

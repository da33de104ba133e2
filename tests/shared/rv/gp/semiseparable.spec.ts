import { describe, it, expect } from 'vitest'
import { expectClose } from '../../../helpers/expect-close.ts'
import { createRandom } from '../../../../shared/math/random.ts'
import {
  rotation, rotationTerms, termsValue, denseFactor, denseLogLikelihood, denseSolve, densePredict,
  semiseparableFactor, semiseparableLogLikelihood, semiseparableGram, semiseparableSolve, semiseparablePredict, semiseparableFactorLogLikelihood,
  gpLogLikelihood, gpFactor, gpActivityAtData, gpSolve, type RotationShape, type GpNoiseModel,
} from '../../../../shared/rv/index.ts'
import { rotationPairLogLikelihood, semiseparableLogLikelihoodGeneral } from '../../../../shared/rv/gp/semiseparable.ts'

// The fast (semiseparable, Foreman-Mackey et al. 2017 §5) solver against the dense Cholesky of the same
// kernel's covariance built element by element — over a grid of seeded cases.
function makeCase(seed: number, n: number, shape: RotationShape, gaps = false) {
  const rng = createRandom(seed)
  const t = new Float64Array(n)
  let x = 2458000
  for (let i = 0; i < n; i++) { x += gaps && i % 37 === 0 ? 200 * rng.next() : 3 * rng.next(); t[i] = x }
  if (n > 3) t[3] = t[2] // a repeated epoch (two instruments the same night)
  const scale = new Float64Array(n), noise = new Float64Array(n), y = new Float64Array(n)
  for (let i = 0; i < n; i++) {
    scale[i] = i % 3 === 0 ? 2.5 : 5
    noise[i] = 0.5 + 4 * rng.next()
    y[i] = 10 * (rng.next() - 0.5)
  }
  return { t, scale, noise, y, shape }
}

const CASES: Array<[string, RotationShape, boolean]> = [
  ['typical', { kind: 'rotation', period: 23.5, decayTime: 40, shape: 0.5 }, false],
  ['short decay', { kind: 'rotation', period: 12, decayTime: 2, shape: 0 }, false],
  ['long decay, pure harmonic weight', { kind: 'rotation', period: 30, decayTime: 900, shape: 1 }, true],
  ['fast rotator with seasonal gaps', { kind: 'rotation', period: 1.7, decayTime: 15, shape: 0.3 }, true],
]

describe('rotation kernel', () => {
  it('its damped-oscillator terms equal the formula written directly, and κ(0) = 1', () => {
    for (const [, k] of CASES) {
      expectClose(termsValue(0, rotationTerms(k)), 1, { rtol: 1e-15 }, 'κ(0)')
      for (const tau of [0.3, 1, 7.7, 23.5, 100, -5]) expectClose(termsValue(tau, rotationTerms(k)), rotation(tau, k), { rtol: 1e-12, atol: 1e-15 }, `κ(${tau})`)
    }
  })
})

describe.each(CASES)('semiseparable solver against its dense covariance (%s)', (_name, shape, gaps) => {
  const c = makeCase(7 + Math.round(shape.period), 150, shape, gaps)
  const terms = rotationTerms(shape)
  const kappa = (tau: number) => rotation(tau, shape)
  const dense = denseFactor(c.t, c.scale, c.noise, kappa)
  const fast = semiseparableFactor(c.t, c.scale, c.noise, terms)

  it('log-determinant to 1e-10', () => expectClose(fast.logDet, dense.logDet, { rtol: 1e-10 }, 'ln det'))

  it('log-likelihood (fused pass and from the factor) to 1e-10', () => {
    const want = denseLogLikelihood(dense, c.y)
    expectClose(semiseparableLogLikelihood(c.t, c.scale, c.noise, terms, c.y), want, { rtol: 1e-10 }, 'fused')
    expectClose(semiseparableFactorLogLikelihood(fast, c.y), want, { rtol: 1e-10 }, 'factor')
  })

  it('solve C⁻¹y to 1e-10 (relative to its largest element)', () => {
    const want = denseSolve(dense, c.y)
    const big = Math.max(...Array.from(want, Math.abs))
    expectClose(semiseparableSolve(fast, c.y), want, { rtol: 1e-9, atol: 1e-10 * big }, 'C⁻¹y')
  })

  it('one-pass Gram matrix vᵀC⁻¹w and ln det equal the dense ones', () => {
    const ones = new Float64Array(c.t.length).fill(1)
    const ramp = Float64Array.from(c.t, (v) => v - c.t[0])
    const rhs = [c.y, ones, ramp]
    const g = semiseparableGram(c.t, c.scale, c.noise, terms, rhs)
    expectClose(g.logDet, dense.logDet, { rtol: 1e-10 }, 'ln det')
    for (let p = 0; p < 3; p++) {
      const x = denseSolve(dense, rhs[p])
      for (let q = 0; q < 3; q++) {
        let want = 0
        for (let i = 0; i < x.length; i++) want += rhs[q][i] * x[i]
        expectClose(g.gram[p * 3 + q], want, { rtol: 1e-9, atol: 1e-12 }, `G[${p}][${q}]`)
      }
    }
  })

  it('predictive mean and variance (test times inside, between, on and outside the data)', () => {
    const alpha = denseSolve(dense, c.y)
    const tStar = Float64Array.from([c.t[0] - 10, c.t[5], (c.t[40] + c.t[41]) / 2, c.t[c.t.length - 1] + 3, c.t[3], c.t[0]])
    const want = densePredict(dense, alpha, tStar, 4, true)
    const got = semiseparablePredict(fast, alpha, tStar, 4, true)
    expectClose(got.mean, want.mean, { rtol: 1e-9, atol: 1e-10 * 16 }, 'mean')
    expectClose(got.variance!, want.variance!, { rtol: 1e-8, atol: 1e-10 * 16 }, 'variance')
  })
})

describe('log-likelihood: the written-out rotation pair (J = 4) against the general loop', () => {
  it('agree to 1e-12 on every case and on 20 000 rows at full Julian dates with seasonal gaps', () => {
    const cases = [...CASES.map(([, shape, gaps]) => makeCase(11 + Math.round(shape.period), 300, shape, gaps)),
      makeCase(5, 20000, { kind: 'rotation', period: 23.5, decayTime: 60, shape: 0.5 }, true)]
    for (const c of cases) {
      const terms = rotationTerms(c.shape)
      const want = semiseparableLogLikelihoodGeneral(c.t, c.scale, c.noise, terms, c.y)
      expectClose(rotationPairLogLikelihood(c.t, c.scale, c.noise, terms[0], terms[1], c.y), want, { rtol: 1e-12 }, `pair, n = ${c.t.length}`)
      expect(semiseparableLogLikelihood(c.t, c.scale, c.noise, terms, c.y)).toBe(rotationPairLogLikelihood(c.t, c.scale, c.noise, terms[0], terms[1], c.y))
    }
  })

  it('terms that are not a harmonic pair with one decay take the general loop, still equal to the dense covariance', () => {
    const c = makeCase(23, 150, { kind: 'rotation', period: 23.5, decayTime: 40, shape: 0.5 })
    const pair = rotationTerms(c.shape)
    const sets = [
      [pair[0], { ...pair[1], c: pair[1].c * 1.5 }], // own decay
      [pair[0], { ...pair[1], d: pair[1].d * 1.01 }], // not at twice the frequency
      [...pair, { a: 0.3, b: 0.05, c: 0.2, d: 0.9 }], // three terms
    ]
    for (const terms of sets) {
      const dense = denseFactor(c.t, c.scale, c.noise, (tau) => termsValue(tau, terms))
      const got = semiseparableLogLikelihood(c.t, c.scale, c.noise, terms, c.y)
      expect(got).toBe(semiseparableLogLikelihoodGeneral(c.t, c.scale, c.noise, terms, c.y))
      expectClose(got, denseLogLikelihood(dense, c.y), { rtol: 1e-10 }, `${terms.length} terms`)
    }
  })

  it('refuses a covariance that is not positive definite, as the general loop does', () => {
    const c = makeCase(3, 50, CASES[0][1])
    const bad = Float64Array.from(c.noise); bad[20] = -1e6
    expect(() => semiseparableLogLikelihood(c.t, c.scale, bad, rotationTerms(c.shape), c.y)).toThrow(/not positive definite/)
    expect(() => semiseparableLogLikelihoodGeneral(c.t, c.scale, bad, rotationTerms(c.shape), c.y)).toThrow(/not positive definite/)
  })
})

describe('noise model over the fast path', () => {
  const c = makeCase(99, 400, { kind: 'rotation', period: 23.5, decayTime: 40, shape: 0.5 })
  const model: GpNoiseModel = { kernel: c.shape, amplitude: [5, 2.5], jitter: [0, 1] }
  const instrument = Int32Array.from({ length: 400 }, (_, i) => (i % 3 === 0 ? 1 : 0))
  const dy = Float64Array.from(c.noise, Math.sqrt)
  const series = { t: c.t, dy, instrument, instrumentNames: ['A', 'B'] }

  it('semiseparable and dense give the same log-likelihood on the same model', () => {
    expectClose(gpLogLikelihood(series, c.y, model, 'semiseparable'), gpLogLikelihood(series, c.y, model, 'dense'), { rtol: 1e-10 }, 'ln L')
  })

  it('row order does not matter (rows are sorted inside)', () => {
    const perm = Array.from({ length: 400 }, (_, i) => (i * 7919) % 400)
    const shuffled = {
      t: Float64Array.from(perm, (i) => c.t[i]), dy: Float64Array.from(perm, (i) => dy[i]),
      instrument: Int32Array.from(perm, (i) => instrument[i]), instrumentNames: ['A', 'B'],
    }
    const y2 = Float64Array.from(perm, (i) => c.y[i])
    expectClose(gpLogLikelihood(shuffled, y2, model), gpLogLikelihood(series, c.y, model), { rtol: 1e-12 }, 'ln L')
    const a1 = gpSolve(gpFactor(series, model), c.y), a2 = gpSolve(gpFactor(shuffled, model), y2)
    expectClose(a2, Float64Array.from(perm, (i) => a1[i]), { rtol: 1e-10, atol: 1e-14 }, 'C⁻¹y')
  })

  it('activity at the data equals the dense conditional mean K_gp C⁻¹ r', () => {
    const fast = gpActivityAtData(gpFactor(series, model), c.y)
    const dense = gpActivityAtData(gpFactor(series, model, 'dense'), c.y)
    expectClose(fast, dense, { rtol: 1e-8, atol: 1e-9 }, 'activity')
  })

  it('refuses what it cannot do, naming the parameter', () => {
    expect(() => semiseparableFactor(Float64Array.from([2, 1]), new Float64Array(2), Float64Array.from([1, 1]), rotationTerms(c.shape))).toThrow(/sorted/)
    expect(() => gpLogLikelihood(series, c.y, { ...model, amplitude: [1, 2, 3] })).toThrow(/amplitude must have 1 or 2 values/)
    expect(() => gpLogLikelihood(series, c.y, { ...model, jitter: [-1] })).toThrow(/jitter\[0\]/)
    expect(() => gpLogLikelihood(series, c.y, { ...model, kernel: { ...c.shape, shape: 2 } })).toThrow(/kernel.shape/)
    expect(() => gpLogLikelihood(series, c.y, { ...model, kernel: { kind: 'quasi-periodic', period: 20, decayTime: 0, roughness: 1 } })).toThrow(/kernel.decayTime/)
    expect(() => gpLogLikelihood(series, c.y, { ...model, kernel: { kind: 'quasi-periodic', period: 20, decayTime: 30, roughness: 1 } }, 'semiseparable')).toThrow(/rotation kernel/)
    expect(() => gpLogLikelihood(series, c.y.subarray(1), model)).toThrow(/residual has 399 rows/)
  })
})

import { describe, it, expect } from 'vitest'
import { readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { expectClose } from '../../../helpers/expect-close.ts'
import {
  gpFactor, gpLogLikelihood, gpLogDeterminant, gpSolve, gpPredict, type GpNoiseModel, type GpSeries,
} from '../../../../shared/rv/index.ts'

// Reference: fixtures/gp/reference.json, written by scripts/reference/gp_reference.py with scikit-learn's
// GaussianProcessRegressor (ConstantKernel × ExpSineSquared × RBF + WhiteKernel), scipy's cho_factor and
// numpy's slogdet/solve on the same data.
const ref = JSON.parse(readFileSync(fileURLToPath(new URL('../../../../fixtures/gp/reference.json', import.meta.url)), 'utf8'))

function series(c: { t: number[]; dy: number[]; instrument?: number[] }): GpSeries {
  const n = c.t.length
  return {
    t: Float64Array.from(c.t), dy: Float64Array.from(c.dy),
    instrument: c.instrument ? Int32Array.from(c.instrument) : new Int32Array(n),
    instrumentNames: c.instrument ? ['A', 'B'] : ['A'],
  }
}

describe('quasi-periodic GP against scikit-learn GaussianProcessRegressor (fixtures/gp/reference.json)', () => {
  const c = ref.qpSklearn
  const s = series(c)
  const y = Float64Array.from(c.y as number[])
  const model: GpNoiseModel = {
    kernel: { kind: 'quasi-periodic', period: c.kernel.period, decayTime: c.kernel.decayTime, roughness: c.kernel.roughness },
    amplitude: [c.kernel.amplitude], jitter: [c.kernel.jitter],
  }

  it('log-likelihood equals sklearn log_marginal_likelihood to 1e-8 relative', () => {
    expectClose(gpLogLikelihood(s, y, model), c.sklearn.lnL, { rtol: 1e-8 }, 'ln L')
  })

  it('predictive mean and latent variance equal sklearn predict (mean, std² − jitter²)', () => {
    const p = gpPredict(gpFactor(s, model), y, Float64Array.from(c.tStar as number[]), { variance: true })
    const scaleMean = Math.max(...(c.sklearn.mean as number[]).map(Math.abs))
    expectClose(p.mean, c.sklearn.mean, { rtol: 1e-8, atol: 1e-10 * scaleMean }, 'mean')
    expectClose(p.variance!, c.sklearn.latentVariance, { rtol: 1e-8, atol: 1e-9 * c.kernel.amplitude ** 2 }, 'variance')
  })

  it('agrees with the dense numpy/scipy Cholesky on the same data', () => {
    const f = gpFactor(s, model)
    expectClose(gpLogDeterminant(f), c.numpy.logDet, { rtol: 1e-10 }, 'ln det')
    expectClose(gpSolve(f, y), c.numpy.alpha, { rtol: 1e-8, atol: 1e-12 }, 'C⁻¹y')
  })
})

describe('quasi-periodic GP, two instruments with their own amplitude and jitter, against scipy cho_factor', () => {
  const c = ref.qpTwoInstruments
  const s = series(c)
  const y = Float64Array.from(c.y as number[])
  const model: GpNoiseModel = { kernel: { kind: 'quasi-periodic', ...c.kernel }, amplitude: c.amplitude, jitter: c.jitter }
  const f = gpFactor(s, model)
  const tStar = Float64Array.from(c.tStar as number[])

  it('log-likelihood, log-determinant and solve to 1e-8 relative', () => {
    expectClose(gpLogLikelihood(s, y, model), c.instrument0.lnL, { rtol: 1e-8 }, 'ln L')
    expectClose(gpLogDeterminant(f), c.instrument0.logDet, { rtol: 1e-8 }, 'ln det')
    expectClose(gpSolve(f, y), c.instrument0.alpha, { rtol: 1e-8, atol: 1e-12 }, 'C⁻¹y')
  })

  it('predicts the activity curve as each instrument sees it', () => {
    for (const k of [0, 1]) {
      const want = k === 0 ? c.instrument0 : c.instrument1
      const p = gpPredict(f, y, tStar, { instrument: k, variance: true })
      expectClose(p.mean, want.mean, { rtol: 1e-8, atol: 1e-10 }, `mean ${k}`)
      expectClose(p.variance!, want.variance, { rtol: 1e-7, atol: 1e-9 }, `variance ${k}`)
    }
  })
})

describe('rotation kernel, fast solver, against numpy on its dense matrix (unsorted full-JD times)', () => {
  const c = ref.rotation
  const s = series(c)
  const y = Float64Array.from(c.y as number[])
  const model: GpNoiseModel = { kernel: { kind: 'rotation', ...c.kernel }, amplitude: c.amplitude, jitter: c.jitter }

  it('log-determinant equals numpy slogdet and C⁻¹y equals numpy.linalg.solve', () => {
    const f = gpFactor(s, model)
    expect(f.method).toBe('semiseparable')
    expect(c.numpy.sign).toBe(1)
    expectClose(gpLogDeterminant(f), c.numpy.logDet, { rtol: 1e-10 }, 'ln det')
    const maxAlpha = Math.max(...(c.numpy.alpha as number[]).map(Math.abs))
    expectClose(gpSolve(f, y), c.numpy.alpha, { rtol: 1e-8, atol: 1e-10 * maxAlpha }, 'C⁻¹y')
  })

  it('log-likelihood (one pass) equals numpy', () => {
    expectClose(gpLogLikelihood(s, y, model), c.numpy.lnL, { rtol: 1e-10 }, 'ln L')
  })

  it('predictive mean and variance equal the dense scipy prediction', () => {
    const p = gpPredict(gpFactor(s, model), y, Float64Array.from(c.tStar as number[]), { instrument: 1, variance: true })
    expectClose(p.mean, c.instrument1.mean, { rtol: 1e-8, atol: 1e-9 }, 'mean')
    expectClose(p.variance!, c.instrument1.variance, { rtol: 1e-7, atol: 1e-8 }, 'variance')
  })
})

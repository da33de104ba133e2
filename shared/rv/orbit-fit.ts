/**
 * Maximum-likelihood (or maximum a posteriori, with priors) fit of N Keplerians plus a per-
 * instrument offset and jitter and an optional linear or quadratic trend.
 *
 * Likelihood (Ford 2006, ApJ 642, 505): jitter s_k of instrument k is added in quadrature,
 *   ln L = −½ Σ_i [ r_i² / (σ_i² + s_k²) + ln 2π(σ_i² + s_k²) ].
 * Eccentricity and ω are parameterised as √e cos ω, √e sin ω (Ford 2006; Eastman, Gaudi & Agol
 * 2013, PASP 125, 83), which keeps the fit regular near e = 0; the orbital phase as the time of
 * conjunction Tc, well defined for any e.
 *
 * Optimiser (why not a general −ln L minimiser): at fixed jitters −2 ln L is a weighted χ², which
 * Levenberg–Marquardt minimises well on the whitened residual vector; and at fixed orbit the jitter
 * of each instrument has a one-dimensional maximum-likelihood equation that is solved exactly.
 * Alternating the two is a coordinate ascent on ln L (each half-step cannot lower it), so it
 * converges to a stationary point of the full likelihood; in practice the jitters settle in a few
 * rounds. Offsets and trend coefficients are linear and are solved exactly by weighted least
 * squares inside every residual evaluation (variable projection), so the non-linear search only
 * sees the Keplerian parameters. We use our own small LM (Marquardt's diagonal scaling, projected
 * bounds) rather than ml-levenberg-marquardt: that package weights the objective and the step
 * inconsistently (see the stack notes), has no covariance and reports no convergence status.
 *
 * The pieces, one module each:
 *   orbit-fit-types.ts        public options and result shapes
 *   orbit-fit-layout.ts       free vector ↔ planet elements, bounds, validation
 *   orbit-fit-linear.ts       offsets + trend by weighted least squares (shared with the start scan)
 *   orbit-fit-objective.ts    whitened residuals, ln L, priors; the per-fit Workspace buffers
 *   orbit-fit-lm.ts           Levenberg–Marquardt with the jitter half-step
 *   orbit-fit-jitter.ts       one-dimensional ML jitter per instrument
 *   orbit-fit-uncertainty.ts  inverse Fisher information and propagated element errors
 */
import { buildLayout, type FitLayout } from './orbit-fit-layout.ts'
import {
  createWorkspace, keplerModel, logLikelihood, logPrior, setWeights, solveLinearPart, type Workspace,
} from './orbit-fit-objective.ts'
import { levenbergMarquardt } from './orbit-fit-lm.ts'
import { instrumentRows, jitterHook } from './orbit-fit-jitter.ts'
import { emptyCovariance, jitterError, meanCovariance, meanSd, planetWithErrors } from './orbit-fit-uncertainty.ts'
import type { FitOptions, FitResult, FitStatus, InstrumentFit, TrendKind } from './orbit-fit-types.ts'
import type { RvData } from './orbit-data.ts'

export {
  E_MAX, type TrendKind, type PlanetParam, type PlanetStart, type Prior, type FitOptions, type PlanetFit,
  type InstrumentFit, type FitStats, type FitStatus, type FitResult,
} from './orbit-fit-types.ts'
export { jitterMle } from './orbit-fit-jitter.ts'

/**
 * Fits the model from the given starting planets (see the module comment for the method).
 * Returns `success: false` with a message, never throws, when the data cannot constrain the
 * model (fewer points than parameters, singular offsets); throws RangeError on misuse.
 */
export function fitKeplerians(data: RvData, opts: FitOptions): FitResult {
  const { layout: L, x0 } = buildLayout(data, opts)
  const ws = createWorkspace(L)
  const nInst = L.nInst
  const fitJitter = L.jitterFixed === null
  const jit = new Float64Array(nInst)
  if (L.jitterFixed) jit.set(L.jitterFixed)
  else if (opts.jitterStart) {
    if (opts.jitterStart.length !== nInst) throw new RangeError(`jitterStart must have one value per instrument (${nInst})`)
    jit.set(opts.jitterStart.map((s) => Math.max(0, s)))
  }
  const nParams = L.nFree + L.nLin + (fitJitter ? nInst : 0)
  const maxIter = opts.maxIterations ?? 200
  let x = x0
  let status: FitStatus = 'converged'
  let iterations = 0
  const history: number[] = []
  let lnPost = -Infinity
  if (L.n < nParams) {
    status = 'failed'
  } else {
    setWeights(L, ws, jit)
    const hook = fitJitter ? jitterHook(L, ws, jit, instrumentRows(L)) : undefined
    const lm = levenbergMarquardt(L, ws, x, maxIter, hook)
    x = lm.x
    iterations = lm.iterations
    history.push(...lm.history)
    status = Number.isFinite(lm.cost) ? lm.status : 'failed'
    setWeights(L, ws, jit)
    const kep = new Float64Array(L.n)
    keplerModel(L, ws, x, kep)
    solveLinearPart(L, ws, kep)
    lnPost = logLikelihood(L, ws, jit) + logPrior(L, x)
    if (!Number.isFinite(lnPost)) status = 'failed'
  }
  return assemble(L, ws, x, jit, fitJitter, nParams, { status, iterations, history, lnPost }, opts.skipUncertainties ?? false)
}

interface RunOutcome { status: FitStatus; iterations: number; history: number[]; lnPost: number }

/** The result at the final x: model, residuals, statistics, elements and errors. */
function assemble(
  L: FitLayout, ws: Workspace, x: Float64Array, jit: Float64Array, fitJitter: boolean, nParams: number,
  run: RunOutcome, skipUnc: boolean,
): FitResult {
  const { data, n, nInst, nFree } = L
  const { status, iterations, history, lnPost } = run
  setWeights(L, ws, jit)
  const kep = new Float64Array(n)
  keplerModel(L, ws, x, kep)
  const linOk = solveLinearPart(L, ws, kep)
  const beta = ws.linear.beta
  const model = new Float64Array(n)
  for (let i = 0; i < n; i++) model[i] = data.y[i] - ws.resid[i]
  const residuals = Float64Array.from(ws.resid)
  const lnL = logLikelihood(L, ws, jit)
  let chi2 = 0, chi2NoJ = 0, ss = 0
  for (let i = 0; i < n; i++) {
    chi2 += residuals[i] * residuals[i] * ws.w[i]
    chi2NoJ += (residuals[i] / data.dy[i]) ** 2
    ss += residuals[i] * residuals[i]
  }
  const cov = !skipUnc && linOk && status !== 'failed' ? meanCovariance(L, ws, x) : emptyCovariance(L)
  const planets = L.layouts.map((_, k) => planetWithErrors(L, x, k, cov, skipUnc))
  const instruments: InstrumentFit[] = data.instrumentNames.map((name, k) => {
    let cnt = 0, s2 = 0, sw2 = 0
    for (let i = 0; i < n; i++) {
      if (data.instrument[i] !== k) continue
      cnt++; s2 += residuals[i] * residuals[i]
      const V = 1 / ws.w[i]; sw2 += 1 / (V * V)
    }
    const s = jit[k]
    return {
      name, n: cnt, offset: beta[k], offsetErr: skipUnc ? NaN : meanSd(cov, nFree + k),
      jitter: s, jitterErr: fitJitter && !skipUnc ? jitterError(s, sw2) : 0, rms: cnt ? Math.sqrt(s2 / cnt) : NaN,
    }
  })
  const trend = L.trend === 'none' ? null : {
    kind: L.trend as TrendKind,
    slope: beta[nInst],
    curvature: L.trend === 'quadratic' ? beta[nInst + 1] : 0,
    epoch: L.epoch,
    slopeErr: skipUnc ? NaN : meanSd(cov, nFree + nInst),
    curvatureErr: L.trend === 'quadratic' ? (skipUnc ? NaN : meanSd(cov, nFree + nInst + 1)) : 0,
  }
  const success = status === 'converged'
  return {
    success, converged: success, status, message: statusMessage(status, cov.ok || skipUnc, n, nParams), planets, instruments, trend,
    stats: {
      nPoints: n, nParams, chi2, reducedChi2: n > nParams ? chi2 / (n - nParams) : NaN, chi2NoJitter: chi2NoJ,
      lnL, lnPosterior: Number.isFinite(lnPost) ? lnPost : lnL,
      bic: nParams * Math.log(n) - 2 * lnL, aic: 2 * nParams - 2 * lnL, rms: n ? Math.sqrt(ss / n) : NaN,
    },
    epoch: L.epoch, model, residuals, iterations, history,
  }
}

function statusMessage(status: FitStatus, covOk: boolean, n: number, nParams: number): string {
  switch (status) {
    case 'converged': return covOk ? 'converged' : 'converged, but the covariance is singular: some parameters are not constrained by the data'
    case 'max-iterations': return 'stopped at the iteration limit before the likelihood settled'
    case 'stalled': return 'the optimiser could not find a downhill step (ill-conditioned problem)'
    default: return n < nParams ? `too few points (${n}) for ${nParams} parameters` : 'the model could not be evaluated (singular offsets or non-finite values)'
  }
}

/**
 * Fit of a model without Keplerians (offsets, jitters, trend only): the baseline of a search.
 */
export function fitBaseline(data: RvData, trend: TrendKind = 'none', epoch?: number): FitResult {
  return fitKeplerians(data, { planets: [], trend, epoch })
}

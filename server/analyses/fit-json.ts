// Turns the numerical core's fit into the stored/returned JSON: derived planet quantities,
// per-measurement residuals, warnings in plain words.
import { derivedPlanet, fitWarnings, planetLetter, type RvData } from '../../shared/rv/index.ts'
import type { PlainFit } from '../compute/tasks.ts'
import type { DataSelection, FitResultJson, FitWarning, ModelSpec, PlanetSpec } from '../../shared/api/analyses.ts'

const fin = (x: number | undefined | null): number | null => (x !== undefined && x !== null && Number.isFinite(x) ? x : null)


export interface StarInfo { massMsun: number; massErrMsun: number; luminosityLsun: number | null }

/**
 * Stored form of a fit. M sin i and a come from `derivedPlanet` (full mass function, Kepler's third
 * law, stellar-mass error included); insolation is the orbit-averaged flux L★/(a²√(1−e²)) in units
 * of Earth's (common practice: L in L☉, a in au).
 */
export function fitJson(fit: PlainFit, data: RvData, ids: number[], star: StarInfo, sel: DataSelection): FitResultJson {
  const planets = fit.planets.map((p, k) => {
    let d: ReturnType<typeof derivedPlanet> | null = null
    try {
      const cov = p.covPKe.every(Number.isFinite) ? p.covPKe : undefined
      d = derivedPlanet({ period: p.period, K: Math.max(p.K, 0), e: p.e }, star.massMsun, { starMassErr: star.massErrMsun, covariance: cov })
    } catch { d = null }
    const aAu = d ? fin(d.aAu) : null
    return {
      label: planetLetter(k), period: p.period, K: p.K, e: p.e, omegaDeg: p.omegaDeg, tp: p.tp, tc: p.tc,
      uncertainty: {
        period: fin(p.uncertainty.period), K: fin(p.uncertainty.K), e: fin(p.uncertainty.e),
        omegaDeg: fin(p.uncertainty.omegaDeg), tp: fin(p.uncertainty.tp), tc: fin(p.uncertainty.tc),
      },
      msiniMjup: d ? fin(d.msiniMjup) : null, msiniMearth: d ? fin(d.msiniMearth) : null, aAu,
      derivedUncertainty: {
        msiniMjup: d ? fin(d.uncertainty.msiniMjup) : null, msiniMearth: d ? fin(d.uncertainty.msiniMearth) : null,
        aAu: d ? fin(d.uncertainty.aAu) : null,
      },
      insolationEarth: star.luminosityLsun && aAu ? star.luminosityLsun / (aAu * aAu * Math.sqrt(1 - p.e * p.e)) : null,
    }
  })
  const residuals = ids.map((id, i) => ({ measurementId: id, model: data.y[i]! - fit.residuals[i]!, residual: fit.residuals[i]! }))
  return {
    planets,
    instruments: fit.instruments.map((i) => ({
      name: i.name, n: i.n, offset: fin(i.offset), offsetErr: fin(i.offsetErr), jitter: fin(i.jitter), jitterErr: fin(i.jitterErr), rms: fin(i.rms),
    })),
    trend: fit.trend ? {
      kind: fit.trend.kind, slope: fit.trend.slope, slopeErr: fin(fit.trend.slopeErr), curvature: fit.trend.curvature,
      curvatureErr: fin(fit.trend.curvatureErr), epoch: fit.trend.epoch,
    } : null,
    stats: {
      chi2: fin(fit.stats.chi2), reducedChi2: fin(fit.stats.reducedChi2), lnL: fin(fit.stats.lnL), bic: fin(fit.stats.bic),
      aic: fin(fit.stats.aic), rms: fin(fit.stats.rms), nParams: fit.stats.nParams, nPoints: fit.stats.nPoints,
      converged: fit.converged, status: fit.status, message: fit.message, iterations: fit.iterations,
    },
    epoch: fit.epoch,
    residuals,
    warnings: warningsOf(fit, sel),
    data: sel,
  }
}

/** Plain warnings of the core (`fitWarnings`) with the selection's baseline. */
export function warningsOf(fit: PlainFit, sel: DataSelection): FitWarning[] {
  return fitWarnings(fit, sel.baseline)
}

/** A spec whose planets are the fitted values (for a search result or "start from this fit"). */
export function specFromFit(fit: PlainFit, trend: ModelSpec['trend'], instruments: string[] | null): ModelSpec {
  const planets: PlanetSpec[] = fit.planets.map((p) => ({ period: p.period, K: p.K, e: p.e, omegaDeg: p.omegaDeg, tc: p.tc }))
  return { planets, trend, instruments }
}

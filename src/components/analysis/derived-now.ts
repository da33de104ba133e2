// M sin i, a and insolation of a fit's planets for the star as it is now. The stored fit carries
// them for the star's mass at fit time (server/analyses/fit-json.ts, full P–K–e covariance); when
// the star's mass has changed since, they are recomputed here with the same function
// (shared/rv/derived.ts `derivedPlanet`) from the fitted P, K, e and their 1σ errors, and the
// row says so (the P–K–e correlations are not stored: refitting restores the full propagation).
import { derivedPlanet } from '@shared/rv/derived.ts'
import type { FitResultJson } from '@shared/api/analyses.ts'

type Planet = FitResultJson['planets'][number]

export interface DerivedNow {
  label: string
  period: number
  msiniMjup: number | null; msiniMearth: number | null; aAu: number | null
  err: { msiniMjup: number | null; msiniMearth: number | null; aAu: number | null }
  insolationEarth: number | null
  tc: number; tcErr: number | null
  /** Recomputed on screen for the star's current mass (the stored values were for another mass). */
  recomputed: boolean
}

const fin = (x: number | null | undefined): number | null => (x !== null && x !== undefined && Number.isFinite(x) ? x : null)
const sq = (x: number | null) => (x === null ? 0 : x * x)

/** The planets' derived values for a star of mass `massMsun` ± `massErrMsun` (and luminosity, for the insolation). */
export function derivedForStar(planets: Planet[], massMsun: number, massErrMsun: number | null, luminosityLsun: number | null): DerivedNow[] {
  return planets.map((p) => {
    const base = { label: p.label, period: p.period, tc: p.tc, tcErr: p.uncertainty.tc }
    const insolation = (a: number | null) => (luminosityLsun && a ? luminosityLsun / (a * a * Math.sqrt(1 - p.e * p.e)) : null)
    let d: ReturnType<typeof derivedPlanet> | null = null
    try {
      if (massMsun > 0) {
        const u = p.uncertainty
        d = derivedPlanet({ period: p.period, K: Math.max(p.K, 0), e: p.e }, massMsun, {
          starMassErr: Math.max(massErrMsun ?? 0, 0), covariance: [sq(u.period), 0, 0, 0, sq(u.K), 0, 0, 0, sq(u.e)],
        })
      }
    } catch { d = null }
    const stored = fin(p.msiniMjup)
    // the stored values hold when they were made for this mass (same value to 1 part in 10⁶)
    const same = d !== null && stored !== null && Math.abs(stored - d.msiniMjup) <= 1e-6 * Math.abs(d.msiniMjup)
    if (same || d === null) {
      return {
        ...base, msiniMjup: stored, msiniMearth: fin(p.msiniMearth), aAu: fin(p.aAu),
        err: { msiniMjup: fin(p.derivedUncertainty.msiniMjup), msiniMearth: fin(p.derivedUncertainty.msiniMearth), aAu: fin(p.derivedUncertainty.aAu) },
        insolationEarth: fin(p.insolationEarth) ?? insolation(fin(p.aAu)), recomputed: false,
      }
    }
    return {
      ...base, msiniMjup: fin(d.msiniMjup), msiniMearth: fin(d.msiniMearth), aAu: fin(d.aAu),
      err: { msiniMjup: fin(d.uncertainty.msiniMjup), msiniMearth: fin(d.uncertainty.msiniMearth), aAu: fin(d.uncertainty.aAu) },
      insolationEarth: insolation(fin(d.aAu)), recomputed: true,
    }
  })
}

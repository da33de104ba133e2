/**
 * Partial derivatives of one Keplerian's velocity v(t) = K [cos(ν + ω) + e cos ω] with respect to its
 * elements, from one solution of Kepler's equation per time (Murray & Dermott 1999, *Solar System
 * Dynamics*, §2.4–2.5). With M the mean anomaly and E the eccentric anomaly:
 *
 *   ∂v/∂K      = cos(ν + ω) + e cos ω
 *   ∂v/∂ν      = −K sin(ν + ω)
 *   dν/dM      = √(1 − e²) / (1 − e cos E)²                      (from dM = (1 − e cos E) dE, eq. 2.40)
 *   ∂ν/∂e |M   = sin ν (2 + e cos ν) / (1 − e²)                   (common practice, e.g. orbit-fitting texts)
 *   ∂v/∂e |M,ω = K cos ω + ∂v/∂ν · ∂ν/∂e
 *   ∂v/∂ω |M,e = −K [sin(ν + ω) + e sin ω]
 *
 * The mean anomaly M = 2π (t − Tp)/P carries P and Tp: ∂M/∂P = −M/P, ∂M/∂Tp = −2π/P.
 * `keplerianPartials` writes v and ∂v/∂K, dv/dM, ∂v/∂e, ∂v/∂ω per time; tests/shared/rv/model-partials.spec.ts
 * checks each against central differences of `addKeplerian` (the readable reference).
 */
import { keplerSinCosArray } from './kepler.ts'
import type { Keplerian } from './model.ts'

const TWO_PI = 2 * Math.PI

/** Per-time partials of one Keplerian (each array as long as the times). */
export interface KeplerianPartials {
  /** v(t) (m/s). */
  v: Float64Array
  /** Mean anomaly 2π(t − Tp)/P, not reduced (rad). */
  M: Float64Array
  /** ∂v/∂K (dimensionless). */
  dK: Float64Array
  /** dv/dM (m/s per rad). */
  dM: Float64Array
  /** ∂v/∂e at fixed M and ω (m/s). */
  de: Float64Array
  /** ∂v/∂ω at fixed M and e (m/s per rad). */
  dw: Float64Array
}

export function keplerianPartialsBuffers(n: number): KeplerianPartials {
  return { v: new Float64Array(n), dK: new Float64Array(n), M: new Float64Array(n), dM: new Float64Array(n), de: new Float64Array(n), dw: new Float64Array(n) }
}

let bufS = new Float64Array(256), bufC = new Float64Array(256)

/** Writes v and its partials at times t into `out` (no allocation after the first long series). */
export function keplerianPartials(t: ArrayLike<number>, o: Keplerian, out: KeplerianPartials): void {
  const { period, K, e, omega, tp } = o
  const len = t.length
  const nMean = TWO_PI / period
  const cw = Math.cos(omega), sw = Math.sin(omega)
  const sq = Math.sqrt(1 - e * e), oneMinusE2 = 1 - e * e
  const { v, dK, M, dM, de, dw } = out
  if (bufS.length < len) { bufS = new Float64Array(len); bufC = new Float64Array(len) }
  for (let i = 0; i < len; i++) M[i] = nMean * (t[i] - tp)
  if (e === 0) for (let i = 0; i < len; i++) { bufS[i] = Math.sin(M[i]); bufC[i] = Math.cos(M[i]) }
  else keplerSinCosArray(M, len, e, bufS, bufC)
  for (let i = 0; i < len; i++) {
    const cE = bufC[i], sE = bufS[i]
    const den = 1 - e * cE
    const cosNu = (cE - e) / den, sinNu = sq * sE / den
    const c = cosNu * cw - sinNu * sw // cos(ν + ω)
    const s = sinNu * cw + cosNu * sw // sin(ν + ω)
    const dvdnu = -K * s
    dK[i] = c + e * cw
    v[i] = K * dK[i]
    dM[i] = dvdnu * sq / (den * den)
    de[i] = K * cw + dvdnu * sinNu * (2 + e * cosNu) / oneMinusE2
    dw[i] = -K * (s + e * sw)
  }
}

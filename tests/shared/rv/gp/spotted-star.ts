/**
 * A seeded synthetic spotted star (invented): a 12.3-d planet and rotational activity at 23.5 d drawn
 * from the rotation-kernel GP (decay time 120 d, shape 0.2; the quasi-periodic kernel puts about half its
 * variance in a slow non-periodic part, which makes a poor test of period matching), in the velocities and, with the opposite sign, in a
 * bisector-like indicator (r ≈ −0.9), plus an indicator that carries no signal. One or two instruments.
 */
import { createRandom } from '../../../../shared/math/random.ts'
import { denseFactor, rotation, radialVelocity, type RvData, type RotationShape } from '../../../../shared/rv/index.ts'

export const STAR = {
  planet: { period: 12.3, K: 7, e: 0.1, omega: 1.0, tp: 2459003.1 },
  rotation: { kind: 'rotation', period: 23.5, decayTime: 120, shape: 0.2 } as RotationShape,
  activityAmplitude: 9,
  error: 1.5,
}

export interface SpottedStar {
  data: RvData
  activity: Float64Array
  planet: Float64Array
  bisector: Float64Array
  bisectorError: Float64Array
  quiet: Float64Array
}

export function spottedStar(seed = 1, n = 160, span = 420, twoInstruments = false): SpottedStar {
  const rng = createRandom(seed)
  const t = new Float64Array(n)
  for (let i = 0; i < n; i++) t[i] = 2459000 + span * rng.next()
  t.sort()
  const unitScale = new Float64Array(n).fill(STAR.activityAmplitude)
  const tiny = new Float64Array(n).fill(1e-8 * STAR.activityAmplitude ** 2)
  const f = denseFactor(t, unitScale, tiny, (tau) => rotation(tau, STAR.rotation))
  const z = Float64Array.from({ length: n }, () => rng.normal())
  const activity = new Float64Array(n)
  for (let i = 0; i < n; i++) { let s = 0; for (let k = 0; k <= i; k++) s += f.L[i * n + k] * z[k]; activity[i] = s }
  const planet = radialVelocity(t, [STAR.planet])
  const instrument = Int32Array.from({ length: n }, (_, i) => (twoInstruments && i % 3 === 0 ? 1 : 0))
  const offsets = [-3.0, 12.0]
  const y = new Float64Array(n), dy = new Float64Array(n).fill(STAR.error)
  const bisector = new Float64Array(n), bisectorError = new Float64Array(n).fill(2), quiet = new Float64Array(n)
  for (let i = 0; i < n; i++) {
    y[i] = planet[i] + activity[i] + offsets[instrument[i]] + STAR.error * rng.normal()
    bisector[i] = -0.9 * activity[i] + 2 * rng.normal() + (instrument[i] === 1 ? 30 : 0)
    quiet[i] = 0.1 + 0.02 * rng.normal()
  }
  return {
    data: { t, y, dy, instrument, instrumentNames: twoInstruments ? ['North', 'South'] : ['North'] },
    activity, planet, bisector, bisectorError, quiet,
  }
}

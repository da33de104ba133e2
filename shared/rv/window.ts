/**
 * Spectral window of the sampling: W(f) = |Σ_j e^{2πi f t_j}|² / N², 1 at f = 0
 * (Dawson & Fabrycky 2010, ApJ 722, 937, §2 eq. 1; unweighted, as there).
 */
import { baselineOf, extirpolate, type FrequencyGrid } from './periodogram-core.ts'
import FFT from 'fft.js'

/** N·M above which the window is summed by extirpolation + FFT (Press & Rybicki 1989) instead of directly. */
const WINDOW_DIRECT_MAX_WORK = 4_000_000

/** Window power |W(f)|² at one frequency (c/d), exact trig. */
export function windowPowerAt(t: Float64Array, frequency: number): number {
  const { tmin } = baselineOf(t)
  const om = 2 * Math.PI * frequency
  let c = 0, s = 0
  for (let j = 0; j < t.length; j++) {
    const x = om * (t[j] - tmin)
    c += Math.cos(x); s += Math.sin(x)
  }
  const n = t.length
  return (c * c + s * s) / (n * n)
}

/**
 * Spectral window |W(f)|² on `grid`, normalised to 1 at f = 0 (Dawson & Fabrycky 2010, ApJ 722,
 * 937). Peaks of the window away from 0 (1 day for nightly sampling, 1 synodic month, 1 year)
 * are the frequencies that alias a real signal f into f ± f_window.
 */
export function windowFunction(t: Float64Array, grid: FrequencyGrid): Float64Array {
  const { tmin } = baselineOf(t)
  const m = grid.count
  if (!(Number.isInteger(m) && m >= 1)) throw new RangeError(`grid.count must be an integer >= 1 (got ${m})`)
  if (!(Number.isFinite(grid.f0) && Number.isFinite(grid.df) && grid.df > 0)) throw new RangeError('grid.f0 and grid.df must be finite, df > 0')
  const n = t.length
  const out = new Float64Array(m)
  const tau = new Float64Array(n)
  for (let j = 0; j < n; j++) tau[j] = t[j] - tmin
  const inv = 1 / (n * n)
  if (n * m <= WINDOW_DIRECT_MAX_WORK) {
    const c = new Float64Array(n), s = new Float64Array(n), cd = new Float64Array(n), sd = new Float64Array(n)
    for (let j = 0; j < n; j++) { const d = 2 * Math.PI * grid.df * tau[j]; cd[j] = Math.cos(d); sd[j] = Math.sin(d) }
    for (let k0 = 0; k0 < m; k0 += 512) {
      const om0 = 2 * Math.PI * (grid.f0 + k0 * grid.df)
      for (let j = 0; j < n; j++) { c[j] = Math.cos(om0 * tau[j]); s[j] = Math.sin(om0 * tau[j]) }
      for (let k = k0, k1 = Math.min(m, k0 + 512); k < k1; k++) {
        let sc = 0, ss = 0
        for (let j = 0; j < n; j++) {
          const cj = c[j], sj = s[j]
          sc += cj; ss += sj
          c[j] = cj * cd[j] - sj * sd[j]
          s[j] = sj * cd[j] + cj * sd[j]
        }
        out[k] = (sc * sc + ss * ss) * inv
      }
    }
    return out
  }
  let size = 16
  while (size < 2 * m) size *= 2
  const g = new Float64Array(2 * size), f = new Float64Array(2 * size)
  const ones = new Float64Array(n).fill(1)
  const kc = m >> 1
  extirpolate(tau, size * grid.df, grid.f0 + kc * grid.df, size, 16, ones, g, null, null)
  new FFT(size).transform(f, g)
  const mask = size - 1
  for (let k = 0; k < m; k++) {
    const idx = ((kc - k) & mask) << 1
    out[k] = (f[idx] * f[idx] + f[idx + 1] * f[idx + 1]) * inv
  }
  return out
}

/**
 * Detection probability of a sinusoid at a known frequency (Cumming 2004, MNRAS 354, 1165, §2):
 * with Gaussian errors of known size, the χ² removed by the sinusoid at the true frequency,
 * X = Δχ², is non-central χ² with 2 degrees of freedom and non-centrality λ (λ = N K²/(2σ²) for
 * evenly spread phases; exactly, λ is the Δχ² of the noise-free signal). The normalised periodogram
 * power p = X/(X + Y) also involves the χ² left after the fit, Y ~ χ²(N − 3), independent of X; so
 * the probability that p exceeds a level p₀ is P(X > c·Y) with c = p₀/(1 − p₀) — the non-central
 * F distribution. Both forms are here: the χ² one the papers quote, and the exact one the tests use.
 */
import { lnGamma } from '../rv/index.ts'

/** P(χ²₂(λ) > x): Poisson mixture of central χ² with 2 + 2j degrees of freedom (common practice). */
export function nonCentralChi2Sf2(lambda: number, x: number): number {
  if (!(lambda >= 0) || !(Number.isFinite(x))) throw new RangeError(`lambda must be ≥ 0 and x finite, got ${lambda}, ${x}`)
  if (x <= 0) return 1
  const h = lambda / 2, z = x / 2
  // P(χ²_{2+2j} > x) = P(Poisson(z) ≤ j) = Σ_{i ≤ j} e^{−z} z^i / i!; terms from logs (no underflow for large λ, x)
  const lnz = Math.log(z), lnh = h > 0 ? Math.log(h) : -Infinity
  const jmax = Math.ceil(Math.max(h, z) + 12 * Math.sqrt(Math.max(h, z) + 1) + 30)
  let tail = 0, sum = 0, lnFact = 0
  for (let j = 0; j <= jmax; j++) {
    if (j > 0) lnFact += Math.log(j)
    tail += Math.exp(-z + j * lnz - lnFact)
    const pois = j === 0 ? Math.exp(-h) : Math.exp(-h + j * lnh - lnFact)
    sum += pois * Math.min(1, tail)
  }
  return Math.min(1, Math.max(0, sum))
}

/**
 * P(p ≥ level) for the normalised power with N points, at non-centrality λ: the expectation of
 * P(X > c·y) over y ~ χ²(N − 3), by the trapezoid rule (300 steps) on ±10 standard deviations of y.
 */
export function detectionProbability(lambda: number, level: number, nPoints: number): number {
  if (!(level > 0 && level < 1)) throw new RangeError(`level must be in (0, 1), got ${level}`)
  if (!(Number.isInteger(nPoints) && nPoints >= 5)) throw new RangeError(`nPoints must be an integer ≥ 5, got ${nPoints}`)
  const nu = nPoints - 3, c = level / (1 - level)
  const sd = Math.sqrt(2 * nu)
  const lo = Math.max(1e-9, nu - 10 * sd), hi = nu + 10 * sd
  const steps = 300, dy = (hi - lo) / steps
  const lnNorm = -(nu / 2) * Math.log(2) - lnGamma(nu / 2)
  let s = 0, wsum = 0
  for (let i = 0; i <= steps; i++) {
    const y = lo + i * dy
    const w = (i === 0 || i === steps ? 0.5 : 1) * Math.exp(lnNorm + (nu / 2 - 1) * Math.log(y) - y / 2) * dy
    s += w * nonCentralChi2Sf2(lambda, c * y)
    wsum += w
  }
  return s / wsum
}

/** The papers' approximation: Y replaced by its mean N − 3, i.e. P(χ²₂(λ) > (N − 3)·p₀/(1 − p₀)). */
export function detectionProbabilityChi2(lambda: number, level: number, nPoints: number): number {
  if (!(level > 0 && level < 1)) throw new RangeError(`level must be in (0, 1), got ${level}`)
  return nonCentralChi2Sf2(lambda, (nPoints - 3) * level / (1 - level))
}

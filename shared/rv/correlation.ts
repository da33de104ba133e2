/**
 * Correlation of two series (velocity or residual against an activity indicator): Pearson's r and
 * Spearman's rank ρ with two-sided p-values for "no correlation".
 *
 * - Pearson: under independent normal pairs, t = r √((n−2)/(1−r²)) follows Student's t with n−2 degrees
 *   of freedom (common practice; e.g. Press et al., Numerical Recipes, 3rd ed., §14.5), so
 *   p = I_{1−r²}((n−2)/2, ½), the exact tail through the regularised incomplete beta function.
 * - Spearman: Pearson's r of the ranks, ties given their average rank; p from the same t approximation
 *   (Numerical Recipes §14.6; the choice scipy.stats.spearmanr makes).
 * The incomplete beta is the continued fraction of DLMF 8.17.22 evaluated by the modified Lentz method,
 * with the symmetry I_x(a,b) = 1 − I_{1−x}(b,a) where the fraction converges slowly.
 */
import { lnGamma } from './fap.ts'

export interface Correlation {
  n: number
  /** Pearson's r (NaN when a series is constant or n < 3). */
  pearson: number
  pearsonP: number
  /** Spearman's ρ (NaN when a series has one rank only or n < 3). */
  spearman: number
  spearmanP: number
  /** Why a value is NaN, in plain words (null when all are numbers). */
  note: string | null
}

/** Continued fraction for I_x(a, b) (DLMF 8.17.22), modified Lentz; converges well for x < (a+1)/(a+b+2). */
function betaFraction(x: number, a: number, b: number): number {
  const tiny = 1e-300
  let c = 1, d = 1 - ((a + b) * x) / (a + 1)
  if (Math.abs(d) < tiny) d = tiny
  d = 1 / d
  let h = d
  for (let m = 1; m <= 10000; m++) {
    const m2 = 2 * m
    let num = (m * (b - m) * x) / ((a + m2 - 1) * (a + m2))
    d = 1 + num * d; if (Math.abs(d) < tiny) d = tiny
    c = 1 + num / c; if (Math.abs(c) < tiny) c = tiny
    d = 1 / d; h *= d * c
    num = (-(a + m) * (a + b + m) * x) / ((a + m2) * (a + m2 + 1))
    d = 1 + num * d; if (Math.abs(d) < tiny) d = tiny
    c = 1 + num / c; if (Math.abs(c) < tiny) c = tiny
    d = 1 / d
    const del = d * c
    h *= del
    if (Math.abs(del - 1) < 1e-16) return h
  }
  return h
}

/** Regularised incomplete beta I_x(a, b), a, b > 0, 0 ≤ x ≤ 1. */
export function incompleteBeta(x: number, a: number, b: number): number {
  if (!(a > 0 && b > 0)) throw new RangeError(`a and b must be > 0 (got ${a}, ${b})`)
  if (!(x >= 0 && x <= 1)) throw new RangeError(`x must be in [0, 1] (got ${x})`)
  if (x === 0 || x === 1) return x
  const lnFront = lnGamma(a + b) - lnGamma(a) - lnGamma(b) + a * Math.log(x) + b * Math.log1p(-x)
  if (x < (a + 1) / (a + b + 2)) return (Math.exp(lnFront) * betaFraction(x, a, b)) / a
  return 1 - (Math.exp(lnFront) * betaFraction(1 - x, b, a)) / b
}

/** Two-sided p-value of a correlation coefficient r from n pairs (t test with n − 2 degrees of freedom). */
export function correlationPValue(r: number, n: number): number {
  if (!Number.isFinite(r) || n < 3) return NaN
  const a = Math.abs(r)
  if (a >= 1) return 0
  const nu = n - 2
  return incompleteBeta((1 - a) * (1 + a), nu / 2, 0.5)
}

function pearsonOf(x: ArrayLike<number>, y: ArrayLike<number>): number {
  const n = x.length
  let mx = 0, my = 0
  for (let i = 0; i < n; i++) { mx += x[i]; my += y[i] }
  mx /= n; my /= n
  let sxy = 0, sxx = 0, syy = 0
  for (let i = 0; i < n; i++) {
    const dx = x[i] - mx, dy = y[i] - my
    sxy += dx * dy; sxx += dx * dx; syy += dy * dy
  }
  if (!(sxx > 0 && syy > 0)) return NaN
  return Math.max(-1, Math.min(1, sxy / Math.sqrt(sxx * syy)))
}

/** Ranks 1…n, ties given the average of the ranks they span. */
export function averageRanks(x: ArrayLike<number>): Float64Array {
  const n = x.length
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => x[a] - x[b])
  const ranks = new Float64Array(n)
  for (let i = 0; i < n;) {
    let j = i
    while (j + 1 < n && x[order[j + 1]] === x[order[i]]) j++
    const r = (i + j) / 2 + 1
    for (let k = i; k <= j; k++) ranks[order[k]] = r
    i = j + 1
  }
  return ranks
}

/**
 * Pearson and Spearman correlation of paired series with two-sided p-values. Pairs where either value
 * is not finite are skipped (and counted out of n). Throws if the lengths differ.
 */
export function correlate(x: ArrayLike<number>, y: ArrayLike<number>): Correlation {
  if (x.length !== y.length) throw new RangeError(`x has ${x.length} values, y has ${y.length}`)
  const xs: number[] = [], ys: number[] = []
  for (let i = 0; i < x.length; i++) if (Number.isFinite(x[i]) && Number.isFinite(y[i])) { xs.push(x[i]); ys.push(y[i]) }
  const n = xs.length
  if (n < 3) return { n, pearson: NaN, pearsonP: NaN, spearman: NaN, spearmanP: NaN, note: `only ${n} pairs; a correlation needs at least 3` }
  const pearson = pearsonOf(xs, ys)
  const spearman = pearsonOf(averageRanks(xs), averageRanks(ys))
  const note = Number.isNaN(pearson) ? 'one of the series is constant; no correlation can be measured' : null
  return { n, pearson, pearsonP: correlationPValue(pearson, n), spearman, spearmanP: correlationPValue(spearman, n), note }
}

/**
 * Convergence diagnostics of an ensemble chain laid out as steps × walkers × dims (row-major,
 * chain[(s·nWalkers + w)·nDim + d], the layout `runEnsemble` returns):
 *
 * - integrated autocorrelation time per parameter, from the walker-averaged normalised
 *   autocorrelation function (FFT) with Sokal's automatic window M ≥ c τ(M), c = 5
 *   (Sokal 1997, "Monte Carlo methods in statistical mechanics", §3; Foreman-Mackey et al. 2013,
 *   PASP 125, 306, and the estimator of their emcee package, autocorr.integrated_time), and the
 *   chain-length rule N > 50 τ from the same source;
 * - rank-normalised split-R̂ (Vehtari, Gelman, Simpson, Carpenter & Bürkner 2021, Bayesian
 *   Analysis 16, 667, eqs. 3–4 with the rank normalisation of their §4.1 and the folded variant
 *   for the tails), the "chains" being groups of walkers;
 * - acceptance fraction.
 */

export interface ChainShape {
  nSteps: number
  nWalkers: number
  nDim: number
}

function checkChain(chain: ArrayLike<number>, s: ChainShape): void {
  for (const k of ['nSteps', 'nWalkers', 'nDim'] as const) {
    if (!(Number.isInteger(s[k]) && s[k] >= 1)) throw new RangeError(`${k} must be a positive integer, got ${s[k]}`)
  }
  if (chain.length !== s.nSteps * s.nWalkers * s.nDim) {
    throw new RangeError(`chain has ${chain.length} numbers, nSteps × nWalkers × nDim = ${s.nSteps * s.nWalkers * s.nDim}`)
  }
}

// ---------------------------------------------------------------------------------------------
// FFT (iterative radix-2, complex, in place)

const twiddleCache = new Map<number, { cos: Float64Array; sin: Float64Array; rev: Uint32Array }>()

function tables(n: number): { cos: Float64Array; sin: Float64Array; rev: Uint32Array } {
  let t = twiddleCache.get(n)
  if (t) return t
  const cos = new Float64Array(n / 2), sin = new Float64Array(n / 2)
  for (let k = 0; k < n / 2; k++) { cos[k] = Math.cos((2 * Math.PI * k) / n); sin[k] = Math.sin((2 * Math.PI * k) / n) }
  const rev = new Uint32Array(n)
  const bits = Math.round(Math.log2(n))
  for (let i = 0; i < n; i++) {
    let r = 0
    for (let b = 0, v = i; b < bits; b++, v >>= 1) r = (r << 1) | (v & 1)
    rev[i] = r
  }
  t = { cos, sin, rev }
  twiddleCache.set(n, t)
  return t
}

/** In-place FFT of (re, im), length a power of two; `inverse` uses e^{+i…} and does not scale. */
function fft(re: Float64Array, im: Float64Array, inverse: boolean): void {
  const n = re.length
  const { cos, sin, rev } = tables(n)
  for (let i = 0; i < n; i++) {
    const j = rev[i]
    if (j > i) { let t = re[i]; re[i] = re[j]; re[j] = t; t = im[i]; im[i] = im[j]; im[j] = t }
  }
  const sg = inverse ? 1 : -1
  for (let size = 2; size <= n; size <<= 1) {
    const halfSize = size >> 1, step = n / size
    for (let start = 0; start < n; start += size) {
      for (let k = 0; k < halfSize; k++) {
        const wr = cos[k * step], wi = sg * sin[k * step]
        const a = start + k, b = a + halfSize
        const xr = re[b] * wr - im[b] * wi
        const xi = re[b] * wi + im[b] * wr
        re[b] = re[a] - xr; im[b] = im[a] - xi
        re[a] += xr; im[a] += xi
      }
    }
  }
}

function nextPow2(n: number): number {
  let p = 1
  while (p < n) p <<= 1
  return p
}

/**
 * Normalised autocorrelation function ρ(τ), τ = 0…n−1, of one series (FFT of the zero-padded,
 * mean-subtracted series; ρ(0) = 1). A constant series gives ρ = 1 at 0 and 0 elsewhere.
 */
export function autocorrelation(x: ArrayLike<number>): Float64Array {
  const n = x.length
  if (n < 1) throw new RangeError('x must not be empty')
  const m = 2 * nextPow2(n)
  const re = new Float64Array(m), im = new Float64Array(m)
  let mean = 0
  for (let i = 0; i < n; i++) mean += x[i]
  mean /= n
  for (let i = 0; i < n; i++) re[i] = x[i] - mean
  fft(re, im, false)
  for (let k = 0; k < m; k++) { re[k] = re[k] * re[k] + im[k] * im[k]; im[k] = 0 }
  fft(re, im, true)
  const out = new Float64Array(n)
  if (!(re[0] > 0)) { out[0] = 1; return out }
  for (let i = 0; i < n; i++) out[i] = re[i] / re[0]
  return out
}

/**
 * Sokal's automatic window: the smallest M with M ≥ c·τ(M), τ(M) = 1 + 2 Σ_{t=1}^{M} ρ(t)
 * (Sokal 1997 §3; c = 5 as in Foreman-Mackey et al. 2013). Returns τ(M).
 */
export function windowedTau(rho: ArrayLike<number>, c = 5): number {
  if (!(c > 0)) throw new RangeError(`c must be > 0, got ${c}`)
  let tau = 1
  for (let M = 1; M < rho.length; M++) {
    tau += 2 * rho[M]
    if (M >= c * tau) return tau
  }
  return tau
}

/** Integrated autocorrelation time of one series (Sokal window, c = 5). */
export function integratedTime1d(x: ArrayLike<number>, c = 5): number {
  return windowedTau(autocorrelation(x), c)
}

/**
 * Integrated autocorrelation time per parameter of an ensemble chain: the normalised
 * autocorrelation functions of the walkers are averaged, then Sokal's window with constant c
 * (Foreman-Mackey et al. 2013 and their emcee 3 estimator). Two walkers share one complex FFT.
 */
export function integratedTime(chain: ArrayLike<number>, shape: ChainShape, c = 5): Float64Array {
  checkChain(chain, shape)
  const { nSteps, nWalkers, nDim } = shape
  const m = 2 * nextPow2(nSteps)
  const re = new Float64Array(m), im = new Float64Array(m)
  const sum = new Float64Array(nSteps)
  const taus = new Float64Array(nDim)
  for (let d = 0; d < nDim; d++) {
    sum.fill(0)
    let used = 0
    for (let w = 0; w < nWalkers; w += 2) {
      const w2 = w + 1 < nWalkers ? w + 1 : -1
      re.fill(0); im.fill(0)
      let ma = 0, mb = 0
      for (let s = 0; s < nSteps; s++) {
        ma += chain[(s * nWalkers + w) * nDim + d]
        if (w2 >= 0) mb += chain[(s * nWalkers + w2) * nDim + d]
      }
      ma /= nSteps; mb /= nSteps
      for (let s = 0; s < nSteps; s++) {
        re[s] = chain[(s * nWalkers + w) * nDim + d] - ma
        if (w2 >= 0) im[s] = chain[(s * nWalkers + w2) * nDim + d] - mb
      }
      fft(re, im, false)
      // Spectra of the two real series: A(k) = (Z(k) + Z*(m−k))/2, B(k) = (Z(k) − Z*(m−k))/(2i)
      for (let k = 0; k <= m / 2; k++) {
        const k2 = (m - k) % m
        const zr = re[k], zi = im[k], cr = re[k2], ci = -im[k2]
        const ar = 0.5 * (zr + cr), ai = 0.5 * (zi + ci)
        const br = 0.5 * (zi - ci), bi = -0.5 * (zr - cr)
        const pa = ar * ar + ai * ai, pb = br * br + bi * bi
        re[k] = pa; im[k] = pb; re[k2] = pa; im[k2] = pb
      }
      fft(re, im, true) // real part: acf of walker w, imaginary part: of walker w2
      if (re[0] > 0) { for (let s = 0; s < nSteps; s++) sum[s] += re[s] / re[0] } else sum[0] += 1
      used++
      if (w2 >= 0) { if (im[0] > 0) { for (let s = 0; s < nSteps; s++) sum[s] += im[s] / im[0] } else sum[0] += 1; used++ }
    }
    for (let s = 0; s < nSteps; s++) sum[s] /= used
    taus[d] = windowedTau(sum, c)
  }
  return taus
}

// ---------------------------------------------------------------------------------------------
// split-R̂

/**
 * Inverse of the standard normal CDF, Acklam's rational approximation (relative error below
 * 1.2e-9; coefficients from memory of P. J. Acklam's published algorithm, checked in the tests
 * against tabulated quantiles). Ample for rank normalisation.
 */
export function normalQuantile(p: number): number {
  if (!(p > 0 && p < 1)) throw new RangeError(`p must be in (0, 1), got ${p}`)
  const a = [-3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2, 1.38357751867269e2, -3.066479806614716e1, 2.506628277459239]
  const b = [-5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2, 6.680131188771972e1, -1.328068155288572e1]
  const c = [-7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838, -2.549732539343734, 4.374664141464968, 2.938163982698783]
  const d = [7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416]
  const lo = 0.02425
  if (p < lo) {
    const q = Math.sqrt(-2 * Math.log(p))
    return (((((c[0] * q + c[1]) * q + c[2]) * q + c[3]) * q + c[4]) * q + c[5]) / ((((d[0] * q + d[1]) * q + d[2]) * q + d[3]) * q + 1)
  }
  if (p > 1 - lo) {
    const q = Math.sqrt(-2 * Math.log(1 - p))
    return -(((((c[0] * q + c[1]) * q + c[2]) * q + c[3]) * q + c[4]) * q + c[5]) / ((((d[0] * q + d[1]) * q + d[2]) * q + d[3]) * q + 1)
  }
  const q = p - 0.5, r = q * q
  return (((((a[0] * r + a[1]) * r + a[2]) * r + a[3]) * r + a[4]) * r + a[5]) * q / (((((b[0] * r + b[1]) * r + b[2]) * r + b[3]) * r + b[4]) * r + 1)
}

/**
 * Classic R̂ (Gelman & Rubin 1992 as written in Vehtari et al. 2021, eqs. 3–4) of `m` chains
 * of equal length `n` stored chain after chain in `x`.
 */
export function classicRhat(x: ArrayLike<number>, m: number, n: number): number {
  if (!(Number.isInteger(m) && m >= 2)) throw new RangeError(`m must be an integer ≥ 2, got ${m}`)
  if (!(Number.isInteger(n) && n >= 2)) throw new RangeError(`n must be an integer ≥ 2, got ${n}`)
  if (x.length !== m * n) throw new RangeError(`x must hold m × n = ${m * n} numbers, got ${x.length}`)
  let grand = 0, W = 0
  const means = new Float64Array(m)
  for (let j = 0; j < m; j++) {
    let s = 0
    for (let i = 0; i < n; i++) s += x[j * n + i]
    means[j] = s / n
    grand += means[j]
    let v = 0
    for (let i = 0; i < n; i++) { const dv = x[j * n + i] - means[j]; v += dv * dv }
    W += v / (n - 1)
  }
  grand /= m; W /= m
  let B = 0
  for (let j = 0; j < m; j++) B += (means[j] - grand) ** 2
  B *= n / (m - 1)
  const varPlus = ((n - 1) / n) * W + B / n
  if (!(W > 0)) return varPlus > 0 ? Infinity : NaN
  return Math.sqrt(varPlus / W)
}

/**
 * Rank normalisation z = Φ⁻¹((r − 3/8)/(S + 1/4)) with average ranks for ties (Vehtari et al.
 * 2021, eq. 14). `sorted` receives the sorted copy of x (native numeric sort; ranks by binary search).
 */
function rankNormalise(x: Float64Array, sorted: Float64Array, out: Float64Array): void {
  const S = x.length
  sorted.set(x)
  sorted.sort()
  for (let i = 0; i < S; i++) {
    const v = x[i]
    let lo = 0, hi = S
    while (lo < hi) { const mid = (lo + hi) >>> 1; if (sorted[mid] < v) lo = mid + 1; else hi = mid }
    const first = lo
    hi = S
    while (lo < hi) { const mid = (lo + hi) >>> 1; if (sorted[mid] <= v) lo = mid + 1; else hi = mid }
    const r = 0.5 * (first + lo - 1) + 1
    out[i] = normalQuantile((r - 0.375) / (S + 0.25))
  }
}

export interface RhatOptions {
  /** Walker groups treated as chains (walker w belongs to group w mod groups); default 4. */
  groups?: number
  /** false: classic split-R̂ on the raw values; default true (rank-normalised, max of bulk and folded). */
  rankNormalised?: boolean
}

/**
 * Split-R̂ per parameter across walker groups (Vehtari et al. 2021). Each group's draws are split
 * into the first and second half of the steps, giving 2·groups chains; the pooled draws of a group
 * in one half form one chain. With `rankNormalised` (default) the value is max(R̂ of the rank-
 * normalised draws, R̂ of the rank-normalised |draw − median|), their recommended statistic;
 * they recommend trusting a run only below 1.01.
 */
export function splitRhat(chain: ArrayLike<number>, shape: ChainShape, opts: RhatOptions = {}): Float64Array {
  checkChain(chain, shape)
  const { nSteps, nWalkers, nDim } = shape
  const groups = opts.groups ?? 4
  if (!(Number.isInteger(groups) && groups >= 1 && nWalkers % groups === 0)) {
    throw new RangeError(`groups must be a positive integer dividing nWalkers (${nWalkers}), got ${groups}`)
  }
  if (nSteps < 4) throw new RangeError(`nSteps must be ≥ 4 for split-R̂, got ${nSteps}`)
  const halfLen = Math.floor(nSteps / 2)
  const perGroup = nWalkers / groups
  const m = 2 * groups, n = halfLen * perGroup
  const x = new Float64Array(m * n)
  const z = new Float64Array(m * n), f = new Float64Array(m * n)
  const sorted = new Float64Array(m * n)
  const out = new Float64Array(nDim)
  const cursor = new Int32Array(m)
  for (let d = 0; d < nDim; d++) {
    cursor.fill(0)
    for (let part = 0; part < 2; part++) {
      // drop the middle step when nSteps is odd (second half starts at nSteps − halfLen)
      const s0 = part === 0 ? 0 : nSteps - halfLen
      for (let s = s0; s < s0 + halfLen; s++) {
        for (let w = 0; w < nWalkers; w++) {
          const c = 2 * (w % groups) + part
          x[c * n + cursor[c]++] = chain[(s * nWalkers + w) * nDim + d]
        }
      }
    }
    if (opts.rankNormalised === false) { out[d] = classicRhat(x, m, n); continue }
    rankNormalise(x, sorted, z)
    const bulk = classicRhat(z, m, n)
    // folded: |x − median|
    const S = x.length
    const med = S % 2 ? sorted[(S - 1) / 2] : 0.5 * (sorted[S / 2 - 1] + sorted[S / 2])
    for (let i = 0; i < S; i++) f[i] = Math.abs(x[i] - med)
    rankNormalise(f, sorted, z)
    const tail = classicRhat(z, m, n)
    out[d] = Math.max(bulk, tail)
  }
  return out
}

/** Mean acceptance fraction of the walkers. */
export function acceptanceFraction(perWalker: ArrayLike<number>): number {
  if (perWalker.length === 0) throw new RangeError('perWalker must not be empty')
  let s = 0
  for (let i = 0; i < perWalker.length; i++) s += perWalker[i]
  return s / perWalker.length
}

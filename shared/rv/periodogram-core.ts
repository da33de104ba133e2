/**
 * Generalised Lomb–Scargle periodogram of radial velocities: frequency grid, the direct O(N·M)
 * evaluation (the readable reference), the fast evaluation by extirpolation + FFT, and the power at
 * a single frequency. Pure numerics: Float64Array in, Float64Array out.
 *
 * Power is the fraction of χ² removed by a sinusoid (plus a floating mean), 0…1 — Zechmeister &
 * Kürster 2009, A&A 496, 577, eq. 5 p(ω) — the same quantity as astropy's
 * `LombScargle(t, y, dy, fit_mean=True, center_data=True).power(f, normalization='standard')`.
 */
import FFT from 'fft.js'

export interface PeriodogramOptions {
  /** Shortest period on the grid, days (default {@link defaultMinPeriod}: 0.5, or 0.2 for visits spread within many nights). */
  minPeriod?: number
  /** Longest period on the grid, days (default {@link GRID_DEFAULTS}.maxPeriodBaselines × the baseline tmax − tmin). */
  maxPeriod?: number
  /** Grid step df = 1/(oversample · baseline) (default 10). */
  oversample?: number
  /** Explicit grid size M (overrides `oversample`): df = (fmax − fmin)/(M − 1). */
  frequencies?: number
  /** 'auto' (default) picks by N·M; 'direct' is exact, 'fast' is extirpolation + FFT. */
  method?: 'auto' | 'direct' | 'fast'
  /** Default true: floating mean (ZK09 GLS). false: classic weighted LS of the centred data. */
  floatingMean?: boolean
  /** m/s, added in quadrature to every error (default 0). */
  jitter?: number
}

/** Regular frequency grid f_k = f0 + k·df, k = 0…count−1, in cycles per day. */
export interface FrequencyGrid { f0: number; df: number; count: number }

export interface PeriodogramResult {
  grid: FrequencyGrid
  /** f_k, cycles/day. */
  frequency: Float64Array
  /** Fraction of χ² removed, 0…1. */
  power: Float64Array
  method: 'direct' | 'fast'
  nPoints: number
  /** tmax − tmin, days. */
  baseline: number
}

/** Largest grid accepted (the fast method then needs four complex buffers of 2^24 points, 1 GB). */
export const MAX_FREQUENCIES = 5_000_000

// ---------------------------------------------------------------------------------------------
// Validation and preparation

function checkOptionalPositive(name: string, v: number | undefined): void {
  if (v !== undefined && !(Number.isFinite(v) && v > 0)) {
    throw new RangeError(`${name} must be a finite number > 0 (got ${v})`)
  }
}

/** Baseline tmax − tmin of finite times; throws naming `t` for empty or non-finite input. */
export function baselineOf(t: Float64Array): { tmin: number; tmax: number; baseline: number } {
  if (!(t instanceof Float64Array)) throw new TypeError('t must be a Float64Array')
  if (t.length === 0) throw new RangeError('t must not be empty')
  let tmin = Infinity, tmax = -Infinity
  for (let i = 0; i < t.length; i++) {
    const v = t[i]
    if (!Number.isFinite(v)) throw new RangeError(`t[${i}] is not finite (${v})`)
    if (v < tmin) tmin = v
    if (v > tmax) tmax = v
  }
  return { tmin, tmax, baseline: tmax - tmin }
}

/**
 * Defaults of the period grid, the one home for the CLI, the server and the browser:
 * - `minPeriod` 0.5 d: ultra-short-period planets (P < 1 d) exist and their daily aliases near
 *   1–3 d must be on the grid to be told apart (Dawson & Fabrycky 2010, ApJ 722, 937, §5); with
 *   visits spread within many nights (see {@link defaultMinPeriod}) the data can tell periods down
 *   to `minPeriodDense` 0.2 d.
 * - `maxPeriodBaselines` 5: companions with periods beyond the baseline are found from a partial
 *   orbit (common practice; their period is then poorly constrained and the search says so).
 * - `oversample` 10: ~10 grid points across every peak of width 1/baseline (VanderPlas 2018 §7.1).
 */
export const GRID_DEFAULTS = Object.freeze({ minPeriod: 0.5, minPeriodDense: 0.2, maxPeriodBaselines: 5, oversample: 10 })

/**
 * Default shortest period for these times: {@link GRID_DEFAULTS} `minPeriod` (0.5 d), or
 * `minPeriodDense` (0.2 d) when at least a quarter of the nights (visits chained by gaps < 0.5 d)
 * have visits spread over ≥ 0.1 d — half a 0.2-d cycle seen within the night. Repeated exposures
 * minutes apart do not count: they sample one phase.
 */
export function defaultMinPeriod(t: ArrayLike<number>): number {
  const n = t.length
  if (n < 8) return GRID_DEFAULTS.minPeriod
  const s = Float64Array.from(t).sort()
  let nights = 0, spread = 0, first = s[0], last = s[0]
  for (let i = 1; i <= n; i++) {
    if (i < n && s[i] - last < 0.5) { last = s[i]; continue }
    nights++
    if (last - first >= 0.1) spread++
    if (i < n) { first = s[i]; last = s[i] }
  }
  return spread >= nights / 4 ? GRID_DEFAULTS.minPeriodDense : GRID_DEFAULTS.minPeriod
}

/** Default longest period: {@link GRID_DEFAULTS} `maxPeriodBaselines` × the baseline (days). */
export function defaultMaxPeriod(baseline: number): number {
  return GRID_DEFAULTS.maxPeriodBaselines * baseline
}

/**
 * The frequency grid: from 1/maxPeriod (default 1/(5·baseline)) to 1/minPeriod (default 1/0.5 d,
 * see {@link GRID_DEFAULTS}), step 1/(oversample·baseline) — the peak width is about 1/baseline, so
 * 10× oversampling puts ~10 grid points across every peak (VanderPlas 2018, ApJS 236, 16, §7.1).
 * With `frequencies` = M the same range is split into M points instead.
 */
export function frequencyGrid(t: Float64Array, opts: PeriodogramOptions = {}): FrequencyGrid {
  const { baseline } = baselineOf(t)
  checkOptionalPositive('minPeriod', opts.minPeriod)
  checkOptionalPositive('maxPeriod', opts.maxPeriod)
  checkOptionalPositive('oversample', opts.oversample)
  const minPeriod = opts.minPeriod ?? defaultMinPeriod(t)
  let maxPeriod = opts.maxPeriod
  if (maxPeriod === undefined) {
    if (!(baseline > 0)) throw new RangeError('t must span a baseline > 0 (or give maxPeriod and frequencies)')
    maxPeriod = defaultMaxPeriod(baseline)
  }
  if (!(maxPeriod > minPeriod)) {
    throw new RangeError(`maxPeriod (${maxPeriod}) must exceed minPeriod (${minPeriod}); the baseline is ${baseline} d`)
  }
  const fmin = 1 / maxPeriod, fmax = 1 / minPeriod
  if (opts.frequencies !== undefined) {
    const m = opts.frequencies
    if (!(Number.isInteger(m) && m >= 2 && m <= MAX_FREQUENCIES)) throw new RangeError(`frequencies must be an integer in 2…${MAX_FREQUENCIES} (got ${m})`)
    return { f0: fmin, df: (fmax - fmin) / (m - 1), count: m }
  }
  if (!(baseline > 0)) throw new RangeError('t must span a baseline > 0 to set the grid step (or give frequencies)')
  const df = 1 / ((opts.oversample ?? GRID_DEFAULTS.oversample) * baseline)
  const count = Math.floor((fmax - fmin) / df * (1 + 1e-12)) + 1
  if (count < 2) throw new RangeError(`the grid from ${fmin} to ${fmax} c/d has fewer than 2 points; raise oversample`)
  if (count > MAX_FREQUENCIES) throw new RangeError(`the grid would have ${count} frequencies (> ${MAX_FREQUENCIES}); raise minPeriod or lower oversample`)
  return { f0: fmin, df, count }
}

/** Weighted, centred data ready for the sums (ZK09 §2: w_i = σ_i⁻² / Σσ⁻²). */
export interface Prepared {
  n: number
  /** t − tmin, days. */
  tau: Float64Array
  /** Normalised weights, Σw = 1. */
  w: Float64Array
  /** w·(y − ȳ_w). */
  wy: Float64Array
  /** Σ w (y − ȳ_w)². */
  yy: number
  tmin: number
  baseline: number
}

/**
 * Checks and weights the data. Throws (naming the argument) for mismatched lengths, fewer than
 * 3 points, non-finite t/y/dy, or dy ≤ 0 with no jitter to make σ positive.
 */
export function prepare(t: Float64Array, y: Float64Array, dy: Float64Array, jitter = 0): Prepared {
  const { tmin, baseline } = baselineOf(t)
  if (!(y instanceof Float64Array)) throw new TypeError('y must be a Float64Array')
  if (!(dy instanceof Float64Array)) throw new TypeError('dy must be a Float64Array')
  const n = t.length
  if (y.length !== n) throw new RangeError(`y has ${y.length} values but t has ${n}`)
  if (dy.length !== n) throw new RangeError(`dy has ${dy.length} values but t has ${n}`)
  if (n < 3) throw new RangeError(`t must have at least 3 points (got ${n})`)
  if (!(Number.isFinite(jitter) && jitter >= 0)) throw new RangeError(`jitter must be a finite number >= 0 (got ${jitter})`)
  const tau = new Float64Array(n), w = new Float64Array(n), wy = new Float64Array(n)
  const j2 = jitter * jitter
  let wsum = 0
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(y[i])) throw new RangeError(`y[${i}] is not finite (${y[i]})`)
    const s = dy[i]
    if (!Number.isFinite(s) || s < 0) throw new RangeError(`dy[${i}] must be finite and >= 0 (got ${s})`)
    const v = s * s + j2
    if (!(v > 0)) throw new RangeError(`dy[${i}] is 0 and there is no jitter: the weight would be infinite`)
    w[i] = 1 / v
    wsum += w[i]
    tau[i] = t[i] - tmin
  }
  let ybar = 0
  for (let i = 0; i < n; i++) { w[i] /= wsum; ybar += w[i] * y[i] }
  let yy = 0
  for (let i = 0; i < n; i++) {
    const d = y[i] - ybar
    wy[i] = w[i] * d
    yy += wy[i] * d
  }
  return { n, tau, w, wy, yy, tmin, baseline }
}

/**
 * Power from the weighted trig sums at one frequency (ZK09 eqs. 4–5, 8–15 with centred y so Y = 0):
 * c = Σw cos ωτ, s = Σw sin ωτ, yc = Σw y cos, ys = Σw y sin, c2 = Σw cos 2ωτ, s2 = Σw sin 2ωτ.
 * p = (SS·YC² + CC·YS² − 2·CS·YC·YS) / (YY·D), D = CC·SS − CS². Returns 0 where D or YY vanish.
 */
export function powerFromSums(
  c: number, s: number, yc: number, ys: number, c2: number, s2: number, yy: number, floatingMean: boolean,
): number {
  let cc = 0.5 * (1 + c2), ss = 0.5 * (1 - c2), cs = 0.5 * s2
  if (floatingMean) { cc -= c * c; ss -= s * s; cs -= c * s }
  const d = cc * ss - cs * cs
  if (!(d > 0) || !(yy > 0)) return 0
  const p = (ss * yc * yc + cc * ys * ys - 2 * cs * yc * ys) / (yy * d)
  return p < 0 ? 0 : p > 1 ? 1 : p
}

function makeResult(grid: FrequencyGrid, power: Float64Array, method: 'direct' | 'fast', p: Prepared): PeriodogramResult {
  const frequency = new Float64Array(grid.count)
  for (let k = 0; k < grid.count; k++) frequency[k] = grid.f0 + k * grid.df
  return { grid, frequency, power, method, nPoints: p.n, baseline: p.baseline }
}

// ---------------------------------------------------------------------------------------------
// Single frequency

/**
 * GLS power at one frequency (cycles/day), exact trig: Zechmeister & Kürster 2009, eq. 5. Used to
 * refine peaks between grid points.
 */
export function gls(
  t: Float64Array, y: Float64Array, dy: Float64Array, frequency: number,
  opts: { floatingMean?: boolean; jitter?: number } = {},
): number {
  if (!Number.isFinite(frequency) || frequency < 0) throw new RangeError(`frequency must be finite and >= 0 (got ${frequency})`)
  return glsPrepared(prepare(t, y, dy, opts.jitter ?? 0), frequency, opts.floatingMean ?? true)
}

/** {@link gls} on already prepared data. */
export function glsPrepared(p: Prepared, frequency: number, floatingMean: boolean): number {
  const om = 2 * Math.PI * frequency
  const { tau, w, wy, n } = p
  let c = 0, s = 0, yc = 0, ys = 0, c2 = 0, s2 = 0
  for (let j = 0; j < n; j++) {
    const x = om * tau[j]
    const cx = Math.cos(x), sx = Math.sin(x)
    const wj = w[j], wyj = wy[j]
    c += wj * cx; s += wj * sx; yc += wyj * cx; ys += wyj * sx
    c2 += wj * (cx - sx) * (cx + sx); s2 += wj * 2 * cx * sx
  }
  return powerFromSums(c, s, yc, ys, c2, s2, p.yy, floatingMean)
}

// ---------------------------------------------------------------------------------------------
// Direct O(N·M)

/** Frequencies between exact re-seeds of the trig recurrence (keeps its rounding drift < 1e-13). */
const RESEED = 512

let directScratch: Float64Array | null = null
function directBuffer(n: number): Float64Array {
  if (directScratch === null || directScratch.length < 6 * n) directScratch = new Float64Array(6 * n)
  return directScratch
}

/**
 * Direct GLS on the grid (Zechmeister & Kürster 2009, eq. 5), O(N·M). The readable reference.
 * cos/sin of ω_k·τ_j advance from one frequency to the next by the rotation
 * (c, s) ← (c·cosΔ − s·sinΔ, s·cosΔ + c·sinΔ), Δ = 2π·df·τ_j, re-seeded with exact trig every
 * 512 frequencies; cos 2x = c² − s², sin 2x = 2cs.
 */
export function periodogramDirect(t: Float64Array, y: Float64Array, dy: Float64Array, opts: PeriodogramOptions = {}): PeriodogramResult {
  const grid = frequencyGrid(t, opts)
  const p = prepare(t, y, dy, opts.jitter ?? 0)
  const power = new Float64Array(grid.count)
  directPowerInto(p, grid, opts.floatingMean ?? true, power)
  return makeResult(grid, power, 'direct', p)
}

/**
 * Direct power on `grid` into `out` (length ≥ grid.count). Per point the state
 * [c, s, cosΔ, sinΔ, w, w·y] sits in one interleaved buffer, and two frequencies are summed per
 * pass over the points (k with (c, s), k+1 with the once-rotated pair) — the same arithmetic as
 * {@link glsPrepared}, arranged for the cache.
 */
export function directPowerInto(p: Prepared, grid: FrequencyGrid, floatingMean: boolean, out: Float64Array): void {
  const { n, tau, w, wy, yy } = p
  const st = directBuffer(n)
  const twoPi = 2 * Math.PI
  const end = 6 * n
  for (let j = 0; j < n; j++) {
    const d = twoPi * grid.df * tau[j]
    st[6 * j + 2] = Math.cos(d); st[6 * j + 3] = Math.sin(d); st[6 * j + 4] = w[j]; st[6 * j + 5] = wy[j]
  }
  const m = grid.count
  for (let k0 = 0; k0 < m; k0 += RESEED) {
    const om0 = twoPi * (grid.f0 + k0 * grid.df)
    for (let j = 0; j < n; j++) {
      const x = om0 * tau[j]
      st[6 * j] = Math.cos(x); st[6 * j + 1] = Math.sin(x)
    }
    const k1 = Math.min(m, k0 + RESEED)
    let k = k0
    for (; k + 1 < k1; k += 2) {
      // sums at frequency k (suffix 0) and k+1 (suffix 1)
      let c0 = 0, s0 = 0, yc0 = 0, ys0 = 0, cc0 = 0, cs0 = 0
      let c1 = 0, s1 = 0, yc1 = 0, ys1 = 0, cc1 = 0, cs1 = 0
      for (let i = 0; i < end; i += 6) {
        const cj = st[i], sj = st[i + 1], ca = st[i + 2], sb = st[i + 3], wj = st[i + 4], wyj = st[i + 5]
        const wc = wj * cj, ws = wj * sj
        c0 += wc; s0 += ws; cc0 += wc * cj - ws * sj; cs0 += wc * sj; yc0 += wyj * cj; ys0 += wyj * sj
        const cn = cj * ca - sj * sb, sn = sj * ca + cj * sb
        const wc1 = wj * cn, ws1 = wj * sn
        c1 += wc1; s1 += ws1; cc1 += wc1 * cn - ws1 * sn; cs1 += wc1 * sn; yc1 += wyj * cn; ys1 += wyj * sn
        st[i] = cn * ca - sn * sb
        st[i + 1] = sn * ca + cn * sb
      }
      out[k] = powerFromSums(c0, s0, yc0, ys0, cc0, 2 * cs0, yy, floatingMean)
      out[k + 1] = powerFromSums(c1, s1, yc1, ys1, cc1, 2 * cs1, yy, floatingMean)
    }
    for (; k < k1; k++) {
      let c0 = 0, s0 = 0, yc0 = 0, ys0 = 0, cc0 = 0, cs0 = 0
      for (let i = 0; i < end; i += 6) {
        const cj = st[i], sj = st[i + 1], ca = st[i + 2], sb = st[i + 3], wj = st[i + 4], wyj = st[i + 5]
        const wc = wj * cj, ws = wj * sj
        c0 += wc; s0 += ws; cc0 += wc * cj - ws * sj; cs0 += wc * sj; yc0 += wyj * cj; ys0 += wyj * sj
        st[i] = cj * ca - sj * sb
        st[i + 1] = sj * ca + cj * sb
      }
      out[k] = powerFromSums(c0, s0, yc0, ys0, cc0, 2 * cs0, yy, floatingMean)
    }
  }
}

// ---------------------------------------------------------------------------------------------
// Fast: extirpolation + FFT

/** Extirpolation order (points per sample) and minimum FFT size / band width of the fast method. */
export interface FastSettings { order: number; fftOversample: number }
/**
 * Defaults measured against the direct sums (the cases of tests/shared/rv/periodogram-fast.spec.ts
 * plus N = 3000, M = 300 000): worst |fast − direct| = 7e-6 of the peak power, at a band edge of
 * a grid whose FFT size is just above 2M; order 16 reached 1.3e-4 there, order 20 about 4e-5.
 */
export const FAST_DEFAULTS: FastSettings = { order: 24, fftOversample: 2 }

const fftCache = new Map<number, FFT>()
function fftOf(size: number): FFT {
  let f = fftCache.get(size)
  if (f === undefined) {
    if (fftCache.size > 6) fftCache.clear()
    f = new FFT(size)
    fftCache.set(size, f)
  }
  return f
}

/** Buffers of the fast method, kept between calls and regrown only when a call needs more. */
interface FastScratch { outLen: number; inLen: number; zy: Float64Array; zw: Float64Array; z2: Float64Array; gy: Float64Array; gw: Float64Array; g2: Float64Array; u: Float64Array; tau: Float64Array }
let fastScratch: FastScratch | null = null
function fastBuffers(size: number, inLen: number, n: number): FastScratch {
  let f = fastScratch
  if (f === null || f.outLen < size || f.inLen < inLen || f.tau.length < n) {
    const outLen = Math.max(size, f?.outLen ?? 0), il = Math.max(inLen, f?.inLen ?? 0)
    f = {
      outLen, inLen: il,
      zy: new Float64Array(2 * outLen), zw: new Float64Array(2 * outLen), z2: new Float64Array(2 * outLen),
      gy: new Float64Array(2 * il), gw: new Float64Array(2 * il), g2: new Float64Array(2 * il), u: new Float64Array(2 * il),
      tau: new Float64Array(Math.max(n, f?.tau.length ?? 0)),
    }
    fastScratch = f
  }
  return f
}

function bitCeil(x: number): number {
  let n = 16
  while (n < x) n *= 2
  return n
}

const lagrangeDenCache = new Map<number, Float64Array>()
/** 1/∏_{k≠j}(j − k) for Lagrange weights on nodes 0…order−1. */
function lagrangeInvDen(order: number): Float64Array {
  let d = lagrangeDenCache.get(order)
  if (d === undefined) {
    d = new Float64Array(order)
    for (let j = 0; j < order; j++) {
      let prod = 1
      for (let k = 0; k < order; k++) if (k !== j) prod *= j - k
      d[j] = 1 / prod
    }
    lagrangeDenCache.set(order, d)
  }
  return d
}

/**
 * Extirpolation (Press & Rybicki 1989, ApJ 338, 277, §II): spreads complex values h_j, sitting at
 * real positions x_j = (scale·τ_j mod size), onto `order` neighbouring grid cells with the
 * Lagrange weights, so that Σ_n g_n e^{2πi q n/size} ≈ Σ_j h_j e^{2πi q x_j/size} for |q| well
 * below size/2. The grid wraps around (the exponentials are periodic in x with period `size`).
 * h_j = amp_j·e^{iφ_j}, φ_j = 2π·shift·τ_j (the band centre, so the FFT only spans the band).
 * Writes one or two series (amp1, amp2 share the positions) into g1, g2 (interleaved re/im).
 */
export function extirpolate(
  tau: Float64Array, scale: number, shift: number, size: number, order: number,
  amp1: Float64Array, g1: Float64Array, amp2: Float64Array | null, g2: Float64Array | null,
): void {
  const inv = lagrangeInvDen(order)
  const wts = new Float64Array(order)
  const mask = size - 1
  const half = (order >> 1) - 1
  const twoPi = 2 * Math.PI
  for (let j = 0, n = tau.length; j < n; j++) {
    const tj = tau[j]
    let x = (scale * tj) % size
    if (x < 0) x += size
    const ix = Math.floor(x)
    const i0 = ix - half
    const u = x - i0
    // Lagrange weights at u on nodes 0…order−1: w_k = inv_k·∏_{i≠k}(u − i), as the products of
    // the factors left of k and right of k (no division, and exact at a node: u = k gives 1 there)
    let left = 1
    for (let k = 0; k < order; k++) { wts[k] = left; left *= u - k }
    let right = 1
    for (let k = order - 1; k >= 0; k--) { wts[k] *= right * inv[k]; right *= u - k }
    // phase of the band centre
    const ph = twoPi * ((shift * tj) % 1)
    const cp = Math.cos(ph), sp = Math.sin(ph)
    const a1 = amp1[j], r1 = a1 * cp, m1 = a1 * sp
    if (amp2 === null || g2 === null) {
      for (let k = 0; k < order; k++) {
        const idx = ((i0 + k) & mask) << 1
        const wk = wts[k]
        g1[idx] += wk * r1; g1[idx + 1] += wk * m1
      }
    } else {
      const a2 = amp2[j], r2 = a2 * cp, m2 = a2 * sp
      for (let k = 0; k < order; k++) {
        const idx = ((i0 + k) & mask) << 1
        const wk = wts[k]
        g1[idx] += wk * r1; g1[idx + 1] += wk * m1
        g2[idx] += wk * r2; g2[idx + 1] += wk * m2
      }
    }
  }
}

/**
 * Fast GLS on the grid: the weighted sums Σw·e^{iωτ}, Σw(y−ȳ)·e^{iωτ} and Σw·e^{2iωτ} for all grid
 * frequencies at once by extirpolation onto a regular grid and an FFT (Press & Rybicki 1989,
 * ApJ 338, 277), then the power of Zechmeister & Kürster 2009, eq. 5. Each series is shifted to
 * the centre of its band so the FFT spans only the band (|q| ≤ M/2), and the FFT, whose input
 * fills only its first size·df·T cells, is done as several short ones. Within 1e-4 of the direct
 * power's peak everywhere on the grid (tested; 7e-6 measured at worst).
 */
export function periodogramFast(
  t: Float64Array, y: Float64Array, dy: Float64Array, opts: PeriodogramOptions & { fast?: Partial<FastSettings> } = {},
): PeriodogramResult {
  const grid = frequencyGrid(t, opts)
  const p = prepare(t, y, dy, opts.jitter ?? 0)
  const power = new Float64Array(grid.count)
  fastPowerInto(p, grid, opts.floatingMean ?? true, power, { ...FAST_DEFAULTS, ...opts.fast })
  return makeResult(grid, power, 'fast', p)
}

/**
 * Length-`size` forward DFT F[p] = Σ_{n<len} g_n e^{−2πi p n/size} of an input that is zero beyond
 * `len` = size/r: as r transforms of length `len` (p = a·r + b: the b-th one transforms
 * g_n·e^{−2πi b n/size}). Result b·len + a holds F[a·r + b]; with r = 1 this is the plain FFT.
 * The extirpolated sums fill only the first size·df·T cells, so for oversampled grids this is
 * several times quicker than one long FFT.
 */
function sparseInputDft(g: Float64Array, len: number, size: number, out: Float64Array, u: Float64Array): void {
  const r = size / len
  const fft = fftOf(len)
  if (r === 1) { fft.transform(out, g.subarray(0, 2 * len)); return }
  const uu = u.subarray(0, 2 * len)
  for (let b = 0; b < r; b++) {
    const step = -2 * Math.PI * b / size
    const sc = Math.cos(step), ss = Math.sin(step)
    for (let n0 = 0; n0 < len; n0 += 128) {
      // exact twiddle every 128 cells, rotation in between
      let wr = Math.cos(step * n0), wi = Math.sin(step * n0)
      for (let n = n0, n1 = Math.min(len, n0 + 128); n < n1; n++) {
        const gr = g[2 * n], gi = g[2 * n + 1]
        uu[2 * n] = gr * wr - gi * wi
        uu[2 * n + 1] = gr * wi + gi * wr
        const t = wr * sc - wi * ss
        wi = wr * ss + wi * sc
        wr = t
      }
    }
    fft.transform(out.subarray(2 * b * len, 2 * (b + 1) * len), uu)
  }
}

/**
 * Fast power on `grid` into `out`: the band by extirpolation + FFT ({@link fastBandInto}), then
 * its ends redone more accurately ({@link refineEnds}).
 */
export function fastPowerInto(p: Prepared, grid: FrequencyGrid, floatingMean: boolean, out: Float64Array, settings: FastSettings = FAST_DEFAULTS): void {
  fastBandInto(p, grid, floatingMean, out, settings)
  refineEnds(p, grid, floatingMean, out, settings)
}

/** Extirpolated + FFT power on every point of `grid` into `out` (least accurate at the band's ends). */
function fastBandInto(p: Prepared, grid: FrequencyGrid, floatingMean: boolean, out: Float64Array, settings: FastSettings): void {
  const { order, fftOversample } = settings
  if (!(Number.isInteger(order) && order >= 2 && order % 2 === 0 && order <= 32)) throw new RangeError(`fast.order must be an even integer in 2…32 (got ${order})`)
  if (!(fftOversample >= 1)) throw new RangeError(`fast.fftOversample must be >= 1 (got ${fftOversample})`)
  const m = grid.count, n = p.n
  const size = bitCeil(Math.max(fftOversample * m, 2 * order))
  const mask = size - 1
  const kc = m >> 1
  const fc = grid.f0 + kc * grid.df
  const half = (order >> 1) - 1
  // Shift the time origin so every extirpolation node is ≥ 0 (the power does not depend on the
  // origin); then the ω sums fill cells [0, lenW) and the 2ω sums [0, len2).
  const delta = (half + 2) / (size * grid.df)
  let tmax = 0
  for (let j = 0; j < n; j++) if (p.tau[j] > tmax) tmax = p.tau[j]
  const span = size * grid.df * (tmax + delta)
  let lenW = bitCeil(Math.ceil(span) + order + 2), len2 = bitCeil(Math.ceil(2 * span) + order + 2)
  if (lenW > size / 2) lenW = size
  if (len2 > size / 2) len2 = size
  const bufs = fastBuffers(size, Math.max(lenW, len2), n)
  const tau = bufs.tau
  for (let j = 0; j < n; j++) tau[j] = p.tau[j] + delta
  const tauN = tau.subarray(0, n)
  bufs.gy.fill(0, 0, 2 * lenW); bufs.g2.fill(0, 0, 2 * len2)
  if (floatingMean) {
    bufs.gw.fill(0, 0, 2 * lenW)
    extirpolate(tauN, size * grid.df, fc, size, order, p.wy, bufs.gy, p.w, bufs.gw)
  } else {
    extirpolate(tauN, size * grid.df, fc, size, order, p.wy, bufs.gy, null, null)
  }
  extirpolate(tauN, 2 * size * grid.df, 2 * fc, size, order, p.w, bufs.g2, null, null)
  sparseInputDft(bufs.gy, lenW, size, bufs.zy, bufs.u)
  if (floatingMean) sparseInputDft(bufs.gw, lenW, size, bufs.zw, bufs.u)
  sparseInputDft(bufs.g2, len2, size, bufs.z2, bufs.u)
  const zy = bufs.zy, zw = bufs.zw, z2 = bufs.z2
  const rW = size / lenW, rmW = rW - 1, shW = Math.log2(rW)
  const r2 = size / len2, rm2 = r2 - 1, sh2 = Math.log2(r2)
  const yy = p.yy
  // F[r] = Σ g_n e^{−2πi r n/size}; the sum at q = k − kc is F[(−q) mod size], stored at
  // (idx mod r)·len + idx/r
  for (let k = 0; k < m; k++) {
    const idx = (kc - k) & mask
    const iw = ((idx & rmW) * lenW + (idx >>> shW)) << 1
    const i2 = ((idx & rm2) * len2 + (idx >>> sh2)) << 1
    const c = floatingMean ? zw[iw] : 0, s = floatingMean ? zw[iw + 1] : 0
    out[k] = powerFromSums(c, s, zy[iw], zy[iw + 1], z2[i2], z2[i2 + 1], yy, floatingMean)
  }
}

/** Grid points at each end of the band redone by {@link refineEnds}. */
const EDGE_POINTS = 48
/**
 * FFT oversampling of the pass that redoes the ends. The extirpolation's error grows with the
 * phase step per cell, at most π/(2·fftOversample) inside the band; at 16 instead of 2 it is
 * below rounding (measured: tests/shared/rv/periodogram-fast.spec.ts).
 */
const REFINE_OVERSAMPLE = 16

/**
 * Redoes the points where the band's extirpolated sums are not accurate enough: the EDGE_POINTS
 * at each end of the band, where the interpolation error of the band-centred FFT is largest, and
 * frequencies below 2/baseline, where the columns cos ωτ, sin ωτ and the mean are nearly
 * collinear (D = CC·SS − CS² ≈ 0) and amplify small errors of the sums. Without this step,
 * measured on the default 0.5 d – 5× baseline grid: 1.3e-3 of the peak at f = 1/(5·baseline)
 * and 2e-4 at the top edge, below 1e-5 elsewhere. Each end is a sub-band of its own, centred on
 * itself: the exact sums ({@link directPowerInto}) when they are cheaper, otherwise a fast pass
 * oversampled REFINE_OVERSAMPLE times, whose phase steps are small enough that its error is
 * rounding. (At N = 10⁵ and a 10⁶-point grid over a 1000-d baseline, the low end holds ~1100
 * frequencies: exactly, 1.1·10⁸ point-frequency terms, 4× the rest of the periodogram.)
 */
function refineEnds(p: Prepared, grid: FrequencyGrid, floatingMean: boolean, out: Float64Array, settings: FastSettings): void {
  const m = grid.count
  const lowEnd = p.baseline > 0 ? Math.ceil((2 / p.baseline - grid.f0) / grid.df) : 0
  const first = Math.min(m, Math.max(EDGE_POINTS, lowEnd))
  refineBand(p, grid, 0, first, floatingMean, out, settings)
  refineBand(p, grid, Math.max(first, m - EDGE_POINTS), m, floatingMean, out, settings)
}

/** Recomputes out[k0…k1) as a band of its own (see {@link refineEnds}). */
function refineBand(p: Prepared, grid: FrequencyGrid, k0: number, k1: number, floatingMean: boolean, out: Float64Array, settings: FastSettings): void {
  const count = k1 - k0
  if (count <= 0) return
  const sub: FrequencyGrid = { f0: grid.f0 + k0 * grid.df, df: grid.df, count }
  const part = out.subarray(k0, k1)
  const cost = estimateCostNs(p.n, count, REFINE_OVERSAMPLE)
  if (cost.direct <= cost.fast) directPowerInto(p, sub, floatingMean, part)
  else fastBandInto(p, sub, floatingMean, part, { order: settings.order, fftOversample: REFINE_OVERSAMPLE })
}

// ---------------------------------------------------------------------------------------------
// Either

/**
 * Rough cost in ns of each method on this machine (Node 20, measured: direct ≈ 3.5 ns per
 * point·frequency; one complex FFT of size S ≈ 1.5–2·S·log2 S ns; extirpolation ≈ 150 ns per point).
 * `fftOversample` is the fast method's (the pass that redoes a band's ends uses a larger one).
 */
export function estimateCostNs(n: number, m: number, fftOversample = FAST_DEFAULTS.fftOversample): { direct: number; fast: number } {
  const size = bitCeil(Math.max(fftOversample * m, 2 * FAST_DEFAULTS.order))
  return {
    direct: 3.5 * n * m + 15 * m,
    fast: 3 * 2 * size * Math.log2(size) + 150 * n + 20 * m,
  }
}

/** Which method `auto` chooses for N points and M frequencies: the cheaper by {@link estimateCostNs}. */
export function chooseMethod(n: number, m: number, method: PeriodogramOptions['method'] = 'auto'): 'direct' | 'fast' {
  if (method === 'direct' || method === 'fast') return method
  if (method !== 'auto') throw new RangeError(`method must be 'auto', 'direct' or 'fast' (got ${String(method)})`)
  const c = estimateCostNs(n, m)
  return c.direct <= c.fast ? 'direct' : 'fast'
}

/** Frees the buffers the direct and fast methods keep between calls (up to 4·2·2^21 doubles after M = 10⁶). */
export function releasePeriodogramBuffers(): void {
  directScratch = null
  fastScratch = null
  fftCache.clear()
}

/**
 * GLS periodogram (Zechmeister & Kürster 2009) of velocities y ± dy at times t (days) on the
 * default or requested grid (VanderPlas 2018 §7.1). `method: 'auto'` uses the exact direct sums
 * or the fast one (Press & Rybicki 1989), whichever {@link estimateCostNs} says is cheaper.
 */
export function periodogram(t: Float64Array, y: Float64Array, dy: Float64Array, opts: PeriodogramOptions = {}): PeriodogramResult {
  const grid = frequencyGrid(t, opts)
  const p = prepare(t, y, dy, opts.jitter ?? 0)
  const method = chooseMethod(p.n, grid.count, opts.method)
  const power = new Float64Array(grid.count)
  if (method === 'direct') directPowerInto(p, grid, opts.floatingMean ?? true, power)
  else fastPowerInto(p, grid, opts.floatingMean ?? true, power)
  return makeResult(grid, power, method, p)
}

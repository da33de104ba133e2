/**
 * Keplerian (eccentric) periodogram with a free offset per instrument at every trial period.
 *
 * At fixed period P, eccentricity e and time of periastron Tp the velocity model
 *   K[cos(ν+ω) + e cos ω] + γ_k = (K cos ω)(cos ν + e) − (K sin ω) sin ν + γ_k
 * is linear in K cos ω, K sin ω and the offsets γ_k (Zechmeister & Kürster 2009, A&A 496, 577, §4;
 * O'Toole et al. 2009, MNRAS 392, 641, the "2DKLS"). So a grid over (e, Tp) with a weighted
 * linear least-squares solve at each cell is exact at the cell, and the best cell per period is
 * the statistic: Δχ²(P) = χ²(offsets only) − min over cells χ²(cell). With e = 0 alone it is the
 * generalised Lomb–Scargle power with one mean per instrument.
 *
 * The offsets are profiled out analytically: with the data centred per instrument (weighted), the
 * columns' own per-instrument weighted means are subtracted through their sums, so a cell costs
 * one pass over the points with two table look-ups (the shapes cos ν + e and sin ν on a fine grid
 * of mean anomaly for each e, linearly interpolated) and nine sums.
 *
 * Which eccentricities are tried depends on the period: short-period orbits are circularised by
 * tides, so e = 0.3 is tried from 5 d and e ≥ 0.6 from 10 d (common practice; the thresholds are in
 * {@link KEPLERIAN_PERIODOGRAM_DEFAULTS} and reported with the result). The eccentric cells sit on a
 * finer period grid (`substeps` per grid step): near periastron an eccentric orbit changes fast, so
 * a small period error over the baseline misaligns the periastron passages.
 *
 * `keplerianPeriodogramDirect` is the readable reference: exact Kepler solutions and a full normal-
 * equation solve at every cell; the fast one is tested against it. The fast one's table positions and
 * cells run in WebAssembly (keplerian-wasm.ts, f64x2 SIMD) where available, with the arithmetic of the
 * TypeScript `positions` and `bestAtFrequency` below (same results to the last bit, tested).
 */
import { checkRvData, type RvData } from '../orbit-data.ts'
import { solveKepler } from '../kepler.ts'
import { defaultMinPeriod, defaultMaxPeriod } from '../periodogram-core.ts'
import { cholesky, choleskySolve } from '../linalg.ts'
import { keplerianWasm } from './keplerian-wasm.ts'

const TWO_PI = 2 * Math.PI

/**
 * One eccentricity of the cell grid: e, periastron phases tried, the shortest period it is tried at
 * (d), and how many sub-steps of the period grid it uses.
 */
export interface EccentricityCell { e: number; phases: number; minPeriod: number; substeps: number }

export interface KeplerianPeriodogramOptions {
  /** Shortest period (d); default as the GLS grid ({@link defaultMinPeriod}). */
  minPeriod?: number
  /** Longest period (d); default 5× the baseline ({@link defaultMaxPeriod}). */
  maxPeriod?: number
  /** Frequency step 1/(oversample·baseline) (default 3). */
  oversample?: number
  /** Jitter per instrument added to the errors in quadrature (m/s, default 0: the quoted errors). */
  jitter?: ArrayLike<number>
  /** The eccentricity cells (default {@link KEPLERIAN_PERIODOGRAM_DEFAULTS}.cells). */
  cells?: readonly EccentricityCell[]
}

/** Defaults of the Keplerian periodogram (see the module comment). Phases are powers of two. */
export const KEPLERIAN_PERIODOGRAM_DEFAULTS = Object.freeze({
  oversample: 3,
  cells: Object.freeze([
    { e: 0, phases: 1, minPeriod: 0, substeps: 1 },
    { e: 0.3, phases: 8, minPeriod: 5, substeps: 1 },
    { e: 0.6, phases: 16, minPeriod: 10, substeps: 1 },
    { e: 0.85, phases: 32, minPeriod: 10, substeps: 1 },
  ] as EccentricityCell[]),
})

export interface KeplerianPeriodogramResult {
  /** Trial frequencies (1/d), ascending, and their periods. */
  frequency: Float64Array
  period: Float64Array
  /** χ²(offsets only) − χ²(best cell) at each period. */
  dchi2: Float64Array
  /** dchi2 / χ²(offsets only), 0…1. */
  power: Float64Array
  /** Eccentricity, time of periastron (full JD) and frequency of the best cell at each period. */
  bestE: Float64Array
  bestTp: Float64Array
  bestFrequency: Float64Array
  /** χ² of the offsets-only model with these weights. */
  chi2Null: number
  nPoints: number
  baseline: number
  cells: readonly EccentricityCell[]
}

interface Setup {
  n: number; nInst: number; tau: Float64Array; w: Float64Array; r: Float64Array; inst: Int32Array
  wInst: Float64Array; chi2Null: number; tmin: number; baseline: number
  /** The same points grouped by instrument: instrument k holds rows segStart[k] … segStart[k+1]−1. */
  sorted: { tau: Float64Array; w: Float64Array; r: Float64Array; segStart: Int32Array }
}

/** Weights, per-instrument weighted centring of y, χ² of the offsets-only model. */
function setup(data: RvData, y: ArrayLike<number>, jitter?: ArrayLike<number>): Setup {
  checkRvData(data)
  const n = data.t.length, nInst = data.instrumentNames.length
  if (y.length !== n) throw new RangeError(`y has ${y.length} values but the data have ${n}`)
  if (jitter && jitter.length !== nInst) throw new RangeError(`jitter must have one value per instrument (${nInst})`)
  let tmin = Infinity, tmax = -Infinity
  for (let i = 0; i < n; i++) { tmin = Math.min(tmin, data.t[i]); tmax = Math.max(tmax, data.t[i]) }
  const w = new Float64Array(n), tau = new Float64Array(n), r = new Float64Array(n)
  const wInst = new Float64Array(nInst), wy = new Float64Array(nInst)
  for (let i = 0; i < n; i++) {
    const s = jitter ? jitter[data.instrument[i]] : 0
    const v = data.dy[i] * data.dy[i] + s * s
    if (!(v > 0)) throw new RangeError(`dy[${i}] is 0 and there is no jitter: the weight would be infinite`)
    w[i] = 1 / v
    tau[i] = data.t[i] - tmin
    wInst[data.instrument[i]] += w[i]; wy[data.instrument[i]] += w[i] * y[i]
  }
  let chi2Null = 0
  for (let i = 0; i < n; i++) {
    const k = data.instrument[i]
    r[i] = y[i] - (wInst[k] > 0 ? wy[k] / wInst[k] : 0)
    chi2Null += w[i] * r[i] * r[i]
  }
  // points grouped by instrument, so the per-instrument sums of a cell run over contiguous segments
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => data.instrument[a] - data.instrument[b] || a - b)
  const segStart = new Int32Array(nInst + 1)
  for (let i = 0; i < n; i++) segStart[data.instrument[i] + 1]++
  for (let k = 0; k < nInst; k++) segStart[k + 1] += segStart[k]
  const pick = (a: Float64Array): Float64Array => Float64Array.from(order, (i) => a[i])
  return {
    n, nInst, tau, w, r, inst: Int32Array.from(data.instrument), wInst, chi2Null, tmin, baseline: tmax - tmin,
    sorted: { tau: pick(tau), w: pick(w), r: pick(r), segStart },
  }
}

/** Frequencies from 1/maxPeriod to 1/minPeriod in steps of 1/(oversample·baseline). */
function grid(t: Float64Array, baseline: number, opts: KeplerianPeriodogramOptions): Float64Array {
  if (!(baseline > 0)) throw new RangeError('the data must span a baseline > 0')
  const minP = opts.minPeriod ?? defaultMinPeriod(t)
  const maxP = opts.maxPeriod ?? defaultMaxPeriod(baseline)
  const os = opts.oversample ?? KEPLERIAN_PERIODOGRAM_DEFAULTS.oversample
  if (!(minP > 0)) throw new RangeError(`minPeriod must be > 0 (got ${minP})`)
  if (!(maxP > minP)) throw new RangeError(`maxPeriod (${maxP}) must exceed minPeriod (${minP})`)
  if (!(os > 0)) throw new RangeError(`oversample must be > 0 (got ${os})`)
  const f0 = 1 / maxP, f1 = 1 / minP, df = 1 / (os * baseline)
  const m = Math.floor((f1 - f0) / df * (1 + 1e-12)) + 1
  if (m > 2_000_000) throw new RangeError(`the Keplerian periodogram grid would have ${m} periods; raise minPeriod or lower oversample`)
  const f = new Float64Array(m)
  for (let k = 0; k < m; k++) f[k] = f0 + k * df
  return f
}

function makeResult(freq: Float64Array, s: Setup, cells: readonly EccentricityCell[]): KeplerianPeriodogramResult {
  const m = freq.length
  return {
    frequency: freq, period: freq.map((f) => 1 / f), dchi2: new Float64Array(m), power: new Float64Array(m),
    bestE: new Float64Array(m), bestTp: new Float64Array(m), bestFrequency: Float64Array.from(freq),
    chi2Null: s.chi2Null, nPoints: s.n, baseline: s.baseline, cells,
  }
}

function checkCells(cells: readonly EccentricityCell[]): void {
  for (const c of cells) {
    if (!(c.e >= 0 && c.e < 0.99)) throw new RangeError(`cell eccentricity must be in [0, 0.99) (got ${c.e})`)
    if (!(Number.isInteger(c.phases) && c.phases >= 1 && (c.phases & (c.phases - 1)) === 0 && c.phases <= 256)) {
      throw new RangeError(`cell phases must be a power of two up to 256 (got ${c.phases})`)
    }
    if (!(Number.isInteger(c.substeps) && c.substeps >= 1 && c.substeps <= 16)) throw new RangeError(`cell substeps must be an integer in 1…16 (got ${c.substeps})`)
  }
}

/** Shape columns of the model at mean anomaly M: cos ν + e and sin ν. */
function shapes(M: number, e: number): [number, number] {
  if (e === 0) return [Math.cos(M), Math.sin(M)]
  const E = solveKepler(M, e)
  const den = 1 - e * Math.cos(E)
  return [(Math.cos(E) - e) / den + e, Math.sqrt(1 - e * e) * Math.sin(E) / den]
}

// ---------------------------------------------------------------------------------------------
// Fast: tabulated shapes, offsets profiled through sums

/** Table size over one orbit (power of two, divisible by every phase count). */
const TABLE = 4096
/**
 * Per eccentricity: [A_0, B_0, A_1, B_1, …, A_TABLE, B_TABLE] with A = cos ν + e, B = sin ν at M = 2πj/TABLE,
 * in single precision: the table then fits a core's 32-kB first-level cache (about 27 % less time at
 * N = 2000), and its rounding (6e-8) is far below the linear interpolation's own error; the sums stay
 * in double precision.
 */
const tables = new Map<number, Float32Array>()
function tableOf(e: number): Float32Array {
  let t = tables.get(e)
  if (!t) {
    t = new Float32Array(2 * (TABLE + 1))
    for (let j = 0; j <= TABLE; j++) { const [x, y] = shapes(TWO_PI * j / TABLE, e); t[2 * j] = x; t[2 * j + 1] = y }
    if (tables.size > 16) tables.clear()
    tables.set(e, t)
  }
  return t
}

/** Table positions of the points at frequency f: frac(τ f) × TABLE, into `x` (the same for every cell at f). */
function positions(s: Setup, f: number, x: Float64Array): void {
  const { tau } = s.sorted
  for (let i = 0; i < s.n; i++) { const u = tau[i] * f; x[i] = (u - Math.floor(u)) * TABLE }
}

/**
 * Best Δχ² over the cells of one eccentricity at frequency f. `x` holds the table positions at f
 * ({@link positions}). Returns [Δχ², best phase index].
 */
function bestAtFrequency(s: Setup, cell: EccentricityCell, x: Float64Array): [number, number] {
  const { nInst, wInst } = s
  const { w, r, segStart } = s.sorted
  const tab = tableOf(cell.e)
  let best = 0, bestPh = 0
  const step = TABLE / cell.phases
  const mask = TABLE - 1
  for (let ph = 0; ph < cell.phases; ph++) {
    const shift = TABLE - ph * step
    let aa = 0, ab = 0, bb = 0, ar = 0, br = 0
    for (let k = 0; k < nInst; k++) {
      let sa = 0, sb = 0
      for (let i = segStart[k], end = segStart[k + 1]; i < end; i++) {
        const xi = x[i]
        const i0 = xi | 0
        const fr = xi - i0
        const j = ((i0 + shift) & mask) << 1
        const a0 = tab[j], b0 = tab[j + 1]
        const A = a0 + fr * (tab[j + 2] - a0)
        const B = b0 + fr * (tab[j + 3] - b0)
        const wi = w[i], wA = wi * A, wB = wi * B, ri = r[i]
        sa += wA; sb += wB
        aa += wA * A; ab += wA * B; bb += wB * B; ar += wA * ri; br += wB * ri
      }
      const W = wInst[k]
      if (W > 0) { aa -= sa * sa / W; ab -= sa * sb / W; bb -= sb * sb / W }
    }
    const det = aa * bb - ab * ab
    if (!(det > 1e-12 * (aa * bb))) {
      // degenerate pair (e.g. one column constant on the data): best single column
      const d1 = aa > 0 ? ar * ar / aa : 0, d2 = bb > 0 ? br * br / bb : 0
      const d = Math.max(d1, d2)
      if (d > best) { best = d; bestPh = ph }
      continue
    }
    const d = (bb * ar * ar - 2 * ab * ar * br + aa * br * br) / det
    if (d > best) { best = d; bestPh = ph }
  }
  return [best, bestPh]
}

/** Time of periastron (full JD) of phase cell `ph` of `phases` at frequency f. */
function tpOf(s: Setup, f: number, ph: number, phases: number): number {
  // the table is read at M/2π = frac(τ f) − ph/phases, so periastron (M = 0) is at τ = ph/(phases f)
  return s.tmin + ph / (phases * f)
}

/** Positions and best cell at a frequency: the WebAssembly kernel or the TypeScript code above. */
interface CellScan {
  positions(f: number): void
  /** Best Δχ² of cell `c` (index into the cells) at the last positions, its phase in `phase()`. */
  best(c: number): number
  phase(): number
}

function typeScriptScan(s: Setup, cells: readonly EccentricityCell[]): CellScan {
  const x = new Float64Array(s.n)
  let ph = 0
  return {
    positions: (f) => positions(s, f, x),
    best: (c) => { const [d, p] = bestAtFrequency(s, cells[c], x); ph = p; return d },
    phase: () => ph,
  }
}

function scan(s: Setup, freq: Float64Array, cells: readonly EccentricityCell[], out: KeplerianPeriodogramResult, cs: CellScan): void {
  const df = freq.length > 1 ? freq[1] - freq[0] : 0
  for (let k = 0; k < freq.length; k++) {
    const f0 = freq[k], P = 1 / f0
    let best = 0, bE = 0, bTp = s.tmin, bF = f0
    let xAt = NaN // frequency whose positions the scan holds
    for (let ci = 0; ci < cells.length; ci++) {
      const c = cells[ci]
      if (P < c.minPeriod) continue
      const steps = c.substeps
      for (let j = 0; j < steps; j++) {
        const f = steps === 1 ? f0 : f0 + df * ((j + 0.5) / steps - 0.5)
        if (!(f > 0)) continue
        if (f !== xAt) { cs.positions(f); xAt = f }
        const d = cs.best(ci)
        if (d > best) { best = d; bE = c.e; bTp = tpOf(s, f, cs.phase(), c.phases); bF = f }
      }
    }
    out.dchi2[k] = best; out.power[k] = s.chi2Null > 0 ? best / s.chi2Null : 0
    out.bestE[k] = bE; out.bestTp[k] = bTp; out.bestFrequency[k] = bF
  }
}

function fast(data: RvData, opts: KeplerianPeriodogramOptions & { y?: ArrayLike<number> }, useWasm: boolean): KeplerianPeriodogramResult {
  const s = setup(data, opts.y ?? data.y, opts.jitter)
  const cells = opts.cells ?? KEPLERIAN_PERIODOGRAM_DEFAULTS.cells
  checkCells(cells)
  const freq = grid(data.t, s.baseline, opts)
  const out = makeResult(freq, s, cells)
  const wasm = useWasm ? keplerianWasm({ ...s.sorted, wInst: s.wInst }, cells.map((c) => tableOf(c.e))) : null
  if (wasm) {
    try {
      scan(s, freq, cells, out, { positions: wasm.positions, best: (c) => wasm.cell(c, cells[c].phases), phase: wasm.phase })
    } finally {
      wasm.close()
    }
  } else scan(s, freq, cells, out, typeScriptScan(s, cells))
  return out
}

/**
 * Keplerian periodogram of `y` (default: the data's velocities; the search passes them minus the
 * planets already found) with a free offset per instrument at every period; see the module comment.
 * The table look-ups and sums run in WebAssembly (keplerian-wasm.ts) where it is available, with the
 * same arithmetic as {@link keplerianPeriodogramTypeScript}.
 */
export function keplerianPeriodogram(data: RvData, opts: KeplerianPeriodogramOptions & { y?: ArrayLike<number> } = {}): KeplerianPeriodogramResult {
  return fast(data, opts, true)
}

/** {@link keplerianPeriodogram} without WebAssembly: the fallback, and the kernel's reference in the tests. */
export function keplerianPeriodogramTypeScript(data: RvData, opts: KeplerianPeriodogramOptions & { y?: ArrayLike<number> } = {}): KeplerianPeriodogramResult {
  return fast(data, opts, false)
}

// ---------------------------------------------------------------------------------------------
// Direct reference

/**
 * The readable reference: at every period and cell, exact Kepler solutions and the full weighted
 * least-squares solve of [cos ν + e, sin ν, one indicator per instrument] by normal equations.
 * Same grid and cells as {@link keplerianPeriodogram}.
 */
export function keplerianPeriodogramDirect(data: RvData, opts: KeplerianPeriodogramOptions & { y?: ArrayLike<number> } = {}): KeplerianPeriodogramResult {
  const y = opts.y ?? data.y
  const s = setup(data, y, opts.jitter)
  const cells = opts.cells ?? KEPLERIAN_PERIODOGRAM_DEFAULTS.cells
  checkCells(cells)
  const freq = grid(data.t, s.baseline, opts)
  const out = makeResult(freq, s, cells)
  const { n, nInst } = s
  const p = 2 + nInst
  const chi2Of = (f: number, e: number, tp: number): number => {
    const A = new Float64Array(p * p), b = new Float64Array(p), row = new Float64Array(p)
    let yy = 0
    for (let i = 0; i < n; i++) {
      const [ca, cb] = shapes(TWO_PI * f * (data.t[i] - tp), e)
      row.fill(0); row[0] = ca; row[1] = cb; row[2 + data.instrument[i]] = 1
      const wi = s.w[i]
      yy += wi * y[i] * y[i]
      for (let u = 0; u < p; u++) { b[u] += wi * row[u] * y[i]; for (let v = 0; v < p; v++) A[u * p + v] += wi * row[u] * row[v] }
    }
    if (!cholesky(A, p)) return s.chi2Null
    const c = Float64Array.from(b)
    choleskySolve(A, p, c)
    let chi2 = yy
    for (let u = 0; u < p; u++) chi2 -= b[u] * c[u]
    return chi2
  }
  const df = freq.length > 1 ? freq[1] - freq[0] : 0
  for (let k = 0; k < freq.length; k++) {
    const f0 = freq[k], P = 1 / f0
    let best = 0, bE = 0, bTp = s.tmin, bF = f0
    for (const c of cells) {
      if (P < c.minPeriod) continue
      const steps = c.substeps
      for (let j = 0; j < steps; j++) {
        const f = steps === 1 ? f0 : f0 + df * ((j + 0.5) / steps - 0.5)
        for (let ph = 0; ph < c.phases; ph++) {
          const tp = tpOf(s, f, ph, c.phases)
          const d = s.chi2Null - chi2Of(f, c.e, tp)
          if (d > best) { best = d; bE = c.e; bTp = tp; bF = f }
        }
      }
    }
    out.dchi2[k] = best; out.power[k] = s.chi2Null > 0 ? best / s.chi2Null : 0
    out.bestE[k] = bE; out.bestTp[k] = bTp; out.bestFrequency[k] = bF
  }
  return out
}

/** A local maximum of the Keplerian periodogram. */
export interface KeplerianPeak { period: number; frequency: number; dchi2: number; e: number; tp: number; index: number }

/**
 * The `count` highest local maxima of Δχ², at least `minSeparation` grid steps apart (side lobes
 * of one peak closer than that are merged into it), highest first.
 */
export function keplerianPeaks(r: KeplerianPeriodogramResult, count: number, minSeparation = 3): KeplerianPeak[] {
  const m = r.dchi2.length
  const idx: number[] = []
  for (let k = 0; k < m; k++) {
    const v = r.dchi2[k]
    if ((k > 0 && v < r.dchi2[k - 1]) || (k < m - 1 && v < r.dchi2[k + 1])) continue
    if (k > 0 && v === r.dchi2[k - 1]) continue
    idx.push(k)
  }
  idx.sort((a, b) => r.dchi2[b] - r.dchi2[a])
  const out: KeplerianPeak[] = []
  for (const k of idx) {
    if (out.length >= count) break
    if (out.some((o) => Math.abs(o.index - k) < minSeparation)) continue
    out.push({ period: 1 / r.bestFrequency[k], frequency: r.bestFrequency[k], dchi2: r.dchi2[k], e: r.bestE[k], tp: r.bestTp[k], index: k })
  }
  return out
}

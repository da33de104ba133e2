/**
 * Independent ensembles of one posterior merged into one chain, and the convergence rule across
 * them (the parallel mode of a sampling run: K ensembles of the same sampler from different seeds,
 * each on its own worker).
 *
 * Each ensemble's kept rows (every row its `ChainStore` ever kept, as its append-only checkpoints
 * hold them) are replayed into a store of the same capacity; the merged chain takes every
 * ensemble's rows at the steps k, 2k, … ≤ S, with S the fewest steps any ensemble has done and k
 * the coarsest thinning among them (every thinning is thin·2^j, so each ensemble holds those
 * steps). Walker j of ensemble i becomes walker j·K + i, so "walker w mod K" is its ensemble.
 *
 * The rule (the same thresholds as a single run, `mcmc.ts`):
 * - τ per coordinate from the walker-averaged autocorrelation of all K·W walkers after the burn-in
 *   (a quarter of S unless given), × the thinning (Foreman-Mackey et al. 2013, PASP 125, 306);
 *   the pooled length K·(S − burn) must exceed 50 τ: K ensembles of N steps hold as many
 *   independent draws as one of K·N steps;
 * - rank-normalised split-R̂ with the K ensembles as the chains (each split in halves: 2K chains;
 *   Vehtari et al. 2021, Bayesian Analysis 16, 667) below 1.01: ensembles started from their own
 *   seeds that agree have found the same posterior.
 */
import { ChainStore, type ChainRows } from './chain-store.ts'
import { integratedTime, splitRhat } from './diagnostics.ts'
import { DEFAULT_KEPT_ROWS, MAX_RHAT, MIN_N_OVER_TAU } from './mcmc.ts'

export interface MergeOptions {
  /** Walkers of each ensemble and sampled coordinates. */
  nWalkers: number
  nDim: number
  /** Thinning the runs started with (their `thin`, default 1) and rows of their kept copy (default 1024). */
  thin?: number
  keptRows?: number
  /** Steps dropped at the start; default a quarter of the common steps. */
  burn?: number | null
}

export interface MergedChain {
  nEnsembles: number
  /** Walkers in all (K × walkers of one ensemble) and coordinates. */
  nWalkers: number
  nDim: number
  /** Common steps (a multiple of `thin`), the thinning of the merged rows, the burn-in used. */
  step: number
  thin: number
  burn: number
  /** Index of the first row after the burn-in. */
  from: number
  /** rows × nWalkers × nDim (walker j of ensemble i at j·K + i), rows × nWalkers ln p. */
  rows: ChainRows
  /** Steps after burn-in summed over the ensembles. */
  pooledSteps: number
  tau: number[]
  nOverTau: number[]
  rhat: number[]
  /** Every coordinate passes both parts of the rule. */
  passed: boolean
}

/** Replays one ensemble's rows (in the order they were kept) into a store of its capacity. */
function storeOf(rows: ChainRows, o: Required<Pick<MergeOptions, 'nWalkers' | 'nDim'>> & { thin: number; keptRows: number }): ChainStore {
  const st = new ChainStore(o.nWalkers, o.nDim, { capacity: o.keptRows, thin: o.thin })
  st.replay(rows)
  return st
}

/**
 * Merges K ≥ 2 ensembles (each one's rows in the order they were kept) and applies the rule.
 * Throws a RangeError when the rows do not match the shape.
 */
export function mergeEnsembles(parts: ChainRows[], opts: MergeOptions): MergedChain {
  const K = parts.length
  if (K < 2) throw new RangeError(`mergeEnsembles needs at least 2 ensembles, got ${K}`)
  const W = opts.nWalkers, D = opts.nDim
  const o = { nWalkers: W, nDim: D, thin: opts.thin ?? 1, keptRows: opts.keptRows ?? DEFAULT_KEPT_ROWS }
  const stores = parts.map((p) => storeOf(p, o))
  const S0 = Math.min(...stores.map((s) => s.lastStep()))
  const thin = Math.max(...stores.map((s) => s.thin))
  const step = Math.floor(S0 / thin) * thin
  const nRows = step / thin
  const WK = W * K
  const rows: ChainRows = { steps: new Int32Array(nRows), chain: new Float64Array(nRows * WK * D), lnProb: new Float64Array(nRows * WK) }
  stores.forEach((st, i) => {
    const v = st.view()
    let r = 0
    for (let q = 0; q < st.rows && r < nRows; q++) {
      const s = v.steps[q]!
      if (s % thin !== 0) continue
      if (s !== (r + 1) * thin) throw new RangeError(`ensemble ${i + 1} lacks step ${(r + 1) * thin} (has ${s})`)
      rows.steps[r] = s
      for (let j = 0; j < W; j++) {
        const w = j * K + i
        rows.chain.set(v.chain.subarray((q * W + j) * D, (q * W + j + 1) * D), (r * WK + w) * D)
        rows.lnProb[r * WK + w] = v.lnProb[q * W + j]!
      }
      r++
    }
    if (r !== nRows) throw new RangeError(`ensemble ${i + 1} holds ${r} of the ${nRows} common rows`)
  })
  const burn = Math.min(opts.burn ?? Math.floor(step / 4), step)
  let from = 0
  while (from < nRows && rows.steps[from]! <= burn) from++
  const nPost = nRows - from
  const pooledSteps = K * (step - burn)
  const base = { nEnsembles: K, nWalkers: WK, nDim: D, step, thin, burn, from, rows, pooledSteps }
  if (nPost < 8) {
    const nan = new Array<number>(D).fill(NaN)
    return { ...base, tau: nan, nOverTau: nan.slice(), rhat: nan.slice(), passed: false }
  }
  const post = rows.chain.subarray(from * WK * D)
  const shape = { nSteps: nPost, nWalkers: WK, nDim: D }
  const tau = Array.from(integratedTime(post, shape), (t) => t * thin)
  const nOverTau = tau.map((t) => pooledSteps / t)
  const rhat = Array.from(splitRhat(post, shape, { groups: K }))
  const passed = nOverTau.every((q) => q > MIN_N_OVER_TAU) && rhat.every((r) => r < MAX_RHAT)
  return { ...base, tau, nOverTau, rhat, passed }
}

/** Percentile p ∈ [0, 1] of sorted values, linear interpolation between order statistics (numpy's default). */
function quantileSorted(s: Float64Array, p: number): number {
  const h = (s.length - 1) * p
  const i = Math.floor(h)
  return i + 1 < s.length ? s[i]! + (h - i) * (s[i + 1]! - s[i]!) : s[i]!
}

/** Median, 16th and 84th percentiles, mean and sample sd of draws (the summaries a single run reports). */
export function summariseDraws(v: Float64Array): { median: number; lo: number; hi: number; mean: number; sd: number } {
  let m = 0
  for (let i = 0; i < v.length; i++) m += v[i]!
  m /= v.length
  let ss = 0
  for (let i = 0; i < v.length; i++) ss += (v[i]! - m) ** 2
  const s = Float64Array.from(v).sort()
  return { median: quantileSorted(s, 0.5), lo: quantileSorted(s, 0.16), hi: quantileSorted(s, 0.84), mean: m, sd: v.length > 1 ? Math.sqrt(ss / (v.length - 1)) : NaN }
}

/**
 * Steps each of K ensembles is expected to need before the rule can pass, given the steps one run
 * would need (`single`, burn-in included): the pooled post-burn length K·(3/4)·S must reach what one
 * run's (3/4)·single reaches, so S = single / K, but never less than what a τ estimate needs
 * (a quarter of single: the rule's τ is only trusted over many τ of each ensemble).
 */
export function stepsPerEnsemble(single: number, K: number): number {
  return Math.ceil(Math.max(single / K, single / 4))
}

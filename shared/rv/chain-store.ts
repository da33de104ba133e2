/**
 * A bounded, thinned copy of an ensemble chain whose length is not known in advance.
 *
 * Step s (1, 2, …) of the walkers is kept when s is a multiple of the current thinning k. When
 * the copy would hold more than `capacity` rows, every other row is dropped (the rows whose step is
 * an odd multiple of k) and k doubles. So after step s the copy holds exactly the steps
 * k, 2k, …, ⌊s/k⌋·k with k = thin·2^j the smallest such value with ⌊s/k⌋ ≤ capacity: a pure function
 * of s, which makes a resumed run identical to an uninterrupted one.
 *
 * Memory and the work of any statistic over the copy stay bounded however long the run lasts
 * (O(1) per step, amortised). Thinning a chain before estimating its autocorrelation time, and
 * multiplying the thinned estimate by the thinning, is the estimator of Foreman-Mackey et al. 2013
 * (PASP 125, 306) and their emcee package's `get_autocorr_time(thin=…)`; it is accurate while the
 * thinning stays well below τ, which holds here whenever the N > 50 τ rule can pass
 * (k ≤ N/(capacity/2), so τ/k ≥ capacity/100 at N = 50 τ).
 *
 * Rows accepted since the last `takePending()` are also copied to a pending list: the
 * append-only checkpoints of a run store them, and `replay` rebuilds the copy from them.
 */

export interface ChainRows {
  /** Step number of each row (1-based: the state after that many steps). */
  steps: Int32Array
  /** rows × walkers × dims, row-major. */
  chain: Float64Array
  /** rows × walkers. */
  lnProb: Float64Array
}

export class ChainStore {
  readonly nWalkers: number
  readonly nDim: number
  readonly capacity: number
  /** Thinning of the first rows (a run's `thin`). */
  readonly baseThin: number
  /** Current thinning: a row every `thin` steps. */
  thin: number
  rows = 0
  private steps: Int32Array
  private chain: Float64Array
  private lnp: Float64Array
  private pending: { steps: number[]; chain: Float64Array[]; lnProb: Float64Array[] } = { steps: [], chain: [], lnProb: [] }

  constructor(nWalkers: number, nDim: number, opts: { capacity?: number; thin?: number } = {}) {
    const capacity = opts.capacity ?? 1024
    const thin = opts.thin ?? 1
    if (!(Number.isInteger(capacity) && capacity >= 8 && capacity % 2 === 0)) throw new RangeError(`capacity must be an even integer ≥ 8, got ${capacity}`)
    if (!(Number.isInteger(thin) && thin >= 1)) throw new RangeError(`thin must be a positive integer, got ${thin}`)
    if (!(Number.isInteger(nWalkers) && nWalkers >= 1 && Number.isInteger(nDim) && nDim >= 1)) throw new RangeError('nWalkers and nDim must be positive integers')
    this.nWalkers = nWalkers; this.nDim = nDim; this.capacity = capacity; this.baseThin = thin; this.thin = thin
    this.steps = new Int32Array(capacity)
    this.chain = new Float64Array(capacity * nWalkers * nDim)
    this.lnp = new Float64Array(capacity * nWalkers)
  }

  /** Offers the walkers' state after step `step` (the arrays are copied when kept). Returns true when kept. */
  push(step: number, positions: ArrayLike<number>, lnProb: ArrayLike<number>, record = true): boolean {
    if (this.rows > 0 && step <= this.steps[this.rows - 1]) throw new RangeError(`steps must increase: ${step} after ${this.steps[this.rows - 1]}`)
    this.syncTo(step)
    if (step % this.thin !== 0) return false
    const W = this.nWalkers, D = this.nDim
    this.steps[this.rows] = step
    this.chain.set(positions as ArrayLike<number>, this.rows * W * D)
    this.lnp.set(lnProb as ArrayLike<number>, this.rows * W)
    this.rows++
    if (record) {
      this.pending.steps.push(step)
      this.pending.chain.push(Float64Array.from(positions))
      this.pending.lnProb.push(Float64Array.from(lnProb))
    }
    return true
  }

  /** Thins the copy as it must be after step `step` (k the least thin·2^j with ⌊step/k⌋ ≤ capacity). A resumed copy calls it with the checkpoint's step. */
  syncTo(step: number): void {
    while (Math.floor(step / this.thin) > this.capacity) this.decimate()
  }

  /** Keeps the rows at even multiples of the thinning and doubles it. */
  private decimate(): void {
    const W = this.nWalkers, D = this.nDim
    const k2 = 2 * this.thin
    let out = 0
    for (let r = 0; r < this.rows; r++) {
      if (this.steps[r] % k2 !== 0) continue
      if (out !== r) {
        this.steps[out] = this.steps[r]
        this.chain.copyWithin(out * W * D, r * W * D, (r + 1) * W * D)
        this.lnp.copyWithin(out * W, r * W, (r + 1) * W)
      }
      out++
    }
    this.rows = out
    this.thin = k2
  }

  /** Rows kept since the last call (for an append-only checkpoint), and forgets them. */
  takePending(): ChainRows {
    const p = this.pending
    const W = this.nWalkers, D = this.nDim, n = p.steps.length
    const out: ChainRows = { steps: Int32Array.from(p.steps), chain: new Float64Array(n * W * D), lnProb: new Float64Array(n * W) }
    for (let i = 0; i < n; i++) { out.chain.set(p.chain[i], i * W * D); out.lnProb.set(p.lnProb[i], i * W) }
    this.pending = { steps: [], chain: [], lnProb: [] }
    return out
  }

  /** Rebuilds the copy from every row pending lists ever returned, in order (resume; then `syncTo` the checkpoint's step). */
  replay(rows: ChainRows): void {
    const W = this.nWalkers, D = this.nDim
    const n = rows.steps.length
    if (rows.chain.length !== n * W * D || rows.lnProb.length !== n * W) throw new RangeError(`replay: ${n} rows need ${n * W * D} chain and ${n * W} ln p values`)
    for (let i = 0; i < n; i++) {
      this.push(rows.steps[i], rows.chain.subarray(i * W * D, (i + 1) * W * D), rows.lnProb.subarray(i * W, (i + 1) * W), false)
    }
  }

  /** Index of the first row whose step is > `step`. */
  firstRowAfter(step: number): number {
    let lo = 0, hi = this.rows
    while (lo < hi) { const mid = (lo + hi) >>> 1; if (this.steps[mid] <= step) lo = mid + 1; else hi = mid }
    return lo
  }

  /** Rows from `from` on (views into the store: copy to keep across pushes). */
  view(from = 0): ChainRows {
    const W = this.nWalkers, D = this.nDim
    return {
      steps: this.steps.subarray(from, this.rows),
      chain: this.chain.subarray(from * W * D, this.rows * W * D),
      lnProb: this.lnp.subarray(from * W, this.rows * W),
    }
  }

  /** Last step kept (0 when empty). */
  lastStep(): number {
    return this.rows ? this.steps[this.rows - 1] : 0
  }
}

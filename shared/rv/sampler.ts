/**
 * Affine-invariant ensemble sampler with the stretch move (Goodman & Weare 2010, CAMCoS 5, 65),
 * in the parallel "two halves" form (Foreman-Mackey et al. 2013, PASP 125, 306, Algorithm 3):
 * the walkers are split into two fixed halves; every walker of the first half is moved using the
 * current positions of the second half, then every walker of the second half using the updated
 * first half. The move of walker X_k with a partner X_j drawn uniformly from the other half is
 *
 *   Y = X_j + Z (X_k − X_j),   Z ~ g(z) ∝ 1/√z on [1/a, a]   (Goodman & Weare 2010, eq. 9),
 *
 * accepted with probability min(1, Z^{d−1} p(Y)/p(X_k)) (their eq. 7); a = 2 by default.
 *
 * Randomness is injected; the same seed (or generator state) gives the same chain, bit for bit.
 * A run can be stopped from the progress callback and resumed later from its `SamplerState`
 * (positions, log-probabilities, generator state, acceptance counts), and the concatenation of the
 * two runs is identical to one uninterrupted run.
 */
import { createRandom, type Random, type StatefulRandom } from '../math/random.ts'

export type { StatefulRandom }

/** A `Random` whose state can be saved and restored (needed to resume a run exactly). */
/** Everything needed to continue a run exactly where it stopped (plain data, JSON-safe via Array.from). */
export interface SamplerState {
  nWalkers: number
  nDim: number
  /** Walker positions, row-major nWalkers × nDim. */
  positions: Float64Array
  /** ln p at each walker. */
  lnProb: Float64Array
  /** Generator state (`StatefulRandom.getState()`), or null when the generator cannot export it. */
  randomState: number[] | null
  /** Accepted moves per walker since the start of the whole run. */
  accepted: Float64Array
  /** Steps done since the start of the whole run. */
  step: number
}

/** The part of the chain kept so far in this call (views into the sampler's buffers: copy to keep). */
export interface ChainSoFar {
  chain: Float64Array
  lnProb: Float64Array
  nKept: number
}

/**
 * Called every `progressEvery` steps (and after the last step, also one `onStep` ended) with the
 * steps done in this call, the steps asked for, a
 * copy of the resumable state and the chain kept so far; return 'stop' to end the run after the
 * current step (the result then has `stopped: true`).
 */
export type ProgressCallback = (done: number, total: number, state: SamplerState, kept: ChainSoFar) => void | 'stop'

export interface EnsembleOptions {
  /** Log-probability (up to a constant) of one point; −Infinity outside the support. The array is a reused buffer: copy it to keep it. */
  logProb: (x: Float64Array) => number
  nDim: number
  /** Even, ≥ 2·nDim (Goodman & Weare 2010 §3 need the ensemble to span the space). */
  nWalkers: number
  /** Starting positions (nWalkers × nDim, row-major), or a saved state to resume from. */
  start: Float64Array | SamplerState
  /** Steps to take in this call. */
  steps: number
  /** Generator: a seed (the sampler's own generator) or an injected `Random`. Ignored for the draws when resuming a state with a saved generator state, which is restored into it. */
  random: number | Random
  /** Stretch scale a > 1 (default 2, Goodman & Weare 2010). */
  a?: number
  /** Keep every `thin`-th step in the returned chain (default 1). */
  thin?: number
  /** false: keep no chain at all (a caller with `onStep` keeps its own); default true. */
  keepChain?: boolean
  /**
   * Called after every step with the step number since the start of the whole run (resumed parts
   * included) and the walkers' positions and ln p (the sampler's buffers: copy to keep); return
   * 'stop' to end the run after this step.
   */
  onStep?: (step: number, positions: Float64Array, lnProb: Float64Array) => void | 'stop'
  onProgress?: ProgressCallback
  /** Call `onProgress` every this many steps (default max(1, steps/100)). */
  progressEvery?: number
}

export interface EnsembleResult {
  /** Kept steps × walkers × dims, row-major: chain[(s·nWalkers + w)·nDim + d]. */
  chain: Float64Array
  /** Kept steps × walkers. */
  lnProb: Float64Array
  /** Number of kept steps. */
  nKept: number
  /** Steps taken in this call. */
  nSteps: number
  thin: number
  /** True when the progress callback asked to stop. */
  stopped: boolean
  /** Accepted / proposed per walker over the whole run (including resumed parts). */
  acceptance: Float64Array
  state: SamplerState
}

function isState(s: Float64Array | SamplerState): s is SamplerState {
  return !(s instanceof Float64Array)
}

function snapshot(nWalkers: number, nDim: number, pos: Float64Array, lp: Float64Array, rng: Random, acc: Float64Array, step: number): SamplerState {
  const r = rng as Partial<StatefulRandom>
  return {
    nWalkers, nDim, positions: Float64Array.from(pos), lnProb: Float64Array.from(lp),
    randomState: typeof r.getState === 'function' ? r.getState() : null,
    accepted: Float64Array.from(acc), step,
  }
}

/**
 * Runs the ensemble sampler (see the module comment). Throws a RangeError naming the option on
 * misuse, including a starting walker with a non-finite log-probability.
 */
export function runEnsemble(opts: EnsembleOptions): EnsembleResult {
  const { logProb, nDim, nWalkers, steps } = opts
  if (typeof logProb !== 'function') throw new RangeError('logProb must be a function')
  if (!(Number.isInteger(nDim) && nDim >= 1)) throw new RangeError(`nDim must be a positive integer, got ${nDim}`)
  if (!(Number.isInteger(nWalkers) && nWalkers >= 2 * nDim && nWalkers % 2 === 0)) {
    throw new RangeError(`nWalkers must be even and ≥ 2·nDim (${2 * nDim}), got ${nWalkers}`)
  }
  if (!(Number.isInteger(steps) && steps >= 0)) throw new RangeError(`steps must be a non-negative integer, got ${steps}`)
  const a = opts.a ?? 2
  if (!(a > 1 && Number.isFinite(a))) throw new RangeError(`a must be > 1, got ${a}`)
  const thin = opts.thin ?? 1
  if (!(Number.isInteger(thin) && thin >= 1)) throw new RangeError(`thin must be a positive integer, got ${thin}`)
  const every = opts.progressEvery ?? Math.max(1, Math.floor(steps / 100))
  if (!(Number.isInteger(every) && every >= 1)) throw new RangeError(`progressEvery must be a positive integer, got ${every}`)

  const rng: Random = typeof opts.random === 'number' ? createRandom(opts.random) : opts.random
  if (!rng || typeof rng.next !== 'function') throw new RangeError('random must be a seed or a Random')

  const pos = new Float64Array(nWalkers * nDim)
  const lp = new Float64Array(nWalkers)
  const acc = new Float64Array(nWalkers)
  let step0 = 0
  const x = new Float64Array(nDim)
  if (isState(opts.start)) {
    const s = opts.start
    if (s.nWalkers !== nWalkers || s.nDim !== nDim) throw new RangeError(`start state is ${s.nWalkers} walkers × ${s.nDim} dims, options say ${nWalkers} × ${nDim}`)
    if (s.positions.length !== nWalkers * nDim || s.lnProb.length !== nWalkers) throw new RangeError('start state arrays have the wrong length')
    pos.set(s.positions); lp.set(s.lnProb)
    if (s.accepted) acc.set(s.accepted)
    step0 = s.step ?? 0
    if (s.randomState) {
      const r = rng as Partial<StatefulRandom>
      if (typeof r.setState !== 'function') throw new RangeError('random cannot restore the saved generator state: pass a seed or a StatefulRandom')
      r.setState(s.randomState)
    }
  } else {
    if (opts.start.length !== nWalkers * nDim) throw new RangeError(`start must hold nWalkers × nDim = ${nWalkers * nDim} numbers, got ${opts.start.length}`)
    pos.set(opts.start)
    for (let w = 0; w < nWalkers; w++) {
      for (let d = 0; d < nDim; d++) x[d] = pos[w * nDim + d]
      lp[w] = logProb(x)
      if (!Number.isFinite(lp[w])) throw new RangeError(`start: walker ${w} has a non-finite log-probability (${lp[w]})`)
    }
  }
  for (let w = 0; w < nWalkers; w++) if (!Number.isFinite(lp[w])) throw new RangeError(`start: walker ${w} has a non-finite log-probability`)

  const nKeptMax = opts.keepChain === false ? 0 : Math.floor(steps / thin)
  const onStep = opts.onStep
  const chain = new Float64Array(nKeptMax * nWalkers * nDim)
  const chainLp = new Float64Array(nKeptMax * nWalkers)
  const half = nWalkers / 2
  const sqrtA = Math.sqrt(a), invSqrtA = 1 / sqrtA, span = sqrtA - invSqrtA
  const dm1 = nDim - 1
  let kept = 0
  let done = 0
  let stopped = false
  for (let s = 0; s < steps; s++) {
    for (let h = 0; h < 2; h++) {
      const first = h * half, other = (1 - h) * half
      for (let w = first; w < first + half; w++) {
        // Z with density ∝ 1/√z on [1/a, a]: √Z uniform on [1/√a, √a]
        const r = invSqrtA + span * rng.next()
        const z = r * r
        const j = other + Math.floor(rng.next() * half)
        const ow = w * nDim, oj = j * nDim
        for (let d = 0; d < nDim; d++) x[d] = pos[oj + d] + z * (pos[ow + d] - pos[oj + d])
        const lpNew = logProb(x)
        const q = dm1 * Math.log(z) + lpNew - lp[w]
        const u = rng.next()
        if (lpNew > -Infinity && Math.log(u) < q) {
          for (let d = 0; d < nDim; d++) pos[ow + d] = x[d]
          lp[w] = lpNew
          acc[w]++
        }
      }
    }
    done = s + 1
    const stepReply = onStep ? onStep(step0 + done, pos, lp) : undefined
    if (done % thin === 0 && kept < nKeptMax) {
      chain.set(pos, kept * nWalkers * nDim)
      chainLp.set(lp, kept * nWalkers)
      kept++
    }
    if (opts.onProgress && (done % every === 0 || done === steps || stepReply === 'stop')) {
      const reply = opts.onProgress(done, steps, snapshot(nWalkers, nDim, pos, lp, rng, acc, step0 + done), {
        chain: chain.subarray(0, kept * nWalkers * nDim), lnProb: chainLp.subarray(0, kept * nWalkers), nKept: kept,
      })
      if (reply === 'stop') { stopped = done < steps; break }
    }
    if (stepReply === 'stop') { stopped = done < steps; break }
  }
  const totalSteps = step0 + done
  const acceptance = new Float64Array(nWalkers)
  for (let w = 0; w < nWalkers; w++) acceptance[w] = totalSteps > 0 ? acc[w] / totalSteps : NaN
  return {
    chain: kept === nKeptMax ? chain : chain.slice(0, kept * nWalkers * nDim),
    lnProb: kept === nKeptMax ? chainLp : chainLp.slice(0, kept * nWalkers),
    nKept: kept, nSteps: done, thin, stopped, acceptance,
    state: snapshot(nWalkers, nDim, pos, lp, rng, acc, totalSteps),
  }
}

/** Plain-JSON form of a state (for a database row or a worker message) and back. */
export function stateToJson(s: SamplerState): Record<string, unknown> {
  return { ...s, positions: Array.from(s.positions), lnProb: Array.from(s.lnProb), accepted: Array.from(s.accepted) }
}

export function stateFromJson(j: Record<string, unknown>): SamplerState {
  const arr = (k: string): Float64Array => {
    const v = j[k]
    if (!Array.isArray(v)) throw new RangeError(`state.${k} must be an array`)
    return Float64Array.from(v as number[])
  }
  return {
    nWalkers: Number(j.nWalkers), nDim: Number(j.nDim), positions: arr('positions'), lnProb: arr('lnProb'),
    randomState: Array.isArray(j.randomState) ? (j.randomState as number[]) : null,
    accepted: arr('accepted'), step: Number(j.step ?? 0),
  }
}

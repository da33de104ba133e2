/**
 * A small seeded generator (mulberry32 state update, 32-bit) and the draws the numerics need.
 * Randomness is always injected: callers pass a `Random`, nothing calls Math.random.
 */
export interface Random {
  /** Uniform on [0, 1). */
  next(): number
  /** Standard normal N(0, 1). */
  normal(): number
  /** Integer uniform on [0, n). */
  int(n: number): number
}

/** A `Random` whose state can be saved and restored (resumable sampling runs). */
export interface StatefulRandom extends Random {
  getState(): number[]
  setState(state: readonly number[]): void
}

/** Normals by the Marsaglia polar method; the cached spare normal is part of the state. */
export function createRandom(seed: number): StatefulRandom {
  if (!Number.isFinite(seed)) throw new RangeError(`seed must be a finite number, got ${seed}`)
  let state = seed >>> 0
  let hasSpare = 0
  let spare = 0
  const next = (): number => {
    state = (state + 0x6d2b79f5) >>> 0
    let t = state
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
  const normal = (): number => {
    if (hasSpare) { hasSpare = 0; return spare }
    let u: number, v: number, s: number
    do { u = 2 * next() - 1; v = 2 * next() - 1; s = u * u + v * v } while (s >= 1 || s === 0)
    const f = Math.sqrt(-2 * Math.log(s) / s)
    spare = v * f
    hasSpare = 1
    return u * f
  }
  return {
    next,
    normal,
    int: (n: number) => Math.floor(next() * n),
    getState: () => [state, hasSpare, spare],
    setState: (s) => {
      if (!Array.isArray(s) || s.length !== 3) throw new RangeError('random state must be [state, hasSpare, spare]')
      state = s[0] >>> 0; hasSpare = s[1] ? 1 : 0; spare = Number(s[2])
    },
  }
}

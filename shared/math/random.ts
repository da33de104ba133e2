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

export function createRandom(seed: number): Random {
  let state = seed >>> 0
  let spare: number | null = null
  const next = (): number => {
    state = (state + 0x6d2b79f5) >>> 0
    let t = state
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
  const normal = (): number => {
    if (spare !== null) { const s = spare; spare = null; return s }
    // Marsaglia polar method
    let u: number, v: number, s: number
    do { u = 2 * next() - 1; v = 2 * next() - 1; s = u * u + v * v } while (s >= 1 || s === 0)
    const f = Math.sqrt(-2 * Math.log(s) / s)
    spare = v * f
    return u * f
  }
  return { next, normal, int: (n: number) => Math.floor(next() * n) }
}

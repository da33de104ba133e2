// AssemblyScript source of the WebAssembly kernel behind shared/rv/planet-search/keplerian-periodogram.ts
// (`npm run build:wasm` compiles it into shared/rv/planet-search/keplerian-wasm-binary.ts; the wasm spec
// checks that the committed module matches a fresh compile).
//
// The same arithmetic as the TypeScript `positions` and `bestAtFrequency` there, in the same order, so
// the results are equal to the last bit. The table stays single precision ([A_0, B_0, A_1, B_1, …]: 32 kB,
// it fits the first-level cache); at each point one 16-byte load reads (A_j, B_j, A_{j+1}, B_{j+1}),
// widened to two f64x2, and (A, B) = lo + fraction·(hi − lo) is computed for both columns at once.
// The nine sums of a cell are four f64x2 sums:
//   s = Σ w (A, B),  q = Σ w (A², B²),  c = Σ w (A B, B A),  y = Σ w r (A, B),
// s per instrument (the offsets are profiled out through it). Phases go two per pass over the points,
// sharing the loads of position, weight and residual.
//
// Layout: `seg` i32[nInst + 1] row starts per instrument, `wInst` f64[nInst], `tau` f64[n], `tab`
// f32[2 (TABLE + 1)], and one 32-byte record per point (points grouped by instrument): fraction f64
// (written by `positions`), weight f64, residual f64, table index i32 (written by `positions`), 4 spare.

const TABLE: i32 = 4096
const MASK: i32 = TABLE - 1

/** Scratch-free start of the data area. */
export function heapBase(): usize {
  return (__heap_base + 63) & ~(<usize>63)
}

/** Table positions of the points at frequency f: x = frac(τ f)·TABLE, fraction and integer part into the records. */
export function positions(tau: usize, n: i32, f: f64, rec: usize): void {
  const fv = f64x2.splat(f), scale = f64x2.splat(<f64>TABLE)
  let i: i32 = 0
  for (; i + 1 < n; i += 2) {
    const u = f64x2.mul(v128.load(tau + (<usize>i << 3)), fv)
    const x = f64x2.mul(f64x2.sub(u, f64x2.floor(u)), scale)
    const k = i32x4.trunc_sat_f64x2_s_zero(x)
    const fr = f64x2.sub(x, f64x2.convert_low_i32x4_s(k))
    const q = rec + (<usize>i << 5)
    v128.store64_lane(q, fr, 0)
    v128.store32_lane(q, k, 0, 24)
    v128.store64_lane(q, fr, 1, 32)
    v128.store32_lane(q, k, 1, 56)
  }
  if (i < n) {
    const u = load<f64>(tau + (<usize>i << 3)) * f
    const x = (u - Math.floor(u)) * <f64>TABLE
    const k = <i32>x
    const q = rec + (<usize>i << 5)
    store<f64>(q, x - <f64>k)
    store<i32>(q, k, 24)
  }
}

let aa: f64 = 0, ab: f64 = 0, bb: f64 = 0, ar: f64 = 0, br: f64 = 0

// The phase's sums from its vectors, the per-instrument profiling already applied
@inline function take(q: v128, c: v128, y: v128): void {
  aa = f64x2.extract_lane(q, 0); bb = f64x2.extract_lane(q, 1); ab = f64x2.extract_lane(c, 0)
  ar = f64x2.extract_lane(y, 0); br = f64x2.extract_lane(y, 1)
}

// Δχ² of one phase from its sums (the TypeScript `bestAtFrequency` tail)
@inline function gain(): f64 {
  const det = aa * bb - ab * ab
  if (!(det > 1e-12 * (aa * bb))) {
    // degenerate pair: best single column
    const d1 = aa > 0 ? ar * ar / aa : 0, d2 = bb > 0 ? br * br / bb : 0
    return Math.max(d1, d2)
  }
  return (bb * ar * ar - 2 * ab * ar * br + aa * br * br) / det
}

// (A, B) at table position p + shift (mod TABLE) and fraction fr
@inline function shape(tab: usize, p: i32, shift: i32, fr: v128): v128 {
  const t = v128.load(tab + (<usize>((p + shift) & MASK) << 3))
  const lo = f64x2.promote_low_f32x4(t)
  const hi = f64x2.promote_low_f32x4(v128.shuffle<i32>(t, t, 2, 3, 2, 3))
  return f64x2.add(lo, f64x2.mul(fr, f64x2.sub(hi, lo)))
}

@inline function swap(v: v128): v128 {
  return v128.shuffle<f64>(v, v, 1, 0)
}

/**
 * Best Δχ² over the `phases` periastron phases of one eccentricity (table `tab`) at the positions in
 * `pos`/`frac`. Returns Δχ² and writes the best phase index (i32) to `out`.
 */
export function cell(nInst: i32, seg: usize, wInst: usize, rec: usize, tab: usize, phases: i32, out: usize): f64 {
  let best: f64 = 0
  let bestPh: i32 = 0
  const step: i32 = TABLE / phases
  const zero = f64x2.splat(0)
  for (let ph: i32 = 0; ph < phases; ph += 2) {
    const two = ph + 1 < phases
    const shift0: i32 = TABLE - ph * step
    const shift1: i32 = TABLE - (ph + 1) * step
    let q0 = zero, c0 = zero, y0 = zero, q1 = zero, y1 = zero
    for (let k: i32 = 0; k < nInst; k++) {
      let s0 = zero, s1 = zero
      const end = rec + (<usize>load<i32>(seg + (<usize>(k + 1) << 2)) << 5)
      let q = rec + (<usize>load<i32>(seg + (<usize>k << 2)) << 5)
      if (two) {
        for (; q < end; q += 32) {
          const p = load<i32>(q, 24)
          const fr = v128.load64_splat(q)
          const wi = v128.load64_splat(q, 8)
          const ri = v128.load64_splat(q, 16)
          const v0 = shape(tab, p, shift0, fr)
          const u0 = f64x2.mul(wi, v0)
          s0 = f64x2.add(s0, u0)
          q0 = f64x2.add(q0, f64x2.mul(u0, v0))
          y0 = f64x2.add(y0, f64x2.mul(u0, ri))
          const v1 = shape(tab, p, shift1, fr)
          const u1 = f64x2.mul(wi, v1)
          s1 = f64x2.add(s1, u1)
          q1 = f64x2.add(q1, f64x2.mul(u1, v1))
          y1 = f64x2.add(y1, f64x2.mul(u1, ri))
          // both phases' A B in one vector: (w A₀ · B₀, w A₁ · B₁)
          c0 = f64x2.add(c0, f64x2.mul(v128.shuffle<f64>(u0, u1, 0, 2), v128.shuffle<f64>(v0, v1, 1, 3)))
        }
      } else {
        for (; q < end; q += 32) {
          const v0 = shape(tab, load<i32>(q, 24), shift0, v128.load64_splat(q))
          const u0 = f64x2.mul(v128.load64_splat(q, 8), v0)
          s0 = f64x2.add(s0, u0)
          q0 = f64x2.add(q0, f64x2.mul(u0, v0))
          c0 = f64x2.add(c0, f64x2.mul(u0, swap(v0)))
          y0 = f64x2.add(y0, f64x2.mul(u0, v128.load64_splat(q, 16)))
        }
      }
      // offsets profiled out: q −= s²/W, c −= sa·sb/W, in the TypeScript's order
      const W = load<f64>(wInst + (<usize>k << 3))
      if (W > 0) {
        const wv = f64x2.splat(W)
        q0 = f64x2.sub(q0, f64x2.div(f64x2.mul(s0, s0), wv))
        q1 = f64x2.sub(q1, f64x2.div(f64x2.mul(s1, s1), wv))
        const cs = two ? f64x2.mul(v128.shuffle<f64>(s0, s1, 0, 2), v128.shuffle<f64>(s0, s1, 1, 3)) : f64x2.mul(s0, swap(s0))
        c0 = f64x2.sub(c0, f64x2.div(cs, wv))
      }
    }
    take(q0, c0, y0)
    let d = gain()
    if (d > best) { best = d; bestPh = ph }
    if (two) {
      take(q1, swap(c0), y1)
      d = gain()
      if (d > best) { best = d; bestPh = ph + 1 }
    }
  }
  store<i32>(out, bestPh)
  return best
}

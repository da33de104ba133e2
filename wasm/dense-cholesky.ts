// AssemblyScript source of the WebAssembly kernel behind shared/rv/gp/dense.ts `choleskyInPlace`
// (`npm run build:wasm` compiles it into shared/rv/gp/dense-wasm-binary.ts; tests/shared/rv/gp/dense-wasm.spec.ts
// checks that the committed module matches a fresh compile).
//
// Blocked right-looking (outer-product) Cholesky C = L Lᵀ (Golub & Van Loan 2013, "Matrix
// Computations", 4th ed., §4.2, block Cholesky; section from memory): for each panel of `nb` columns, (1) factor the diagonal block, (2) solve
// the rows below against it (L21 = A21 L11⁻ᵀ), (3) update the trailing matrix A22 −= L21 L21ᵀ (lower
// triangle only). Step (3) is almost all of the work; it runs as a 4 × 4 register tile of f64x2 sums
// over a packed copy of the panel (four rows interleaved per column, so each step loads one
// 4-vector and four broadcast scalars: common practice for matrix-multiply kernels).
//
// Layout: row-major, leading dimension `ld` (doubles), order `n` a multiple of 4 (the caller pads with
// an identity block), lower triangle read and written; the upper triangle is scratch.

/** Scratch-free start of the matrix area (the caller places the matrix and the panel there). */
export function heapBase(): usize {
  return (__heap_base + 63) & ~(<usize>63)
}

/**
 * One step of the blocked factorisation of the n × n matrix at `a`: columns k0 … k0 + nb − 1 (the
 * columns before k0 already factored, their updates applied). The caller loops k0 = 0, nb, 2nb, … —
 * one call per panel, so an engine that compiles hot code in the background can switch to it between
 * panels. `pack` is scratch of (n + nb + 1) · nb doubles. Returns 0, or 1 + the row whose pivot was
 * not positive.
 */
export function panel(a: usize, n: i32, ld: i32, k0: i32, nb: i32, pack: usize): i32 {
  const rowBytes = <usize>ld << 3
  const kb: i32 = min(nb, n - k0)
  // (1) diagonal block, row by row (its trailing updates are already in)
  for (let i: i32 = k0; i < k0 + kb; i++) {
    const ri = a + <usize>i * rowBytes
    for (let j: i32 = k0; j <= i; j++) {
      const rj = a + <usize>j * rowBytes
      let s0: f64 = 0, s1: f64 = 0
      let p: i32 = k0
      for (; p + 1 < j; p += 2) {
        s0 += load<f64>(ri + (<usize>p << 3)) * load<f64>(rj + (<usize>p << 3))
        s1 += load<f64>(ri + (<usize>p << 3), 8) * load<f64>(rj + (<usize>p << 3), 8)
      }
      if (p < j) s0 += load<f64>(ri + (<usize>p << 3)) * load<f64>(rj + (<usize>p << 3))
      const v = load<f64>(ri + (<usize>j << 3)) - (s0 + s1)
      if (i == j) {
        if (!(v > 0)) return i + 1
        store<f64>(ri + (<usize>i << 3), Math.sqrt(v))
      } else store<f64>(ri + (<usize>j << 3), v / load<f64>(rj + (<usize>j << 3)))
    }
  }
  const r0: i32 = k0 + kb
  const m: i32 = n - r0
  if (m == 0) return 0
  // L11 by rows, contiguous (kb × kb) after the panel, and the inverse pivots
  const l11 = pack + ((<usize>m * <usize>kb) << 3)
  const inv = l11 + ((<usize>kb * <usize>kb) << 3)
  for (let j: i32 = 0; j < kb; j++) {
    const rj = a + <usize>(k0 + j) * rowBytes + (<usize>k0 << 3)
    memory.copy(l11 + ((<usize>j * <usize>kb) << 3), rj, <usize>(j + 1) << 3)
    store<f64>(inv + (<usize>j << 3), 1.0 / load<f64>(rj + (<usize>j << 3)))
  }
  // (2) pack the rows below, four at a time, and solve them: x_j = (a_j − Σ_{p<j} x_p L_jp) / L_jj
  const tileBytes = <usize>kb << 5
  for (let t: i32 = 0; t < m; t += 4) {
    const pt = pack + <usize>(t >> 2) * tileBytes
    const q0 = a + <usize>(r0 + t) * rowBytes + (<usize>k0 << 3)
    const q1 = q0 + rowBytes, q2 = q1 + rowBytes, q3 = q2 + rowBytes
    for (let p: i32 = 0; p < kb; p++) {
      const o = <usize>p << 3
      const d = pt + (<usize>p << 5)
      store<f64>(d, load<f64>(q0 + o))
      store<f64>(d, load<f64>(q1 + o), 8)
      store<f64>(d, load<f64>(q2 + o), 16)
      store<f64>(d, load<f64>(q3 + o), 24)
    }
    for (let j: i32 = 0; j < kb; j++) {
      const lj = l11 + ((<usize>j * <usize>kb) << 3)
      let u0 = v128.load(pt + (<usize>j << 5)), u1 = v128.load(pt + (<usize>j << 5), 16)
      let w0 = f64x2.splat(0), w1 = f64x2.splat(0)
      let p: i32 = 0
      for (; p + 1 < j; p += 2) {
        const x = pt + (<usize>p << 5)
        const c = v128.load64_splat(lj + (<usize>p << 3))
        const c2 = v128.load64_splat(lj + (<usize>p << 3), 8)
        u0 = f64x2.sub(u0, f64x2.mul(v128.load(x), c))
        u1 = f64x2.sub(u1, f64x2.mul(v128.load(x, 16), c))
        w0 = f64x2.add(w0, f64x2.mul(v128.load(x, 32), c2))
        w1 = f64x2.add(w1, f64x2.mul(v128.load(x, 48), c2))
      }
      if (p < j) {
        const x = pt + (<usize>p << 5)
        const c = v128.load64_splat(lj + (<usize>p << 3))
        u0 = f64x2.sub(u0, f64x2.mul(v128.load(x), c))
        u1 = f64x2.sub(u1, f64x2.mul(v128.load(x, 16), c))
      }
      const s = v128.load64_splat(inv + (<usize>j << 3))
      v128.store(pt + (<usize>j << 5), f64x2.mul(f64x2.sub(u0, w0), s))
      v128.store(pt + (<usize>j << 5), f64x2.mul(f64x2.sub(u1, w1), s), 16)
    }
    for (let p: i32 = 0; p < kb; p++) {
      const o = <usize>p << 3
      const d = pt + (<usize>p << 5)
      store<f64>(q0 + o, load<f64>(d))
      store<f64>(q1 + o, load<f64>(d, 8))
      store<f64>(q2 + o, load<f64>(d, 16))
      store<f64>(q3 + o, load<f64>(d, 24))
    }
  }
  // (3) trailing update, lower tiles only: A[I, J] −= L21[I] L21[J]ᵀ
  for (let ti: i32 = 0; ti < m; ti += 4) {
    const pa = pack + <usize>(ti >> 2) * tileBytes
    const c0 = a + <usize>(r0 + ti) * rowBytes + (<usize>r0 << 3)
    for (let tj: i32 = 0; tj <= ti; tj += 4) {
      const pb = pack + <usize>(tj >> 2) * tileBytes
      let c00 = f64x2.splat(0), c01 = f64x2.splat(0), c10 = f64x2.splat(0), c11 = f64x2.splat(0)
      let c20 = f64x2.splat(0), c21 = f64x2.splat(0), c30 = f64x2.splat(0), c31 = f64x2.splat(0)
      // pointers and count as loop variables (nothing for the engine to recompute per step)
      let x = pa, y = pb
      for (let k: i32 = kb; k > 0; k--) {
        const b0 = v128.load(y), b1 = v128.load(y, 16)
        let s = v128.load64_splat(x)
        c00 = f64x2.add(c00, f64x2.mul(s, b0)); c01 = f64x2.add(c01, f64x2.mul(s, b1))
        s = v128.load64_splat(x, 8)
        c10 = f64x2.add(c10, f64x2.mul(s, b0)); c11 = f64x2.add(c11, f64x2.mul(s, b1))
        s = v128.load64_splat(x, 16)
        c20 = f64x2.add(c20, f64x2.mul(s, b0)); c21 = f64x2.add(c21, f64x2.mul(s, b1))
        s = v128.load64_splat(x, 24)
        c30 = f64x2.add(c30, f64x2.mul(s, b0)); c31 = f64x2.add(c31, f64x2.mul(s, b1))
        x += 32; y += 32
      }
      const c = c0 + (<usize>tj << 3)
      v128.store(c, f64x2.sub(v128.load(c), c00)); v128.store(c, f64x2.sub(v128.load(c, 16), c01), 16)
      const d1 = c + rowBytes
      v128.store(d1, f64x2.sub(v128.load(d1), c10)); v128.store(d1, f64x2.sub(v128.load(d1, 16), c11), 16)
      const d2 = d1 + rowBytes
      v128.store(d2, f64x2.sub(v128.load(d2), c20)); v128.store(d2, f64x2.sub(v128.load(d2, 16), c21), 16)
      const d3 = d2 + rowBytes
      v128.store(d3, f64x2.sub(v128.load(d3), c30)); v128.store(d3, f64x2.sub(v128.load(d3, 16), c31), 16)
    }
  }
  return 0
}

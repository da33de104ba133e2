// AssemblyScript source of the WebAssembly kernel behind shared/rv/gp/dense.ts `choleskyInPlace`
// (`npm run build:wasm` compiles it into shared/rv/gp/dense-wasm-binary.ts; tests/shared/rv/gp/dense-wasm.spec.ts
// checks that the committed module matches a fresh compile).
//
// Blocked right-looking (outer-product) Cholesky C = L Lᵀ (Golub & Van Loan 2013, "Matrix
// Computations", 4th ed., §4.2, block Cholesky; section from memory): for each panel of `nb` columns, (1) factor the diagonal block, (2) solve
// the rows below against it (L21 = A21 L11⁻ᵀ), (3) update the trailing matrix A22 −= L21 L21ᵀ (lower
// triangle only). Step (3) is almost all of the work; it runs as a 4 × 4 register tile of f64x2 sums
// over a packed copy of the panel (four rows interleaved per column, so each step loads one
// 4-vector and four broadcast scalars: common practice for matrix-multiply kernels). Steps (1) and (2)
// go 4 × 4 block by 4 × 4 block on the packed panel (the same tile product for the columns already
// done, then a 4 × 4 Cholesky on the diagonal or a 4 × 4 triangular solve below it, straight-line),
// so they too run at the tile's speed rather than as short dot products of varying length.
//
// Layout: row-major, leading dimension `ld` (doubles), order `n` a multiple of 4 (the caller pads with
// an identity block), lower triangle read and written; above the diagonal only the 4 × 4 diagonal
// blocks' upper corners are written (scratch), the rest of the upper triangle is left as it was.

/** Scratch-free start of the matrix area (the caller places the matrix and the panel there). */
export function heapBase(): usize {
  return (__heap_base + 63) & ~(<usize>63)
}

// c[r][0..3] −= Σ_{p<k} x[p][r] · y[p][0..3] for r = 0…3: x, y packed four rows per column (32 bytes a
// step), c four rows of four doubles, `stride` bytes apart. The loop runs on the pointer alone (an end
// address rather than a count: one register fewer inside the loop, measured a few per cent faster).
@inline function tileSub(x: usize, y: usize, k: i32, c: usize, stride: usize): void {
  let c00 = f64x2.splat(0), c01 = f64x2.splat(0), c10 = f64x2.splat(0), c11 = f64x2.splat(0)
  let c20 = f64x2.splat(0), c21 = f64x2.splat(0), c30 = f64x2.splat(0), c31 = f64x2.splat(0)
  const xe = x + (<usize>k << 5)
  while (x < xe) {
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
  v128.store(c, f64x2.sub(v128.load(c), c00)); v128.store(c, f64x2.sub(v128.load(c, 16), c01), 16)
  c += stride
  v128.store(c, f64x2.sub(v128.load(c), c10)); v128.store(c, f64x2.sub(v128.load(c, 16), c11), 16)
  c += stride
  v128.store(c, f64x2.sub(v128.load(c), c20)); v128.store(c, f64x2.sub(v128.load(c, 16), c21), 16)
  c += stride
  v128.store(c, f64x2.sub(v128.load(c), c30)); v128.store(c, f64x2.sub(v128.load(c, 16), c31), 16)
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
  const tileBytes = <usize>kb << 5
  const tiles: i32 = (n - k0) >> 2
  const inv = pack + <usize>tiles * tileBytes
  const gEnd: i32 = kb >> 2
  // (1) + (2): the panel's rows four at a time (row tile T), its columns four at a time (group g)
  for (let T: i32 = 0; T < tiles; T++) {
    const pt = pack + <usize>T * tileBytes
    const q0 = a + <usize>(k0 + (T << 2)) * rowBytes + (<usize>k0 << 3)
    const q1 = q0 + rowBytes, q2 = q1 + rowBytes, q3 = q2 + rowBytes
    // pack the tile's four rows, interleaved: pt[p][r] = A[row r, k0 + p]
    for (let p: i32 = 0; p < kb; p++) {
      const o = <usize>p << 3
      const d = pt + (<usize>p << 5)
      store<f64>(d, load<f64>(q0 + o))
      store<f64>(d, load<f64>(q1 + o), 8)
      store<f64>(d, load<f64>(q2 + o), 16)
      store<f64>(d, load<f64>(q3 + o), 24)
    }
    const diag = T < gEnd
    const gLast: i32 = diag ? T : gEnd - 1
    for (let g: i32 = 0; g <= gLast; g++) {
      const pg = pack + <usize>g * tileBytes
      const b = pt + (<usize>g << 7) // the 4 × 4 block, by columns
      if (g > 0) tileSub(pg, pt, g << 2, b, 32)
      const lg = pg + (<usize>g << 7) // L of the diagonal block g, by columns: L[c][q] at lg + 32q + 8c
      if (g == T) {
        // the diagonal 4 × 4 block: Cholesky by columns (element (r, c) at b + 32c + 8r)
        for (let c: i32 = 0; c < 4; c++) {
          for (let r: i32 = c; r < 4; r++) {
            let v = load<f64>(b + (<usize>c << 5) + (<usize>r << 3))
            for (let q: i32 = 0; q < c; q++) v -= load<f64>(b + (<usize>q << 5) + (<usize>r << 3)) * load<f64>(b + (<usize>q << 5) + (<usize>c << 3))
            if (r == c) {
              if (!(v > 0)) return k0 + (T << 2) + r + 1
              v = Math.sqrt(v)
              store<f64>(inv + (<usize>((g << 2) + c) << 3), 1.0 / v)
            } else v *= load<f64>(inv + (<usize>((g << 2) + c) << 3))
            store<f64>(b + (<usize>c << 5) + (<usize>r << 3), v)
          }
        }
      } else {
        // below it: x_c = (b_c − Σ_{q<c} x_q L_cq) / L_cc for the four columns, two rows a vector
        const iv = inv + (<usize>g << 5)
        let s = v128.load64_splat(iv)
        const x0 = f64x2.mul(v128.load(b), s), y0 = f64x2.mul(v128.load(b, 16), s)
        let l = v128.load64_splat(lg, 8)
        s = v128.load64_splat(iv, 8)
        const x1 = f64x2.mul(f64x2.sub(v128.load(b, 32), f64x2.mul(x0, l)), s)
        const y1 = f64x2.mul(f64x2.sub(v128.load(b, 48), f64x2.mul(y0, l)), s)
        l = v128.load64_splat(lg, 16)
        let l2 = v128.load64_splat(lg, 48)
        s = v128.load64_splat(iv, 16)
        const x2 = f64x2.mul(f64x2.sub(f64x2.sub(v128.load(b, 64), f64x2.mul(x0, l)), f64x2.mul(x1, l2)), s)
        const y2 = f64x2.mul(f64x2.sub(f64x2.sub(v128.load(b, 80), f64x2.mul(y0, l)), f64x2.mul(y1, l2)), s)
        l = v128.load64_splat(lg, 24)
        l2 = v128.load64_splat(lg, 56)
        const l3 = v128.load64_splat(lg, 88)
        s = v128.load64_splat(iv, 24)
        v128.store(b, x0); v128.store(b, y0, 16); v128.store(b, x1, 32); v128.store(b, y1, 48)
        v128.store(b, x2, 64); v128.store(b, y2, 80)
        v128.store(b, f64x2.mul(f64x2.sub(f64x2.sub(f64x2.sub(v128.load(b, 96), f64x2.mul(x0, l)), f64x2.mul(x1, l2)), f64x2.mul(x2, l3)), s), 96)
        v128.store(b, f64x2.mul(f64x2.sub(f64x2.sub(f64x2.sub(v128.load(b, 112), f64x2.mul(y0, l)), f64x2.mul(y1, l2)), f64x2.mul(y2, l3)), s), 112)
      }
    }
    // unpack (in the diagonal block, the lower triangle only)
    const pEnd: i32 = diag ? (T << 2) + 1 : kb
    for (let p: i32 = 0; p < pEnd; p++) {
      const o = <usize>p << 3
      const d = pt + (<usize>p << 5)
      store<f64>(q0 + o, load<f64>(d))
      store<f64>(q1 + o, load<f64>(d, 8))
      store<f64>(q2 + o, load<f64>(d, 16))
      store<f64>(q3 + o, load<f64>(d, 24))
    }
    if (diag) {
      const o = <usize>(T << 2) << 3
      const d = pt + (o << 2) // element (r, c) of the diagonal 4 × 4 block at d + 32c + 8r
      store<f64>(q1 + o, load<f64>(d, 40), 8)
      store<f64>(q2 + o, load<f64>(d, 48), 8); store<f64>(q2 + o, load<f64>(d, 80), 16)
      store<f64>(q3 + o, load<f64>(d, 56), 8); store<f64>(q3 + o, load<f64>(d, 88), 16); store<f64>(q3 + o, load<f64>(d, 120), 24)
    }
  }
  // (3) trailing update, lower tiles only: A[I, J] −= L21[I] L21[J]ᵀ
  const r0: i32 = k0 + kb
  for (let ti: i32 = gEnd; ti < tiles; ti++) {
    const pa = pack + <usize>ti * tileBytes
    const c0 = a + <usize>(k0 + (ti << 2)) * rowBytes + (<usize>r0 << 3)
    for (let tj: i32 = gEnd; tj <= ti; tj++) {
      tileSub(pa, pack + <usize>tj * tileBytes, kb, c0 + (<usize>(tj - gEnd) << 5), rowBytes)
    }
  }
  return 0
}

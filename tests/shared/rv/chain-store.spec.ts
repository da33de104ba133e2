import { describe, it, expect } from 'vitest'
import { readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { ChainStore } from '../../../shared/rv/chain-store.ts'
import { checkConvergence, MIN_N_OVER_TAU } from '../../../shared/rv/mcmc.ts'
import { integratedTime } from '../../../shared/rv/diagnostics.ts'
import { expectClose } from '../../helpers/expect-close.ts'

describe('kept, thinned copy of a chain (ChainStore)', () => {
  const W = 3, D = 2
  const row = (s: number) => ({ pos: Float64Array.from({ length: W * D }, (_, i) => s + i / 10), lp: Float64Array.from({ length: W }, (_, i) => -s - i) })

  it('holds exactly the steps k, 2k, … ⌊s/k⌋·k with the least k = thin·2^j that fits the capacity', () => {
    const st = new ChainStore(W, D, { capacity: 8, thin: 1 })
    for (let s = 1; s <= 100; s++) { const r = row(s); st.push(s, r.pos, r.lp) }
    // ⌊100/k⌋ ≤ 8 → k = 16: steps 16, 32, 48, 64, 80, 96
    expect(st.thin).toBe(16)
    expect(Array.from(st.view().steps)).toEqual([16, 32, 48, 64, 80, 96])
    expect(st.view().chain[0]).toBe(16)
    expect(st.view().lnProb[W * 2 + 1]).toBe(-48 - 1)
    expect(st.firstRowAfter(40)).toBe(2)
  })

  it('is rebuilt from its pending rows (the append-only checkpoints) exactly', () => {
    const a = new ChainStore(W, D, { capacity: 8, thin: 2 })
    const parts = []
    for (let s = 1; s <= 300; s++) { const r = row(s); a.push(s, r.pos, r.lp); if (s % 37 === 0) parts.push(a.takePending()) }
    parts.push(a.takePending())
    const b = new ChainStore(W, D, { capacity: 8, thin: 2 })
    for (const p of parts) b.replay(p)
    b.syncTo(300)
    expect(b.thin).toBe(a.thin)
    expect(Array.from(b.view().steps)).toEqual(Array.from(a.view().steps))
    expect(Array.from(b.view().chain)).toEqual(Array.from(a.view().chain))
    expect(Array.from(b.view().lnProb)).toEqual(Array.from(a.view().lnProb))
    // every pending row was stored once: far fewer than the steps
    expect(parts.reduce((n, p) => n + p.steps.length, 0)).toBeLessThan(40)
  })

  it('refuses misuse', () => {
    expect(() => new ChainStore(W, D, { capacity: 7 })).toThrow(/capacity/)
    expect(() => new ChainStore(W, D, { thin: 0 })).toThrow(/thin/)
    const st = new ChainStore(W, D)
    const r = row(1)
    st.push(4, r.pos, r.lp)
    expect(() => st.push(2, r.pos, r.lp)).toThrow(/increase/)
  })
})

describe('convergence rule against emcee on a stored chain (fixtures/sampler/autocorr-emcee.json)', () => {
  // Reference: scripts/reference/sampler_emcee.py --autocorr: an emcee 3.1.4 chain (8 walkers ×
  // 4000 steps, 2-D Gaussian with correlation 0.98, stored as float32) and what emcee's
  // get_autocorr_time(discard, thin) gives on its prefixes (discard a quarter, thin 1, 2, 4, 8).
  const ref = JSON.parse(readFileSync(fileURLToPath(new URL('../../../fixtures/sampler/autocorr-emcee.json', import.meta.url)), 'utf8'))
  const bytes = Buffer.from(ref.chainFloat32Base64 as string, 'base64')
  const f32 = new Float32Array(bytes.buffer, bytes.byteOffset, bytes.length / 4)
  const W = ref.walkers as number, D = ref.dims as number
  const rows = ref.tau as Array<{ steps: number; discard: number; thin: number; tau: number[] }>
  const at = (n: number, thin: number) => rows.find((r) => r.steps === n && r.thin === thin)!.tau

  // our kept copy with 1024 rows: thinned 1, 1, 1, 2, 4 at the checked lengths
  const store = new ChainStore(W, D, { capacity: 1024 })
  const checks = new Map<number, ReturnType<typeof checkConvergence>>()
  const lengths = [256, 512, 1024, 2048, 4000]
  const step = new Float64Array(W * D)
  for (let s = 1; s <= ref.steps; s++) {
    for (let i = 0; i < W * D; i++) step[i] = f32[(s - 1) * W * D + i]
    store.push(s, step, new Float64Array(W))
    if (lengths.includes(s)) checks.set(s, { ...checkConvergence(store, s, Math.floor(s / 4), 2), thin: store.thin } as ReturnType<typeof checkConvergence> & { thin: number })
  }

  it('estimates τ on the thinned copy exactly as get_autocorr_time(discard, thin = k) does', () => {
    for (const n of lengths) {
      const c = checks.get(n)! as ReturnType<typeof checkConvergence> & { thin: number }
      expect(c.thin).toBe(n <= 1024 ? 1 : n === 2048 ? 2 : 4)
      at(n, c.thin).forEach((t, d) => expectClose(c.tau[d]!, t, { rtol: 1e-9 }, `τ[${d}] at ${n} steps, thin ${c.thin}`))
    }
  })

  it('stays within 10 % of the unthinned τ, and takes the same decision N > 50 τ wherever the margin exceeds that', () => {
    let compared = 0
    for (const n of lengths) {
      const c = checks.get(n)!
      const full = at(n, 1)
      full.forEach((t, d) => expectClose(c.tau[d]!, t, { rtol: 0.1 }, `τ[${d}] at ${n} steps vs unthinned`))
      const post = n - Math.floor(n / 4)
      const margin = Math.min(...full.map((t) => Math.abs(post / t / MIN_N_OVER_TAU - 1)))
      if (margin < 0.1) continue
      compared++
      const theirs = full.every((t) => post > MIN_N_OVER_TAU * t)
      const ours = c.nOverTau.every((q) => q > MIN_N_OVER_TAU)
      expect(ours, `decision at ${n} steps`).toBe(theirs)
    }
    expect(compared).toBeGreaterThanOrEqual(3)
    // the long chain passes, the short ones do not (so both outcomes were checked)
    expect(checks.get(4000)!.nOverTau.every((q) => q > MIN_N_OVER_TAU)).toBe(true)
    expect(checks.get(512)!.nOverTau.every((q) => q > MIN_N_OVER_TAU)).toBe(false)
  })

  it('agrees with the whole-chain estimator of diagnostics.ts on the unthinned rows', () => {
    const n = 1024, burn = 256
    const chain = Float64Array.from(f32.subarray(burn * W * D, n * W * D))
    const tau = integratedTime(chain, { nSteps: n - burn, nWalkers: W, nDim: D })
    at(n, 1).forEach((t, d) => expectClose(tau[d]!, t, { rtol: 1e-9 }, `τ[${d}]`))
  })
})

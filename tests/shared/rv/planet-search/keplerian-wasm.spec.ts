import { describe, it, expect } from 'vitest'
import { keplerianPeriodogram, keplerianPeriodogramTypeScript, type KeplerianPeriodogramResult } from '../../../../shared/rv/planet-search/keplerian-periodogram.ts'
import { keplerianWasm, keplerianWasmAvailable, WASM_TABLE } from '../../../../shared/rv/planet-search/keplerian-wasm.ts'
import type { RvData } from '../../../../shared/rv/orbit-data.ts'
import { synth } from '../orbit-fit-helpers.ts'

const DEG = Math.PI / 180

/** Every output of the two periodograms equal to the last bit. */
function expectSame(a: KeplerianPeriodogramResult, b: KeplerianPeriodogramResult): void {
  expect(a.frequency.length).toBe(b.frequency.length)
  expect(a.chi2Null).toBe(b.chi2Null)
  for (const key of ['frequency', 'dchi2', 'power', 'bestE', 'bestTp', 'bestFrequency'] as const) {
    let differ = 0
    for (let k = 0; k < a[key].length; k++) if (!Object.is(a[key][k], b[key][k])) differ++
    expect(differ, key).toBe(0)
  }
}

describe('the WebAssembly Keplerian periodogram kernel', () => {
  // odd count (the positions' scalar tail), three instruments of unequal size
  const { data } = synth({
    seed: 7, n: 61, baseline: 900, planets: [{ period: 75, K: 18, e: 0.5, omega: 200 * DEG, tp: 2455030 }, { period: 6.3, K: 6, e: 0, omega: 0, tp: 2455001 }],
    instruments: [
      { name: 'A', offset: 10, jitter: 1.5, err: [1, 2] }, { name: 'B', offset: -40, jitter: 1, err: [2, 4] }, { name: 'C', offset: 5, jitter: 2, err: [1, 3] },
    ],
  })

  it('runs here (Node has WebAssembly with SIMD), and a session answers the circular Δχ² of hand-made points', () => {
    expect(keplerianWasmAvailable()).toBe(true)
    const table = new Float32Array(2 * (WASM_TABLE + 1))
    for (let j = 0; j <= WASM_TABLE; j++) { table[2 * j] = Math.cos(2 * Math.PI * j / WASM_TABLE); table[2 * j + 1] = Math.sin(2 * Math.PI * j / WASM_TABLE) }
    // one instrument, r centred with weights w; Δχ² of y ≈ a cos 2πfτ + b sin 2πfτ + c by normal equations
    const tau = Float64Array.of(0, 0.3, 1.1, 1.7, 2.2), w = Float64Array.of(1, 2, 1, 0.5, 1), y = Float64Array.of(3, -1, 2, 0.5, -2)
    const W = w.reduce((a, b) => a + b), ybar = y.reduce((a, v, i) => a + w[i] * v, 0) / W
    const r = y.map((v) => v - ybar)
    const s = keplerianWasm({ tau, w, r, segStart: Int32Array.of(0, 5), wInst: Float64Array.of(W) }, [table])
    expect(s).not.toBeNull()
    const f = 0.37
    s!.positions(f)
    const d = s!.cell(0, 1)
    expect(s!.phase()).toBe(0)
    s!.close()
    const col = (g: (x: number) => number): number[] => Array.from(tau, (t) => g(2 * Math.PI * f * t))
    const cs = [col(Math.cos), col(Math.sin)].map((c) => { const m = c.reduce((a, v, i) => a + w[i] * v, 0) / W; return c.map((v) => v - m) })
    const dot = (a: ArrayLike<number>, b: ArrayLike<number>): number => Array.from(a).reduce((acc, v, i) => acc + w[i] * v * b[i], 0)
    const [aa, ab, bb, ar, br] = [dot(cs[0], cs[0]), dot(cs[0], cs[1]), dot(cs[1], cs[1]), dot(cs[0], r), dot(cs[1], r)]
    const expected = (bb * ar * ar - 2 * ab * ar * br + aa * br * br) / (aa * bb - ab * ab)
    expect(Math.abs(d - expected)).toBeLessThan(1e-5 * expected)
  })

  it('gives the TypeScript path\'s results to the last bit: default cells, jitter, residuals', () => {
    expectSame(keplerianPeriodogram(data, { minPeriod: 1 }), keplerianPeriodogramTypeScript(data, { minPeriod: 1 }))
    const opts = { minPeriod: 2, jitter: [3, 0.5, 1], y: Float64Array.from(data.y, (v, i) => v - 6 * Math.sin(data.t[i] / 9)) }
    expectSame(keplerianPeriodogram(data, opts), keplerianPeriodogramTypeScript(data, opts))
  })

  it('and with one phase, two, 256, sub-steps, repeated eccentricities and an instrument without points', () => {
    const cells = [
      { e: 0, phases: 2, minPeriod: 0, substeps: 3 }, { e: 0.2, phases: 1, minPeriod: 0, substeps: 1 },
      { e: 0.2, phases: 256, minPeriod: 40, substeps: 2 }, { e: 0.95, phases: 4, minPeriod: 3, substeps: 1 },
    ]
    const four: RvData = { ...data, instrumentNames: [...data.instrumentNames, 'unused'] }
    const opts = { minPeriod: 3, oversample: 2, cells }
    expectSame(keplerianPeriodogram(four, opts), keplerianPeriodogramTypeScript(four, opts))
  })

  it('and on the smallest data: two points of one instrument', () => {
    const two: RvData = { ...data, t: data.t.slice(0, 2), y: data.y.slice(0, 2), dy: data.dy.slice(0, 2), instrument: new Int32Array(2), instrumentNames: ['A'] }
    const opts = { minPeriod: 1, maxPeriod: 50 }
    expectSame(keplerianPeriodogram(two, opts), keplerianPeriodogramTypeScript(two, opts))
  })
})

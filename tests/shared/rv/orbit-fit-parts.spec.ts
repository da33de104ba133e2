import { describe, it, expect } from 'vitest'
import { toRvData } from '../../../shared/rv/orbit-data.ts'
import { linearColumn, linearDesignRow, linearScratch, solveLinear, trendTerms } from '../../../shared/rv/orbit-fit-linear.ts'
import { buildLayout, unpack, project, wrapDegrees } from '../../../shared/rv/orbit-fit-layout.ts'
import { jitterError } from '../../../shared/rv/orbit-fit-uncertainty.ts'
import { invertSymmetric } from '../../../shared/rv/linalg.ts'

const { data } = toRvData({
  time: [10, 11, 13, 17, 20, 26, 30, 31],
  rv: [1, 3, 2, 5, 4, 7, 8, 6],
  error: [1, 1, 2, 1, 0.5, 1, 2, 1],
  instrument: ['A', 'B', 'A', 'B', 'A', 'B', 'A', 'B'],
})

describe('orbit-fit pieces', () => {
  it('the design row and the column accessor describe the same linear part', () => {
    const row = new Float64Array(4)
    for (let i = 0; i < data.t.length; i++) {
      linearDesignRow(data, i, 20, 2, row)
      for (let j = 0; j < 4; j++) expect(row[j]).toBe(linearColumn(data, 2, 20, i, j))
    }
    expect([trendTerms('none'), trendTerms('linear'), trendTerms('quadratic')]).toEqual([0, 1, 2])
  })

  it('solves offsets and a quadratic trend as the normal equations of a dense least-squares fit', () => {
    // slow reference: build the dense weighted design matrix and invert AᵀWA directly
    const n = data.t.length, p = 4, epoch = 20
    const w = Array.from(data.dy, (s) => 1 / (s * s))
    const ata = new Float64Array(p * p), atb = new Float64Array(p), row = new Float64Array(p)
    for (let i = 0; i < n; i++) {
      linearDesignRow(data, i, epoch, 2, row)
      for (let a = 0; a < p; a++) { atb[a] += w[i] * row[a] * data.y[i]; for (let b = 0; b < p; b++) ata[a * p + b] += w[i] * row[a] * row[b] }
    }
    const { inv } = invertSymmetric(ata, p)
    const ref = Array.from({ length: p }, (_, a) => { let s = 0; for (let b = 0; b < p; b++) s += inv[a * p + b] * atb[b]; return s })
    const s = linearScratch(p)
    const resid = new Float64Array(n)
    expect(solveLinear(data, epoch, p, new Float64Array(n), w, s, resid)).toBe(true)
    for (let a = 0; a < p; a++) expect(s.beta[a]).toBeCloseTo(ref[a], 9)
    for (let i = 0; i < n; i++) {
      linearDesignRow(data, i, epoch, 2, row)
      let m = 0
      for (let a = 0; a < p; a++) m += row[a] * ref[a]
      expect(resid[i]).toBeCloseTo(data.y[i] - m, 9)
    }
  })

  it('lays out √e cos ω, √e sin ω and maps them back; projection keeps e ≤ E_MAX', () => {
    const { layout, x0 } = buildLayout(data, { planets: [{ period: 5, K: 3, e: 0.25, omegaDeg: 120, tc: 12 }] })
    expect(layout.nFree).toBe(5)
    const p = unpack(layout, x0, 0)
    expect(p.e).toBeCloseTo(0.25, 12)
    expect(p.omega * 180 / Math.PI).toBeCloseTo(120, 10)
    const x = Float64Array.from(x0)
    x[layout.layouts[0].iA] = 2; x[layout.layouts[0].iB] = 2
    project(layout, x)
    expect(unpack(layout, x, 0).e).toBeCloseTo(0.99, 12)
    expect(wrapDegrees(350)).toBe(-10)
    expect(wrapDegrees(-190)).toBe(170)
  })

  it('jitter error is the Fisher bound 1/√(2 s² Σ 1/V²), undefined at s = 0', () => {
    expect(jitterError(2, 0.5)).toBeCloseTo(1 / Math.sqrt(4), 12)
    expect(jitterError(0, 0.5)).toBeNaN()
  })
})

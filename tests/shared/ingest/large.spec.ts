import { describe, expect, it } from 'vitest'
import { createRandom } from '../../../shared/math/index.ts'
import { detectTable, parseTable } from '../../../shared/ingest/index.ts'

// Correctness on a large invented table. Times are logged for information only; the speed target
// (100 000 rows detected and parsed well within a second or two) is not asserted here.

function table(n: number, seed: number): string {
  const r = createRandom(seed)
  const lines = ['# bjd rv err inst fwhm bis']
  for (let i = 0; i < n; i++) {
    lines.push(`${(2455000 + i * 0.01).toFixed(5)} ${(r.normal() * 10).toFixed(3)} ${(1 + r.next()).toFixed(3)} ${['SpecA', 'SpecB', 'SpecC'][i % 3]} ${(7000 + r.next()).toFixed(2)} ${(r.normal() * 10).toFixed(2)}`)
  }
  return lines.join('\n') + '\n'
}

describe('a 100 000-row table', () => {
  const text = table(100_000, 7)

  it('is detected and parsed completely', () => {
    const t0 = performance.now()
    const d = detectTable(text)
    const t1 = performance.now()
    const r = parseTable(text, d.mapping)
    const t2 = performance.now()
    console.info(`ingest of 100 000 rows: detect ${(t1 - t0).toFixed(0)} ms, parse ${(t2 - t1).toFixed(0)} ms`)
    expect(d.rowCount).toBe(100_000)
    expect(d.mapping.columns.map(c => c.indicator ?? c.role)).toEqual(['time', 'rv', 'error', 'instrument', 'fwhm', 'bisector_span'])
    expect(r.rows).toHaveLength(100_000)
    expect(r.problemCount).toBe(0)
    expect(r.instruments).toEqual([{ name: 'SpecA', count: 33_334 }, { name: 'SpecB', count: 33_333 }, { name: 'SpecC', count: 33_333 }])
    expect(r.rows[99_999]!.line).toBe(100_001)
    expect(r.rows[99_999]!.time).toBeCloseTo(2455999.99, 6)
  })

  it('finds one bad row among them', () => {
    const lines = text.split('\n')
    lines[54_321] = lines[54_321]!.replace(/^(\S+) \S+/, '$1 oops')
    const bad = lines.join('\n')
    const r = parseTable(bad, detectTable(bad).mapping)
    expect(r.problems).toEqual([{ line: 54_322, column: 'rv', message: "velocity 'oops' is not a number" }])
    expect(r.rows).toHaveLength(99_999)
  })
})

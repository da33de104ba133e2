import { describe, it, expect } from 'vitest'
import { readFileSync } from 'node:fs'
import { expectClose } from '../../helpers/expect-close.ts'
import { fixtureGrid } from './periodogram-fixtures.ts'
import { frequencyGrid, periodogram, periodogramDirect, findPeaks, baluevFap, falseAlarmLevel } from '../../../shared/rv/periodogram.ts'

// Published data: fixtures/published/51peg-six-instruments.txt (Birkby et al. 2017, AJ 153, 138,
// Table 1; attribution in fixtures/published/README.md), ELODIE rows. Reference powers and FAP:
// fixtures/periodogram/published-51peg-elodie.json from astropy 5.2.1
// (scripts/reference/periodogram_reference.py). Published period: P = 4.2307869 d.
interface Ref {
  grid: { f0: number; df: number; count: number }
  stride: number
  powerFloatingStrided: number[]
  top: { index: number; frequency: number; period: number; power: number }
  astropyFapMaxFrequency: number
  topFapBaluev: number
  falseAlarmLevels: Array<{ fap: number; power: number }>
}
const ref = JSON.parse(readFileSync(new URL('../../../fixtures/periodogram/published-51peg-elodie.json', import.meta.url), 'utf8')) as Ref
const rows = readFileSync(new URL('../../../fixtures/published/51peg-six-instruments.txt', import.meta.url), 'utf8')
  .split('\n').map((l) => l.trim().split(/\s+/)).filter((r) => r[3] === 'ELODIE')
const t = Float64Array.from(rows, (r) => Number(r[0]))
const y = Float64Array.from(rows, (r) => Number(r[1]))
const dy = Float64Array.from(rows, (r) => Number(r[2]))
const fg = fixtureGrid(t)

describe('51 Pegasi, ELODIE (published data)', () => {
  it('has the 153 ELODIE rows and the fixture grid', () => {
    expect(t.length).toBe(153)
    const g = frequencyGrid(t, fg)
    expect(g.count).toBe(ref.grid.count)
    expectClose(g.df, ref.grid.df, { rtol: 1e-13 }, 'df')
  })

  it('direct and auto power match astropy 5.2.1 on the grid (1e-9 and 1e-4 of the peak)', () => {
    const d = periodogramDirect(t, y, dy, fg)
    const a = periodogram(t, y, dy, fg)
    const strided = Float64Array.from(ref.powerFloatingStrided, (_, i) => d.power[i * ref.stride])
    expectClose(strided, ref.powerFloatingStrided, { atol: 1e-9 }, 'direct')
    for (let i = 0; i < ref.powerFloatingStrided.length; i++) {
      expect(Math.abs(a.power[i * ref.stride] - ref.powerFloatingStrided[i])).toBeLessThanOrEqual(1e-4 * ref.top.power)
    }
  })

  it('top peak is the published 4.2307869-day period, with astropy 5.2.1 Baluev FAP and levels', () => {
    const r = periodogram(t, y, dy, fg)
    const [top] = findPeaks(t, y, dy, r, { count: 3 })
    expect(top.gridIndex).toBe(ref.top.index)
    expectClose(top.period, 4.2307869, { rtol: 2e-4 }, 'period (Birkby et al. 2017)')
    expect(top.power).toBeGreaterThanOrEqual(ref.top.power - 1e-12)
    expectClose(baluevFap(ref.top.power, t.length, t, ref.astropyFapMaxFrequency, { dy }), ref.topFapBaluev, { rtol: 1e-6 }, 'FAP')
    for (const lv of ref.falseAlarmLevels) {
      expectClose(falseAlarmLevel(lv.fap, t.length, t, ref.astropyFapMaxFrequency, { dy }), lv.power, { atol: 1e-8 }, `level ${lv.fap}`)
    }
    expect(top.fap).toBeLessThan(1e-50)
  })
})

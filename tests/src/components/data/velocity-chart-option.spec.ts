import { describe, expect, it } from 'vitest'
import type { Measurement } from '@/api/types.ts'
import {
  EXCLUDED_COLOR, EXCLUDED_NAME, buildVelocityChart, instrumentStyles, timeAxisLabel, timeOffset,
} from '@/components/data/velocity-chart-option.ts'

const m = (id: number, instrument: string, time: number, excluded = false): Measurement => ({
  id, datasetId: 1, instrument, time, rv: id, error: 2, indicators: {}, excluded,
  excludedReason: excluded ? 'bad night' : null, excludedBy: null, excludedAt: null,
})

describe('velocity chart option', () => {
  it('reduces full Julian dates by the shared display epoch (multiples of 10 000 d, shared/time displayOffset) and labels the axis with it', () => {
    expect(timeOffset([2452944.7, 2454500.1])).toBe(2450000)
    expect(timeOffset([2460100.2])).toBe(2460000)
    expect(timeOffset([150.5, 300])).toBe(0)
    expect(timeAxisLabel('BJD', 2450000)).toBe('BJD − 2\u2009450\u2009000 [d]')
    expect(timeAxisLabel('days', 0)).toBe('days [d]')
  })

  it('gives each instrument its own colour and symbol, stable by name', () => {
    const styles = instrumentStyles(['South', 'North', 'South', 'East'])
    expect([...styles.keys()]).toEqual(['East', 'North', 'South'])
    const colours = new Set([...styles.values()].map((s) => s.color))
    const symbols = new Set([...styles.values()].map((s) => s.symbol))
    expect(colours.size).toBe(3)
    expect(symbols.size).toBe(3)
  })

  it('draws excluded points as a separate hollow grey series only when asked', () => {
    const data = [m(1, 'North', 2455000), m(2, 'North', 2455001, true), m(3, 'South', 2455002)]
    const shown = buildVelocityChart({ measurements: data, timeScale: 'JD', showExcluded: true })
    expect(shown.counts).toEqual({ North: 1, South: 1, [EXCLUDED_NAME]: 1 })
    expect(shown.included).toBe(2)
    expect(shown.excluded).toBe(1)
    const series = shown.option.series as Array<{ type: string; name: string; itemStyle?: { borderColor?: string } }>
    const excludedScatter = series.find((s) => s.type === 'scatter' && s.name === EXCLUDED_NAME)
    expect(excludedScatter?.itemStyle?.borderColor).toBe(EXCLUDED_COLOR)
    // one scatter and one error-bar series per instrument, plus the excluded pair
    expect(series.filter((s) => s.type === 'custom')).toHaveLength(3)

    const hidden = buildVelocityChart({ measurements: data, timeScale: 'JD', showExcluded: false })
    expect(hidden.excluded).toBe(0)
    expect((hidden.option.series as unknown[]).length).toBe(4)
  })

  it('labels both axes with units', () => {
    const { option } = buildVelocityChart({ measurements: [m(1, 'A', 2455000.5)], timeScale: 'BJD', showExcluded: true })
    expect((option.xAxis as { name: string }).name).toBe('BJD − 2\u2009450\u2009000 [d]')
    expect((option.yAxis as { name: string }).name).toBe('RV [m/s]')
  })

  it('titles the axes with the time system and, in the corrected view, what was removed', () => {
    const { option } = buildVelocityChart({ measurements: [m(1, 'A', 2459000.5)], timeScale: 'BJD_TDB', showExcluded: true, yName: 'RV − instrument median [m/s]' })
    expect((option.xAxis as { name: string }).name).toBe('BJD_TDB − 2\u2009450\u2009000 [d]')
    expect((option.yAxis as { name: string }).name).toBe('RV − instrument median [m/s]')
  })
})

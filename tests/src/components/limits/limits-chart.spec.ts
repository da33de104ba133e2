import { describe, expect, it } from 'vitest'
import { logEdges, fractionColour, limitsChartOption, limitsTableCsv } from '@/components/limits/limits-chart.ts'
import { RESULT } from './fixture.ts'


describe('the completeness map option', () => {
  it('puts cell edges halfway in log between grid values', () => {
    const e = logEdges([1, 10, 100])
    expect(e.map((v) => Math.log10(v))).toEqual([-0.5, 0.5, 1.5, 2.5].map((v) => expect.closeTo(v, 12)))
  })

  it('draws one rectangle per cell, both contours (skipping unreached periods), the planets and the giants inside the period range', () => {
    const o = limitsChartOption(RESULT) as { series: Array<{ name: string; data: unknown[] }>; xAxis: { type: string; name: string }; yAxis: { name: string } }
    expect(o.xAxis).toMatchObject({ type: 'log', name: 'Period (days)' })
    expect(o.yAxis.name).toBe('M sin i (Earth masses)')
    const by = (n: string) => o.series.find((s) => s.name === n)!
    expect(by('Recovered fraction').data).toHaveLength(12)
    expect(by('50 % completeness').data).toHaveLength(3)
    expect(by('90 % completeness').data).toHaveLength(2)
    expect(by('Planets of the model').data).toHaveLength(1)
    expect(by('Solar System giants (at this star)').data).toHaveLength(0) // 4332 d lies beyond the grid's 316 d edge
  })

  it('colours from white (none recovered) to blue (all)', () => {
    expect(fractionColour(0)).toBe('rgb(255,255,255)')
    expect(fractionColour(1)).toBe('rgb(21,101,192)')
  })

  it('writes the paper table as CSV, saying where a level is not reached', () => {
    const csv = limitsTableCsv(RESULT).split('\r\n')
    expect(csv[0]).toBe('period_from_d,period_to_d,msini_50pct_earth,msini_90pct_earth,mean_completeness')
    expect(csv[2]).toBe('10,100,20.0,not reached,0.500')
  })
})

import { describe, expect, it } from 'vitest'
import type { PlanResponse } from '@shared/api/plan.ts'
import { planChartOption } from '@/components/plan/plan-chart.ts'

describe('the planner chart option', () => {
  it('draws the band between the 16 and 84 % predictions and marks each recommended instant, on JD (UTC) minus a whole day', () => {
    const p = {
      window: { startJd: 2461384.7, endJd: 2461386.7, stepMinutes: 20 }, instrument: 'SPEC-A',
      curve: { jd: [2461384.7, 2461385.7, 2461386.7], lo: [-1, 0, 1], mid: [0, 1, 2], hi: [1, 2, 3] },
      recommendations: [{ jdUtc: 2461385.2 }, { jdUtc: 2461386.1 }],
    } as unknown as PlanResponse
    const o = planChartOption(p) as { xAxis: { name: string }; yAxis: { name: string }; series: Array<{ name: string; data: number[][]; markLine?: { data: Array<{ xAxis: number }> } }> }
    expect(o.xAxis.name).toBe('JD (UTC) − 2461384')
    expect(o.yAxis.name).toContain('(m/s)')
    // one polygon: the 84 % points forwards, then the 16 % points (drawn backwards)
    expect(o.series[0].data.map((d) => d[1])).toEqual([1, 2, 3, -1, 0, 1])
    const drawn = (o.series[0] as unknown as { renderItem: (p: { dataIndex: number }, api: { coord: (q: number[]) => number[] }) => { shape: { points: number[][] } } | null })
      .renderItem({ dataIndex: 0 }, { coord: (q) => q })!.shape.points
    expect(drawn.map((q) => q[1])).toEqual([1, 2, 3, 1, 0, -1])
    expect(o.series[1].markLine!.data.map((d) => d.xAxis)).toEqual([expect.closeTo(1.2, 9), expect.closeTo(2.1, 9)])
  })
})

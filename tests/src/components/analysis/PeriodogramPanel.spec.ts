// @vitest-environment happy-dom
// The periodogram panel draws the plot copy by default and, on "Every frequency", the stored full
// curve (more points than Math.max(...) can take) with the peaks; a dropped full curve shows the
// server's message and keeps the plot copy.
import { describe, expect, it, vi, beforeEach } from 'vitest'
import type { PeriodogramRun } from '@shared/api/analyses.ts'
import { mountWithApp, settle } from '../../mount.ts'
import PeriodogramPanel from '@/components/analysis/PeriodogramPanel.vue'
import { asyncState } from '@/stores/async-state.ts'
import { fetchPeriodogramFull } from '@/api/periodogram-full.ts'
import { ApiError } from '@/api/http.ts'

vi.mock('@/api/periodogram-full.ts', () => ({ fetchPeriodogramFull: vi.fn() }))

const N = 150_000
function run(points: number): PeriodogramRun {
  const period = Array.from({ length: points }, (_, i) => 1 + (999 * i) / (points - 1))
  const power = period.map((p) => (Math.abs(p - 12.4) < 0.05 ? 0.8 : 0.05))
  return {
    id: 7, starId: 1, kind: 'rv', indicator: null, modelVersionId: null,
    settings: { minPeriod: 1, maxPeriod: 1000, oversample: 10, instruments: null },
    data: { instruments: ['A'], nPoints: 50, nExcluded: 0, hash: 'x', firstTime: 2458000, lastTime: 2459000, baseline: 1000 },
    result: {
      grid: { minFrequency: 0.001, maxFrequency: 1, count: N, method: 'fast' },
      curve: { period, power }, window: { period: [1, 1000], power: [0.1, 0.2] }, windowPeaks: [],
      peaks: [{ period: 12.4, frequency: 1 / 12.4, power: 0.8, fap: 1e-9, aliases: [] }],
      fapLevels: [{ fap: 0.1, power: 0.09 }, { fap: 0.01, power: 0.11 }, { fap: 0.001, power: 0.13 }],
      downsampling: points < N ? 'plot copy; full curve stored (0.6 MB): GET /api/periodograms/7?full=1' : 'full grid (150000 frequencies)',
    },
    createdBy: null, createdAt: '2026-12-02T00:00:00Z',
  }
}

const ChartFrame = { name: 'ChartFrame', props: ['option', 'fileName', 'height'], template: '<div class="chart-stub" />' }
function mountPanel() {
  const state = asyncState<PeriodogramRun>(run(4000))
  const w = mountWithApp(PeriodogramPanel, {
    props: { state, title: 'Periodogram', testId: 'pg', canAdd: false, fileName: 'pg', emptyText: 'none' },
    global: { stubs: { ChartFrame } },
  })
  const points = () => ((w.findComponent({ name: 'ChartFrame' }).props('option') as { series: Array<{ name: string; data: unknown[] }> })
    .series.find((s) => s.name === 'Power')!.data.length)
  return { w, points }
}

beforeEach(() => { vi.mocked(fetchPeriodogramFull).mockReset() })

describe('PeriodogramPanel', () => {
  it('draws the plot copy, then every frequency on request (peaks kept)', async () => {
    vi.mocked(fetchPeriodogramFull).mockResolvedValue(run(N))
    const { w, points } = mountPanel()
    await settle()
    expect(points()).toBe(4000)
    expect(w.find('[data-test="pg-downsampling"]').text()).toMatch(/full curve stored/)
    await w.find('[data-test="pg-full"] input').setValue(true)
    await settle()
    expect(fetchPeriodogramFull).toHaveBeenCalledWith(7)
    expect(points()).toBe(N)
    const option = w.findComponent({ name: 'ChartFrame' }).props('option') as { series: Array<{ name: string; data: unknown[] }> }
    expect(option.series.find((s) => s.name === 'Peaks')!.data).toHaveLength(1)
    expect(w.find('[data-test="pg-downsampling"]').text()).toMatch(/full grid/)
    w.unmount()
  })

  it("keeps the plot copy and shows the server's message when the full curve was dropped", async () => {
    vi.mocked(fetchPeriodogramFull).mockRejectedValue(new ApiError(409, 'conflict', "full: full curve dropped on 2026-12-01 to keep the team's stored curves under 128.0 MB; run the periodogram again to recompute it.", 'full'))
    const { w, points } = mountPanel()
    await settle()
    await w.find('[data-test="pg-full"] input').setValue(true)
    await settle()
    expect(points()).toBe(4000)
    expect(w.find('[data-test="pg-full-error"]').text()).toMatch(/dropped on 2026-12-01.*run the periodogram again/)
    w.unmount()
  })
})

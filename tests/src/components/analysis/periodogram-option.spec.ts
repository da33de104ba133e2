import { describe, expect, it } from 'vitest'
import type { PeriodogramRun } from '@shared/api/analyses.ts'
import {
  buildPeriodogramChart, coincidences, fapLabel, formatFap, scatterAboutMeans, startAmplitude, KEPLERIAN_SERIES,
} from '@/components/analysis/periodogram-option.ts'
import { formatWithError } from '@/components/analysis/results-format.ts'
import { histogram } from '@/components/analysis/model-plots-option.ts'

function run(peaks: Array<{ period: number; power: number; fap: number }>, baseline = 1000): PeriodogramRun {
  return {
    id: 1, starId: 1, kind: 'rv', indicator: null, modelVersionId: null,
    settings: { minPeriod: 1.1, maxPeriod: baseline, oversample: 10, instruments: null },
    data: { instruments: ['A'], nPoints: 50, nExcluded: 0, hash: 'x', firstTime: 2458000, lastTime: 2458000 + baseline, baseline },
    result: {
      grid: { minFrequency: 1 / baseline, maxFrequency: 1 / 1.1, count: 100, method: 'direct' },
      curve: { period: [1.1, 10, 100, baseline], power: [0.01, 0.2, 0.05, 0.01] },
      window: { period: [1.1, 10, 100, baseline], power: [0.1, 0.05, 0.02, 0.3] },
      windowPeaks: [],
      peaks: peaks.map((p) => ({ ...p, frequency: 1 / p.period, aliases: [] })),
      fapLevels: [{ fap: 0.1, power: 0.09 }, { fap: 0.01, power: 0.11 }, { fap: 0.001, power: 0.13 }],
      downsampling: 'none',
    },
    createdBy: null, createdAt: '2026-12-02T00:00:00Z',
  }
}

describe('periodogram helpers', () => {
  it('flags a velocity peak an indicator shares within one peak width (1/baseline), not a distant or insignificant one', () => {
    const rv = run([{ period: 23, power: 0.4, fap: 1e-8 }, { period: 12.4, power: 0.3, fap: 1e-6 }]).result.peaks
    // 1/23 − 1/23.4 ≈ 7.4e-4 < 1/1000: the same peak; 1/12.4 is far from both indicator peaks.
    const indicator = run([{ period: 23.4, power: 0.3, fap: 0.001 }, { period: 40, power: 0.2, fap: 0.5 }])
    const found = coincidences(rv, [{ name: 's_index', run: indicator }], 1000)
    expect(found).toEqual([{ period: 23, indicator: 's_index', indicatorPeriod: 23.4, indicatorFap: 0.001 }])
    const weak = run([{ period: 23.1, power: 0.05, fap: 0.6 }])
    expect(coincidences(rv, [{ name: 'fwhm', run: weak }], 1000)).toEqual([])
  })

  it('starts K from the power: a pure sinusoid of amplitude 5 m/s (power 1) gives K = 5', () => {
    // Variance of a sinusoid of amplitude K is K²/2 (common practice); 400 evenly spaced samples over whole cycles.
    const points = Array.from({ length: 400 }, (_, i) => ({ instrument: 'A', rv: 5 * Math.sin((2 * Math.PI * i) / 40) + 100 }))
    const scatter = scatterAboutMeans(points)
    expect(startAmplitude(1, scatter)).toBeCloseTo(5 * Math.sqrt(400 / 399), 6)
    expect(startAmplitude(0, scatter)).toBe(1)
  })

  it('draws power on a log period axis in days with the three labelled false-alarm levels and a window beneath', () => {
    const option = buildPeriodogramChart({ run: run([{ period: 10, power: 0.2, fap: 1e-5 }]), title: 't', showWindow: true })
    const xAxes = option.xAxis as Array<{ type: string; name: string }>
    expect(xAxes.map((a) => a.type)).toEqual(['log', 'log'])
    expect(xAxes[1]!.name).toBe('Period [d]')
    const series = option.series as Array<{ name: string; markLine?: { data: Array<{ name?: string; yAxis?: number }> } }>
    const levels = series[0]!.markLine!.data.filter((d) => d.yAxis !== undefined)
    expect(levels.map((d) => d.name)).toEqual(['FAP 10 %', 'FAP 1 %', 'FAP 0.1 %'])
    expect(levels.map((d) => d.yAxis)).toEqual([0.09, 0.11, 0.13])
    expect(series.map((s) => s.name)).toEqual(['Power', 'Peaks', 'Window'])
    expect((option.yAxis as Array<{ name: string }>)[0]!.name).toBe('Power (normalised)')
  })

  it('draws the Keplerian periodogram beside the sinusoid power when the run has one, with a legend', () => {
    const r = run([{ period: 10, power: 0.2, fap: 1e-5 }])
    r.result.keplerian = {
      curve: { period: [1, 10, 100], power: [0.1, 0.6, 0.2] }, peaks: [{ period: 10, frequency: 0.1, power: 0.6, dchi2: 300, e: 0.3 }],
      count: 3, oversample: 3, cells: [{ e: 0, minPeriod: 0 }, { e: 0.3, minPeriod: 5 }],
    }
    const option = buildPeriodogramChart({ run: r, title: 't', showWindow: false })
    const series = option.series as Array<{ name: string; data: number[][] }>
    expect(series.map((s) => s.name)).toEqual(['Power', 'Peaks', KEPLERIAN_SERIES])
    expect(series[2]!.data).toEqual([[1, 0.1], [10, 0.6], [100, 0.2]])
    expect((option.legend as { data: string[] }).data).toEqual(['Power', KEPLERIAN_SERIES])
    // the power axis makes room for the taller Keplerian curve
    expect((option.yAxis as Array<{ max: number }>)[0]!.max).toBeGreaterThanOrEqual(0.6)
  })

  it('tops the power axis at a round 0.05 step, without float noise in its label', () => {
    const r = run([{ period: 10, power: 0.31, fap: 1e-5 }])
    r.result.curve.power = [0.01, 0.31, 0.05, 0.01]
    const option = buildPeriodogramChart({ run: r, title: 't', showWindow: false })
    expect(String((option.yAxis as Array<{ max: number }>)[0]!.max)).toBe('0.35')
  })

  it('writes FAP and fitted values for the screen', () => {
    expect([0.1, 0.01, 0.001].map(fapLabel)).toEqual(['10 %', '1 %', '0.1 %'])
    expect(formatFap(1e-12)).toBe('< 1e-10')
    expect(formatFap(4.7e-6)).toBe('4.7e-6')
    expect(formatWithError(12.40261, 0.00153)).toBe('12.4026 ± 0.0015')
    expect(formatWithError(0.1, 0)).toBe('0.1000 (fixed)')
    expect(formatWithError(3, null)).toBe('3.000 (± undetermined)')
  })

  it('bins every residual once', () => {
    const values = Array.from({ length: 101 }, (_, i) => (i - 50) / 10)
    const bins = histogram(values)
    expect(bins.reduce((a, b) => a + b.count, 0)).toBe(101)
    expect(bins[0]!.from).toBe(-5)
    expect(bins[bins.length - 1]!.to).toBeCloseTo(5, 12)
  })
})

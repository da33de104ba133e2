// The tables and the diff of a report from a small hand-made snapshot (this test's own numbers).
import { describe, expect, it } from 'vitest'
import type { ReportSnapshot } from '../../../shared/api/reports.ts'
import { parameterRows, plainInterval, plainValue } from '../../../shared/report/table.ts'
import { latexTables } from '../../../shared/report/latex-solution.ts'
import { diffSnapshots, snapshotFingerprint } from '../../../shared/report/diff.ts'

const u = (v: number | null) => v
function snapshot(over: { K?: number; exclusions?: ReportSnapshot['data']['exclusions']; sampled?: boolean } = {}): ReportSnapshot {
  const planet = {
    label: 'b', period: 12.4026, K: over.K ?? 9.4321, e: 0.145, omegaDeg: 11.2, tp: 2458882.61, tc: 2458872.384,
    uncertainty: { period: u(0.00153), K: u(0.27), e: u(0.027), omegaDeg: u(11.3), tp: u(0.4), tc: u(0.121) },
    msiniMjup: 0.1012, msiniMearth: 32.04, aAu: 0.10203, derivedUncertainty: { msiniMjup: 0.0041, msiniMearth: 1.3, aAu: 0.00149 }, insolationEarth: null,
  }
  return {
    format: 'starsway-report/1', title: 'Probe: one planet', frozenAt: '2026-12-02T00:00:00.000Z', frozenBy: { id: 1, name: 'A' },
    product: { name: 'Starsway', version: '0.1.0', commit: null },
    star: { id: 1, name: 'Probe_1', massMsun: 0.92, massErrMsun: 0.04, radiusRsun: null, teffK: null, luminosityLsun: null, raDeg: null, decDeg: null },
    model: { id: 1, name: 'one', version: 2, versionId: 5, spec: { planets: [{ period: 12.4, K: 9 }], trend: 'none' }, note: 'fitted', author: null, createdAt: '2026-12-02T00:00:00.000Z' },
    result: {
      planets: [planet], instruments: [{ name: 'Kestrel_2', n: 10, offset: -12.391, offsetErr: 0.23, jitter: 1.85, jitterErr: 0.19, rms: 2.31 }],
      trend: null, stats: { chi2: 10, reducedChi2: 1, lnL: -20, bic: 50, aic: 45, rms: 2.3, nParams: 7, nPoints: 10, converged: true, status: 'converged', message: '', iterations: 12 },
      epoch: 2458800, residuals: [], warnings: [], data: { instruments: ['Kestrel_2'], nPoints: 10, nExcluded: 0, hash: 'h', firstTime: 0, lastTime: 1, baseline: 1 },
    },
    data: { hash: over.exclusions?.length ? 'b'.repeat(64) : 'a'.repeat(64), nIncluded: 10, nExcluded: over.exclusions?.length ?? 0, instruments: ['Kestrel_2'], changedSinceFit: false, points: [], exclusions: over.exclusions ?? [] },
    periodogram: null, residualPeriodogram: null, comparison: null,
    sampling: over.sampled ? {
      runId: 3, settings: { walkers: 32, steps: 2000, burn: 500, thin: 1, seed: 1 },
      parameters: [{ name: 'K b', unit: 'm/s', median: 9.41, lo: 9.12, hi: 9.77, mean: 9.4, sd: 0.3 }],
      diagnostics: { converged: true, acceptance: 0.3, warnings: [] }, corner: { names: [], units: [], columns: [] }, finishedAt: null,
    } : null,
    settings: { fit: { trend: 'none', instruments: null, iterations: 12, status: 'converged' }, sampling: null },
    methods: { text: '', references: [] },
  }
}

describe('parameter table', () => {
  it('has fitted and derived rows with stable keys for comments', () => {
    const rows = parameterRows(snapshot())
    expect(rows.map((r) => r.key)).toEqual(['b.period', 'b.K', 'b.e', 'b.omegaDeg', 'b.tc', 'b.tp', 'b.msiniMjup', 'b.msiniMearth', 'b.aAu'])
    expect(rows.find((r) => r.key === 'b.msiniMjup')!.kind).toBe('derived')
  })
  it('prints values rounded by their uncertainty (PDG rule)', () => {
    expect(plainValue(12.4026, 0.00153)).toBe('12.4026 ± 0.0015') // digits 153: two
    expect(plainValue(9.4321, 0.27)).toBe('9.43 ± 0.27')
    expect(plainValue(11.2, 11.3)).toBe('11 ± 11')
    expect(plainValue(0.25, 0)).toBe('0.25 (fixed)')
    expect(plainInterval(9.41, 0.36, 0.29)).toBe('9.41 +0.36 −0.29')
  })
})

describe('LaTeX tables from a snapshot', () => {
  it('has quantities as rows and planets as columns, units in their own column, $\\pm$ for fits', () => {
    const tex = latexTables(snapshot())
    expect(tex).toContain('Parameter & Unit & b \\\\')
    expect(tex).toContain('Period $P$ & d & $12.4026 \\pm 0.0015$ \\\\')
    expect(tex).toContain('Semi-amplitude $K$ & m\\,s$^{-1}$ & $9.43 \\pm 0.27$ \\\\')
    // times against a reduced epoch, named in a note; the scale was not recorded in this snapshot: plain "JD"
    expect(tex).toContain('Conjunction $T_\\mathrm{c}$ & JD$^\\dagger$ & $8872.38 \\pm 0.12$ \\\\')
    expect(tex).toContain('$^\\dagger$ JD $-$ 2\\,450\\,000')
    expect(tex).toContain('Kestrel\\_2 & 10 & $-12.39 \\pm 0.23$ & $1.85 \\pm 0.19$ & $2.31$ \\\\')
    expect(tex).toContain('\\begin{table}')
    expect(tex).toMatch(/\\caption\{Orbital solution for Probe\\_1/)
    // the first line is a LaTeX comment naming the star and the data hash (comments need no escaping)
    expect(tex.split('\n')[0]).toMatch(/^% Probe_1: one, model version 2; frozen .* \(data a{12}\)\.$/)
  })
  it('uses the posterior interval where the solution was sampled, and ± where both sides print alike', () => {
    // K b: median 9.41, +0.36 −0.29; the smaller side 0.29 has digits 290 ≤ 354 → two digits at 0.01
    expect(latexTables(snapshot({ sampled: true }))).toContain('$9.41^{+0.36}_{-0.29}$')
  })
})

describe('diff between versions', () => {
  it('is empty for the same snapshot and names data, exclusions and values that changed', () => {
    expect(diffSnapshots(snapshot(), snapshot())).toEqual([])
    const next = snapshot({ K: 9.6, exclusions: [{ id: 7, instrument: 'Kestrel_2', time: 1, reason: 'clouds', by: null, at: null }] })
    const changes = diffSnapshots(snapshot(), next)
    expect(changes.map((c) => c.field)).toEqual(['data.hash', 'data.exclusions', 'b.K'])
    expect(changes[1]!.to).toBe('1 excluded; newly excluded 7')
    expect(snapshotFingerprint(next)).not.toBe(snapshotFingerprint(snapshot()))
  })
})

// The report PDF from a hand-made snapshot (this test's own numbers): Unicode text prints as written
// (read back by Debian's pdftotext, poppler-utils), the solution grid and the corner plot are there.
import { execFileSync } from 'node:child_process'
import { existsSync, mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import type { ReportSnapshot } from '../../shared/api/reports.ts'
import { createRandom } from '../../shared/math/random.ts'
import { reportPdf } from '../../server/reports/pdf.ts'
import { REFERENCES } from '../../shared/report/methods.ts'

function snapshot(): ReportSnapshot {
  const rnd = createRandom(7)
  const planet = {
    label: 'b', period: 12.4026, K: 9.4321, e: 0.145, omegaDeg: 11.2, tp: 2458882.61, tc: 2458872.384,
    uncertainty: { period: 0.00153, K: 0.27, e: 0.027, omegaDeg: 11.3, tp: 0.4, tc: 0.121 },
    msiniMjup: 0.1012, msiniMearth: 32.04, aAu: 0.10203, derivedUncertainty: { msiniMjup: 0.0041, msiniMearth: 1.3, aAu: 0.00149 }, insolationEarth: null,
  }
  const points = Array.from({ length: 40 }, (_, i) => {
    const time = 2458800 + i * 3.7
    const model = 9.4 * Math.sin((2 * Math.PI * (time - 2458872.384)) / 12.4026)
    const rv = model + rnd.normal() * 1.5
    return { id: i + 1, instrument: i % 3 ? 'Kestrel_2' : 'Osprey', time, rv, error: 1.5, included: i !== 5, model, residual: rv - model }
  })
  const n = 600
  const P = Array.from({ length: n }, () => 12.4026 + 0.0015 * rnd.normal())
  const K = P.map((p) => 9.43 + 0.27 * rnd.normal() + 30 * (p - 12.4026))
  const e = Array.from({ length: n }, () => Math.abs(0.145 + 0.027 * rnd.normal()))
  return {
    format: 'starsway-report/1', title: 'Glyphs: Prša, ΔBIC, χ², ω, M☉', frozenAt: '2026-12-02T00:00:00.000Z', frozenBy: { id: 1, name: 'Ana Prša' },
    product: { name: 'Starsway', version: '0.1.0', commit: null },
    star: { id: 1, name: 'Probe_1', massMsun: 0.92, massErrMsun: 0.04, radiusRsun: null, teffK: null, luminosityLsun: null, raDeg: null, decDeg: null },
    model: { id: 1, name: 'one', version: 2, versionId: 5, spec: { planets: [], trend: 'linear' }, note: '', author: null, createdAt: '2026-12-02T00:00:00.000Z' },
    result: {
      planets: [planet], instruments: [
        { name: 'Kestrel_2', n: 26, offset: -12.391, offsetErr: 0.23, jitter: 1.85, jitterErr: 0.19, rms: 2.31 },
        { name: 'Osprey', n: 14, offset: 3.2, offsetErr: 0.4, jitter: 0.9, jitterErr: 0.3, rms: 1.9 }],
      trend: { kind: 'linear', slope: 0.0021, slopeErr: 0.0004, curvature: 0, curvatureErr: null, epoch: 2458800 },
      stats: { chi2: 38.2, reducedChi2: 1.06, lnL: -80.1, bic: 190.2, aic: 180.1, rms: 2.3, nParams: 9, nPoints: 39, converged: true, status: 'converged', message: '', iterations: 12 },
      epoch: 2458800, residuals: [], warnings: [], data: { instruments: ['Kestrel_2', 'Osprey'], nPoints: 39, nExcluded: 1, hash: 'h', firstTime: 0, lastTime: 1, baseline: 1 },
    } as unknown as ReportSnapshot['result'],
    data: { hash: 'a'.repeat(64), nIncluded: 39, nExcluded: 1, instruments: ['Kestrel_2', 'Osprey'], changedSinceFit: false, timeScale: 'bjd_tdb', points, exclusions: [] },
    periodogram: null, residualPeriodogram: null,
    comparison: { rows: [
      { modelId: 1, name: 'one', version: 2, planets: 1, trend: 'linear', bic: 190.2, deltaBic: 0, evidence: null, preferred: true, comparable: true },
      { modelId: 2, name: 'none', version: 1, planets: 0, trend: 'linear', bic: 260.4, deltaBic: 70.2, evidence: 'very strong', preferred: false, comparable: true }],
      rule: 'lowest BIC', reading: 'One planet is preferred (ΔBIC 70.2).' },
    sampling: {
      runId: 3, settings: { walkers: 32, steps: 2000, burn: 500, thin: 1, seed: 1 },
      parameters: [{ name: 'K b', unit: 'm/s', median: 9.41, lo: 9.12, hi: 9.77, mean: 9.4, sd: 0.3 }],
      diagnostics: { converged: true, acceptance: 0.3, warnings: [] },
      corner: { names: ['P b', 'K b', 'e b'], units: ['d', 'm/s', ''], columns: [P, K, e] }, finishedAt: null,
    },
    settings: { fit: { trend: 'linear', instruments: null, iterations: 12, status: 'converged' }, sampling: null },
    methods: { text: 'Velocities were fitted with one Keplerian orbit; ω is the star\'s argument of periastron.', references: [{ key: 'IAU15', citation: REFERENCES.IAU15 }] },
  }
}

describe('report PDF', () => {
  it('prints Greek letters, Δ, χ², M☉ and accented names as written, with the solution grid and the corner plot', async () => {
    const pdf = await reportPdf({ reportId: 1, version: 1, snapshot: snapshot(), approvals: [], link: 'http://localhost/reports/1' })
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-')
    if (!existsSync('/usr/bin/pdftotext')) { console.log('pdftotext is missing (poppler-utils): the glyph check is skipped'); return }
    const dir = mkdtempSync(join(tmpdir(), 'starsway-pdf-'))
    writeFileSync(join(dir, 'r.pdf'), pdf)
    const text = execFileSync('/usr/bin/pdftotext', [join(dir, 'r.pdf'), '-'], { timeout: 30_000 }).toString()
    for (const s of ['ΔBIC', 'χ²', 'Reduced χ²', 'Prša', 'M☉', 'ω', 'Semi-amplitude K', 'BJD_TDB − 2 450 000', 'Posterior', 'K b = 9.']) expect(text, s).toContain(s)
    expect(text).not.toMatch(/\?BIC|Pr\?a|chi2|omega/)
  }, 60_000)
})

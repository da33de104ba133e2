// The LaTeX export compiled inside minimal two-column documents with the column widths of two
// journal families: about 3.43 in (AAS journals' two-column layout) and 88 mm (A&A's column);
// both widths from memory. A table that does not fit shows as "Overfull \hbox" in the log.
// Needs pdflatex (Debian's texlive-latex-base, installed by the test command); where it is
// absent the structure is still checked and the compile is skipped with a logged message.
import { execFileSync } from 'node:child_process'
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import type { ReportSnapshot } from '../../../shared/api/reports.ts'
import { latexTables } from '../../../shared/report/latex-solution.ts'
import { texInterval } from '../../../shared/report/latex.ts'

function planet(label: string, period: number, K: number) {
  return {
    label, period, K, e: 0.1371, omegaDeg: 213.4, tp: 2456788.123, tc: 2456781.5561,
    uncertainty: { period: period * 1e-5, K: 0.31, e: 0.0123, omegaDeg: 4.4, tp: 0.21, tc: 0.0371 },
    msiniMjup: 1.2345, msiniMearth: 392.4, aAu: 1.2346, derivedUncertainty: { msiniMjup: 0.0412, msiniMearth: 13.1, aAu: 0.0187 }, insolationEarth: null,
  }
}
const SETS = ['ELODIE', 'HARPS', 'HIRES', 'Lick6', 'Lick8', 'Lick13']
function snapshot(planets: number, sampled: boolean): ReportSnapshot {
  const ps = Array.from({ length: planets }, (_, k) => planet('bcdef'[k]!, 4.2307867 * 7 ** k, 55.8 / (k + 1)))
  return {
    format: 'starsway-report/1', title: 'width probe', frozenAt: '2026-12-02T00:00:00.000Z', frozenBy: { id: 1, name: 'A' },
    product: { name: 'Starsway', version: '0.1.0', commit: null },
    star: { id: 1, name: 'Probe Star 51', massMsun: 1.11, massErrMsun: 0.06, radiusRsun: null, teffK: null, luminosityLsun: null, raDeg: null, decDeg: null },
    model: { id: 1, name: 'all sets', version: 3, versionId: 5, spec: { planets: [], trend: 'quadratic' }, note: '', author: null, createdAt: '2026-12-02T00:00:00.000Z' },
    result: {
      planets: ps, instruments: SETS.map((name, i) => ({ name, n: 40 + i, offset: i < 2 ? -33251.594 + i : -14.64 * i, offsetErr: 0.2311, jitter: 3.412, jitterErr: 0.512, rms: 5.12 })),
      trend: { kind: 'quadratic', slope: 0.00213, slopeErr: 0.00042, curvature: -3.1e-7, curvatureErr: 1.2e-7 },
      stats: { chi2: 10, reducedChi2: 1, lnL: -20, bic: 50, aic: 45, rms: 2.3, nParams: 7, nPoints: 10, converged: true, status: 'converged', message: '', iterations: 12 },
      epoch: 2454000, residuals: [], warnings: [], data: { instruments: SETS, nPoints: 639, nExcluded: 0, hash: 'h', firstTime: 0, lastTime: 1, baseline: 1 },
    } as unknown as ReportSnapshot['result'],
    data: { hash: 'c'.repeat(64), nIncluded: 639, nExcluded: 0, instruments: SETS, changedSinceFit: false, timeScale: 'bjd_tdb', points: [], exclusions: [] },
    periodogram: null, residualPeriodogram: null, comparison: null,
    sampling: sampled ? {
      runId: 3, settings: { walkers: 32, steps: 2000, burn: 500, thin: 1, seed: 1 },
      parameters: ps.map((p) => ({ name: `K ${p.label}`, unit: 'm/s', median: p.K, lo: p.K - 0.29, hi: p.K + 0.36, mean: p.K, sd: 0.3 })),
      diagnostics: { converged: true, acceptance: 0.3, warnings: [] }, corner: { names: [], units: [], columns: [] }, finishedAt: null,
    } : null,
    settings: { fit: { trend: 'quadratic', instruments: null, iterations: 12, status: 'converged' }, sampling: null },
    methods: { text: '', references: [] },
  }
}

const JOURNALS = {
  'AAS-like two-column (3.43 in)': '\\documentclass[10pt,twocolumn]{article}\\setlength{\\textwidth}{7.1in}\\setlength{\\columnsep}{0.25in}\\setlength{\\oddsidemargin}{-0.3in}',
  'A&A-like two-column (88 mm)': '\\documentclass[10pt,twocolumn]{article}\\setlength{\\textwidth}{180mm}\\setlength{\\columnsep}{4mm}\\setlength{\\oddsidemargin}{-0.6in}',
}
const pdflatex = ['/usr/bin/pdflatex', '/usr/local/bin/pdflatex'].find((p) => existsSync(p))

describe('LaTeX export in journal layouts', () => {
  it('prints BJD_TDB times against a reduced epoch, drifts per year, and a table* for several planets', () => {
    const one = latexTables(snapshot(1, true))
    expect(one).toContain('\\begin{table}\n')
    expect(one).toContain('Conjunction $T_\\mathrm{c}$ & BJD$_\\mathrm{TDB}$$^\\dagger$ & $6781.56 \\pm 0.04$ \\\\')
    expect(one).toContain('$^\\dagger$ BJD$_\\mathrm{TDB}$ $-$ 2\\,450\\,000')
    expect(one).toContain('Linear drift & m\\,s$^{-1}$\\,yr$^{-1}$ & $0.78 \\pm 0.15$ \\\\') // 0.00213 m/s/d × 365.25
    expect(one).not.toMatch(/dot\\gamma|ddot/)
    const three = latexTables(snapshot(3, false))
    expect(three).toContain('\\begin{table*}')
    expect(three).toContain('Parameter & Unit & b & c & d \\\\')
  })
  it('writes ± when a credible interval is symmetric at its printed precision', () => {
    expect(texInterval(9.41, 0.3, 0.3)).toBe('$9.41 \\pm 0.30$')
    expect(texInterval(9.41, 0.36, 0.29)).toBe('$9.41^{+0.36}_{-0.29}$')
  })
  for (const [name, preamble] of Object.entries(JOURNALS)) {
    it(`compiles without overfull lines in an ${name} document`, () => {
      if (!pdflatex) { console.log(`pdflatex not found: the ${name} compile check is skipped (install texlive-latex-base)`); return }
      const dir = mkdtempSync(join(tmpdir(), 'starsway-tex-'))
      for (const [k, s] of [['one', snapshot(1, true)], ['six', snapshot(1, false)], ['three', snapshot(3, true)]] as const) {
        writeFileSync(join(dir, `${k}.tex`), latexTables(s))
        writeFileSync(join(dir, `doc-${k}.tex`), `${preamble}\n\\begin{document}\nText.\n\\input{${k}}\n\\end{document}\n`)
        let ok = true
        try { execFileSync(pdflatex, ['-interaction=nonstopmode', '-halt-on-error', `doc-${k}.tex`], { cwd: dir, stdio: 'pipe', timeout: 60_000 }) } catch { ok = false }
        const log = readFileSync(join(dir, `doc-${k}.log`), 'utf8')
        expect(ok, log.slice(-2000)).toBe(true)
        expect(log.match(/Overfull \\hbox.*/g) ?? [], `${k} in ${name}`).toEqual([])
      }
    }, 120_000)
  }
})

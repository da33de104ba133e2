// The report's data exports read the way a notebook reads them: pandas.read_csv and astropy's
// ascii.read take the CSV as it is (one header row, no comment lines), astropy reads the ECSV with
// its units, and every unit string in the JSON parses with astropy.units.Unit. The readers are
// Debian's python3-pandas and python3-astropy, run by scripts/reference/read_exports.py; where they
// are absent (the test command installs them) the check is skipped with a logged message.
import { execFileSync } from 'node:child_process'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import type { ReportSnapshot } from '../../../shared/api/reports.ts'
import { neutraliseFormula, reportDataTable, toCsv, toEcsv } from '../../../shared/report/data-table.ts'
import { reportJson } from '../../../server/reports/json.ts'

const python = '/usr/bin/python3'
function hasReaders(): boolean {
  try { execFileSync(python, ['-c', 'import pandas, astropy'], { stdio: 'pipe', timeout: 60_000 }); return true } catch { return false }
}

function snapshot(): ReportSnapshot {
  const planet = {
    label: 'b', period: 12.4026, K: 9.4321, e: 0.145, omegaDeg: 11.2, tp: 2458882.61, tc: 2458872.384,
    uncertainty: { period: 0.00153, K: 0.27, e: 0.027, omegaDeg: 11.3, tp: 0.4, tc: 0.121 },
    msiniMjup: 0.1012, msiniMearth: 32.04, aAu: 0.10203, derivedUncertainty: { msiniMjup: 0.0041, msiniMearth: 1.3, aAu: 0.00149 }, insolationEarth: null,
  }
  const points = [
    { id: 1, instrument: 'Kestrel_2', time: 2458801.5123, rv: 12.5, error: 1.1, included: true, model: 11.9, residual: 0.6 },
    { id: 2, instrument: '=HYPERLINK("x")', time: 2458802.5, rv: -3.25, error: 1.2, included: true, model: -2.5, residual: -0.75 },
    { id: 3, instrument: 'Kestrel_2', time: 2458803.75, rv: 40.1, error: 0.9, included: false, model: 1.5, residual: 38.6 },
  ]
  return {
    format: 'starsway-report/1', title: 'Probe, "quoted", report', frozenAt: '2026-12-02T00:00:00.000Z', frozenBy: { id: 1, name: 'A' },
    product: { name: 'Starsway', version: '0.1.0', commit: null },
    star: { id: 1, name: 'Probe_1', massMsun: 0.92, massErrMsun: 0.04, radiusRsun: null, teffK: null, luminosityLsun: null, raDeg: null, decDeg: null },
    model: { id: 1, name: 'one', version: 2, versionId: 5, spec: { planets: [], trend: 'none' }, note: '', author: null, createdAt: '2026-12-02T00:00:00.000Z' },
    result: {
      planets: [planet], instruments: [{ name: 'Kestrel_2', n: 10, offset: -12.391, offsetErr: 0.23, jitter: 1.85, jitterErr: 0.19, rms: 2.31 }],
      trend: null, stats: { chi2: 10, reducedChi2: 1, lnL: -20, bic: 50, aic: 45, rms: 2.3, nParams: 7, nPoints: 10, converged: true, status: 'converged', message: '', iterations: 12 },
      epoch: 2458800, residuals: [], warnings: [], data: { instruments: ['Kestrel_2'], nPoints: 3, nExcluded: 1, hash: 'h', firstTime: 0, lastTime: 1, baseline: 1 },
    } as unknown as ReportSnapshot['result'],
    data: {
      hash: 'a'.repeat(64), nIncluded: 2, nExcluded: 1, instruments: ['Kestrel_2'], changedSinceFit: false, timeScale: 'bjd_tdb', points,
      exclusions: [{ id: 3, instrument: 'Kestrel_2', time: 2458803.75, reason: '+cosmic ray, "bad" order', by: null, at: null }],
    },
    periodogram: null, residualPeriodogram: null, comparison: null,
    sampling: {
      runId: 3, settings: { walkers: 32, steps: 2000, burn: 500, thin: 1, seed: 1 },
      parameters: [{ name: 'K b', unit: 'm/s', median: 9.41, lo: 9.12, hi: 9.77, mean: 9.4, sd: 0.3 }, { name: 'M sin i b', unit: 'M_Jup', median: 0.1, lo: 0.09, hi: 0.11, mean: 0.1, sd: 0.01 },
        { name: 'M sin i b (Earth masses)', unit: 'M_Earth', median: 32, lo: 30, hi: 34, mean: 32, sd: 2 }, { name: 'a b', unit: 'au', median: 0.1, lo: 0.09, hi: 0.11, mean: 0.1, sd: 0.01 }],
      diagnostics: { converged: true, acceptance: 0.3, warnings: [] }, corner: { names: ['K b'], units: ['m/s'], columns: [[9.4]] }, finishedAt: null,
    },
    settings: { fit: { trend: 'none', instruments: null, iterations: 12, status: 'converged' }, sampling: null },
    methods: { text: '', references: [] },
  }
}

describe('report data exports', () => {
  it('CSV has one header row naming units and the time system, and neutralises formula-like text', () => {
    const csv = toCsv(reportDataTable(snapshot())).split('\n')
    expect(csv[0]).toBe('measurement_id,instrument,bjd_tdb_d,rv_m_s,error_m_s,model_m_s,residual_m_s,excluded,exclusion_reason')
    expect(csv[2]).toBe('2,"\'=HYPERLINK(""x"")",2458802.5,-3.25,1.2,-2.5,-0.75,False,')
    expect(csv[3]).toBe('3,Kestrel_2,2458803.75,40.1,0.9,1.5,38.6,True,"\'+cosmic ray, ""bad"" order"')
    expect(neutraliseFormula('-2+3')).toBe("'-2+3")
    expect(neutraliseFormula('HARPS')).toBe('HARPS')
    const unknown = snapshot(); delete unknown.data.timeScale
    expect(toCsv(reportDataTable(unknown)).split('\n')[0]).toMatch(/^measurement_id,instrument,jd_d,/)
  })
  it('ECSV starts with its signature and states units per column', () => {
    const ecsv = toEcsv(reportDataTable(snapshot()))
    expect(ecsv.startsWith('# %ECSV 1.0\n# ---\n# delimiter: ","\n')).toBe(true)
    expect(ecsv).toContain('#   - name: rv_m_s\n#     unit: m / s\n#     datatype: float64')
  })
  it('pandas and astropy read the CSV and the ECSV, and astropy parses every JSON unit', () => {
    if (!hasReaders()) { console.log('python3-pandas / python3-astropy not found: the notebook-reader check is skipped'); return }
    const dir = mkdtempSync(join(tmpdir(), 'starsway-exports-'))
    const s = snapshot()
    writeFileSync(join(dir, 'd.csv'), toCsv(reportDataTable(s)))
    writeFileSync(join(dir, 'd.ecsv'), toEcsv(reportDataTable(s)))
    writeFileSync(join(dir, 'r.json'), JSON.stringify(reportJson(s, 1, 1)))
    const out = JSON.parse(execFileSync(python, ['scripts/reference/read_exports.py', join(dir, 'd.csv'), join(dir, 'd.ecsv'), join(dir, 'r.json')], { timeout: 120_000 }).toString())
    expect(out.pandas_csv.rows).toBe(3)
    expect(out.pandas_csv.columns[2]).toBe('bjd_tdb_d')
    expect(out.pandas_csv.dtypes.excluded).toBe('bool')
    expect(out.pandas_csv.dtypes.rv_m_s).toBe('float64')
    expect(out.astropy_csv.rows).toBe(3)
    expect(out.astropy_ecsv.rows).toBe(3)
    expect(out.astropy_ecsv.units.rv_m_s).toBe('m / s')
    expect(out.astropy_ecsv.units.bjd_tdb_d).toBe('d')
    expect(out.astropy_ecsv.dtypes.excluded).toBe('bool')
    expect(out.astropy_ecsv.meta.time_scale).toBe('BJD_TDB')
    expect(out.astropy_ecsv.first_rv_in_km_s).toBeCloseTo(0.0125, 12)
    expect(out.json_units['result.planets[].msiniMjup']).toBe('jupiterMass')
    expect(out.json_units['sampling:M sin i b (Earth masses)']).toBe('earthMass')
    expect(out.json_units['sampling:K b']).toBe('m / s')
  }, 180_000)
})

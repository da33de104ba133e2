import { describe, it, expect, beforeAll } from 'vitest'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { spawnSync } from 'node:child_process'
import { expectClose } from '../../helpers/expect-close.ts'
import { main } from '../../../scripts/cli.ts'
import { synth } from './orbit-fit-helpers.ts'

const ROOT = fileURLToPath(new URL('../../../', import.meta.url))
const published = (f: string): string => join(ROOT, 'fixtures', 'published', f)

function run(argv: string[]): { code: number; out: string; err: string[] } {
  const out: string[] = [], err: string[] = []
  const code = main(argv, { out: (s) => out.push(s), err: (s) => err.push(s) })
  return { code, out: out.join('\n'), err }
}

let dir: string
let synthCsv: string
let noHeader: string
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'starsway-cli-'))
  const { data } = synth({ seed: 31, n: 90, baseline: 700, planets: [{ period: 9.7, K: 15, e: 0.1, omega: 1, tp: 2455002 }] })
  synthCsv = join(dir, 'synthetic.csv')
  const lines = ['time,rv,err']
  data.t.forEach((t, i) => lines.push(`${t.toFixed(6)},${data.y[i].toFixed(3)},${data.dy[i].toFixed(3)}`))
  writeFileSync(synthCsv, lines.join('\n') + '\n')
  // no header, columns in an unusual order: rv err time, times as JD − 2450000
  noHeader = join(dir, 'noheader.txt')
  writeFileSync(noHeader, Array.from(data.t, (t, i) => `${data.y[i].toFixed(3)} ${data.dy[i].toFixed(3)} ${(t - 2450000).toFixed(6)}`).join('\n') + '\n')
})

describe('command line: periodogram', () => {
  it('prints one JSON document with the contract of issue 3 §5', () => {
    const r = run(['periodogram', synthCsv, '--json', '--peaks', '3'])
    expect(r.code).toBe(0)
    const doc = JSON.parse(r.out)
    expect(Object.keys(doc).sort()).toEqual(['fapLevels', 'grid', 'input', 'keplerian', 'peaks', 'timingMs', 'units'])
    expect(doc.units).toMatchObject({ period: 'd', frequency: '1 / d', K: 'm / s', msiniMjup: 'jupiterMass' })
    expect(doc.input).toMatchObject({ rows: 90, instruments: expect.any(Array), unit: 'm/s', timeFormat: expect.any(String) })
    expect(doc.input.baselineDays).toBeGreaterThan(600)
    expect(Object.keys(doc.grid).sort()).toEqual(['count', 'maxFrequency', 'maxPeriod', 'method', 'minFrequency', 'minPeriod', 'oversample'])
    // default grid (issue 9 §2): 1/(5 × baseline) up to 1/(0.5 d), steps of 1/(10 × baseline)
    expect(doc.grid.maxFrequency).toBeLessThanOrEqual(1 / 0.5 + 1e-12)
    expect(doc.grid.maxFrequency).toBeGreaterThan(1 / 0.5 - 1 / (10 * doc.input.baselineDays))
    expectClose(doc.grid.minFrequency, 1 / (5 * doc.input.baselineDays), { rtol: 1e-6 }, 'fmin')
    expect(doc.peaks).toHaveLength(3)
    expect(Object.keys(doc.peaks[0]).sort()).toEqual(['aliases', 'fap', 'frequency', 'period', 'power'])
    expect(doc.fapLevels.map((l: { fap: number }) => l.fap)).toEqual([0.1, 0.01, 0.001])
    for (let i = 1; i < 3; i++) expect(doc.peaks[i].power).toBeLessThanOrEqual(doc.peaks[i - 1].power)
    expectClose(doc.peaks[0].period, 9.7, { rtol: 0.01 }, 'peak period (injected 9.7 d)')
    expectClose(doc.keplerian.peaks[0].period, 9.7, { rtol: 0.01 }, 'Keplerian periodogram peak')
    expect(doc.keplerian.peaks[0].power).toBeGreaterThan(0)
    expect(typeof doc.timingMs.periodogram).toBe('number')
  })

  it('honours the grid flags', () => {
    const doc = JSON.parse(run(['periodogram', synthCsv, '--json', '--min-period', '2', '--max-period', '50', '--frequencies', '1000', '--gls-only']).out)
    expect(doc.keplerian).toBeNull()
    expect(doc.grid.count).toBe(1000)
    expectClose(doc.grid.maxFrequency, 0.5, { rtol: 1e-9 }, 'fmax')
    expectClose(doc.grid.minFrequency, 0.02, { rtol: 1e-9 }, 'fmin')
  })

  it('reads a headerless table with column flags and a time format', () => {
    const r = run(['periodogram', noHeader, '--json', '--time-col', '3', '--rv-col', '1', '--err-col', '2', '--time-format', 'jd-2450000'])
    expect(r.code).toBe(0)
    const doc = JSON.parse(r.out)
    expect(doc.input.timeFormat).toBe('jd-2450000')
    expectClose(doc.peaks[0].period, 9.7, { rtol: 0.01 }, 'peak period')
  })

  it('prints a readable table without --json', () => {
    const r = run(['periodogram', synthCsv])
    expect(r.code).toBe(0)
    expect(r.out).toMatch(/period \[d\]/)
    expect(r.out).toMatch(/FAP/)
    expect(() => JSON.parse(r.out)).toThrow()
  })
})

describe('command line: fit', () => {
  it('fits HD 20868 (km/s) from the data alone with the JSON contract', () => {
    // Published solution: Moutou et al. 2009, A&A 496, 513 (P = 380.85 d, K = 100.34 m/s, e = 0.75, ω = 356.2°).
    const r = run(['fit', published('hd20868-harps.txt'), '--star-mass', '0.78', '--star-mass-err', '0.03', '--json'])
    expect(r.code).toBe(0)
    const doc = JSON.parse(r.out)
    expect(Object.keys(doc).sort()).toEqual(['input', 'instruments', 'mode', 'planets', 'report', 'search', 'starMass', 'stats', 'timingMs', 'trend', 'units', 'warnings'])
    expect(doc.mode).toBe('search')
    expect(doc.starMass).toEqual({ value: 0.78, error: 0.03 })
    expect(doc.input.unit).toBe('km/s')
    expect(doc.planets).toHaveLength(1)
    const p = doc.planets[0]
    expect(Object.keys(p).sort()).toEqual(['K', 'aAu', 'e', 'msiniMearth', 'msiniMjup', 'omegaDeg', 'period', 'tc', 'tp', 'uncertainty'])
    expect(Object.keys(p.uncertainty).sort()).toEqual(['K', 'aAu', 'e', 'msiniMjup', 'omegaDeg', 'period', 'tc', 'tp'])
    expectClose(p.period, 380.85, { atol: 0.3 }, 'P')
    expectClose(p.K, 100.34, { atol: 1.5 }, 'K')
    expectClose(p.e, 0.75, { atol: 0.01 }, 'e')
    expectClose(p.omegaDeg, 356.2, { atol: 1.5 }, 'ω')
    expect(p.tp).toBeGreaterThan(2400000) // full JD on the input's scale
    // from memory (see the datasets' notes): M sin i ≈ 1.99 M_Jup, a ≈ 0.947 au
    expectClose(p.msiniMjup, 1.99, { atol: 0.05 }, 'M sin i')
    expectClose(p.msiniMearth, p.msiniMjup * 317.83, { rtol: 1e-3 }, 'M_Earth')
    expect(p.uncertainty.msiniMjup).toBeGreaterThan(0)
    expect(doc.instruments[0]).toMatchObject({ n: 48 })
    expect(Object.keys(doc.instruments[0]).sort()).toEqual(['jitter', 'n', 'name', 'offset', 'rms'])
    expect(Object.keys(doc.stats).sort()).toEqual(['aic', 'bic', 'chi2', 'converged', 'lnL', 'nPoints', 'nParams', 'rms', 'status'].sort())
    expect(doc.stats.converged).toBe(true)
    expect(doc.search[0]).toMatchObject({ planets: 0 })
    expect(Object.keys(doc.search[0]).sort()).toEqual(['bic', 'lnL', 'nextPeakFap', 'nextPeakPeriod', 'planets', 'trend'])
    expect(typeof doc.timingMs.total).toBe('number')
  })

  it('fits 51 Peg with one planet and no trend; masses are null without --star-mass', () => {
    const doc = JSON.parse(run(['fit', published('51peg-six-instruments.txt'), '--planets', '1', '--trend', 'none', '--json']).out)
    expect(doc.input.instruments).toHaveLength(6)
    expect(doc.trend).toBeNull()
    // Birkby et al. 2017: P = 4.2307869 d, K = 54.93 m/s
    expectClose(doc.planets[0].period, 4.2307869, { atol: 1.5e-5 }, 'P')
    expectClose(doc.planets[0].K, 54.93, { atol: 1.5 }, 'K')
    expect(doc.planets[0].msiniMjup).toBeNull()
    expect(doc.planets[0].uncertainty.aAu).toBeNull()
  })

  it('reports a chosen trend with slope, curvature and epoch, and prints tables without --json', () => {
    const r = run(['fit', synthCsv, '--planets', '1', '--trend', 'linear'])
    expect(r.code).toBe(0)
    expect(r.out).toMatch(/K \[m\/s\]/)
    expect(r.out).toMatch(/trend: slope/)
    // the search's false-alarm gate is an option, reported with the search's settings
    expect(JSON.parse(run(['fit', synthCsv, '--false-alarm', '0.01', '--json']).out).report.settings.falseAlarm).toBe(0.01)
    // a plain "time" column names no time scale: the epochs' unit says so (a BJD column would say BJD)
    expect(r.out).toMatch(/Tp \[JD, scale unstated\] +Tc \[JD, scale unstated\]/)
    const doc = JSON.parse(run(['fit', synthCsv, '--planets', '1', '--trend', 'linear', '--json']).out)
    expect(Object.keys(doc.trend).sort()).toEqual(['curvature', 'epoch', 'kind', 'slope'])
    expect(doc.trend.curvature).toBe(0)
  })

  it('fits a model given with --planet, fixed parameters and a prior, below 1.1 d if asked', () => {
    const doc = JSON.parse(run([
      'fit', published('51peg-six-instruments.txt'), '--planet', 'period=4.2308,e=0,omegaDeg=0,fix=e+omegaDeg',
      '--prior', 'b.period=normal:4.2308:0.001', '--json',
    ]).out)
    expect(doc.mode).toBe('model')
    expect(doc.search).toEqual([])
    expect(doc.planets[0].e).toBe(0)
    expect(doc.planets[0].uncertainty.e).toBe(0)
    expectClose(doc.planets[0].period, 4.2307869, { atol: 1e-4 }, 'P')
    // the search honours a period range below the old 1.1-d floor
    const usp = JSON.parse(run(['fit', synthCsv, '--planets', '1', '--trend', 'none', '--min-period', '0.6', '--max-period', '30', '--json']).out)
    expectClose(usp.planets[0].period, 9.7, { rtol: 0.01 }, 'P in 0.6–30 d')
  })

  it('prints help per command and the version', () => {
    const h = run(['fit', '--help'])
    expect(h.code).toBe(0)
    expect(h.out).toMatch(/--star-mass/)
    expect(h.out).toMatch(/--min-period/)
    expect(run(['periodogram', '--help']).out).toMatch(/--frequencies/)
    expect(run(['--version']).out).toMatch(/^starsway \d+\.\d+\.\d+$/)
  })
})

describe('command line: bad input exits 2 with one line on stderr', () => {
  const cases: Array<[string, string[], RegExp]> = [
    ['unknown command', ['wobble', 'x'], /unknown command/],
    ['missing file argument', ['fit'], /missing FILE/],
    ['unreadable file', ['fit', '/nonexistent/file.csv'], /cannot read/],
    ['unknown option', ['fit', 'x.csv', '--colour', 'red'], /unknown option --colour/],
    ['bad unit', ['periodogram', 'x.csv', '--unit', 'furlongs'], /--unit/],
    ['bad planets', ['fit', 'x.csv', '--planets', 'many'], /--planets/],
    ['bad trend', ['fit', 'x.csv', '--trend', 'cubic'], /--trend/],
    ['star-mass-err alone', ['fit', 'x.csv', '--star-mass-err', '0.1'], /--star-mass-err needs --star-mass/],
    ['a mass option not ours', ['fit', 'x.csv', '--mass', '1'], /unknown option --mass/],
    ['bad planet spec', ['fit', 'x.csv', '--planet', 'period=-3'], /--planet b: period/],
    ['prior without planet', ['fit', 'x.csv', '--prior', 'b.e=uniform:0:0.5'], /--prior needs/],
    ['bad prior', ['fit', 'x.csv', '--planet', 'period=3', '--prior', 'b.e=gauss:0'], /--prior/],
    ['search option with a model', ['fit', 'x.csv', '--planet', 'period=3', '--min-period', '1'], /search option/],
    ['both grid flags', ['periodogram', 'x.csv', '--oversample', '5', '--frequencies', '100'], /not both/],
    ['negative star mass', ['fit', 'x.csv', '--star-mass=-1'], /--star-mass must be/],
    ['value looking like an option', ['fit', 'x.csv', '--star-mass', '-1'], /--star-mass=VALUE/],
  ]
  for (const [name, argv, msg] of cases) {
    it(name, () => {
      const r = run(argv)
      expect(r.code).toBe(2)
      expect(r.err).toHaveLength(1)
      expect(r.err[0]).toMatch(msg)
      expect(r.out).toBe('')
    })
  }

  it('ambiguous times (MJD or JD − 2400000) name the --time-format option and its values', () => {
    const f = join(dir, 'ambiguous.txt')
    writeFileSync(f, Array.from({ length: 12 }, (_, i) => `${(55000 + i * 3.7).toFixed(4)} ${(5 * Math.sin(i)).toFixed(2)} 1.0`).join('\n') + '\n')
    const r = run(['periodogram', f])
    expect(r.code).toBe(2)
    expect(r.err).toHaveLength(1)
    expect(r.err[0]).toMatch(/--time-format (mjd or jd-2400000|jd-2400000 or mjd)/)
    expect(run(['periodogram', f, '--time-format', 'mjd', '--json']).code).toBe(0)
  })

  it('a table with no usable rows', () => {
    const f = join(dir, 'empty.csv')
    writeFileSync(f, '# nothing here\n')
    const r = run(['fit', f])
    expect(r.code).toBe(2)
    expect(r.err).toHaveLength(1)
  })

  it('the script itself exits with code 2 (spawned with npx tsx)', () => {
    const p = spawnSync('npx', ['tsx', 'scripts/cli.ts', 'fit', '/nonexistent.csv', '--json'], { cwd: ROOT, encoding: 'utf8' })
    expect(p.status).toBe(2)
    expect(p.stdout).toBe('')
    expect(p.stderr.trim().split('\n')).toHaveLength(1)
    expect(p.stderr).toMatch(/cannot read/)
  }, 180_000) // a fresh npx + tsx start; slow on a busy machine

  it('reads standard input for -', () => {
    const table = ['time,rv,err', ...Array.from({ length: 30 }, (_, i) => `${2455000 + i * 1.3},${(10 * Math.sin(i)).toFixed(3)},1`)].join('\n')
    const p = spawnSync('npx', ['tsx', 'scripts/cli.ts', 'periodogram', '-', '--json', '--peaks', '1'], { cwd: ROOT, encoding: 'utf8', input: table })
    expect(p.status).toBe(0)
    const doc = JSON.parse(p.stdout)
    expect(doc.input).toMatchObject({ file: 'standard input', rows: 30 })
  }, 180_000)
})

describe('command line: the instrument table', () => {
  it('prints offsets and jitters rounded by their errors, with the errors (shared/report rounding)', () => {
    const r = run(['fit', published('51peg-six-instruments.txt'), '--planets', '1', '--trend', 'none'])
    expect(r.code).toBe(0)
    const lines = r.out.split('\n')
    const head = lines.findIndex((l) => /instrument\s+n\s+offset/.test(l))
    expect(head).toBeGreaterThan(0)
    const rows = lines.slice(head + 1, head + 7)
    expect(rows.map((l) => l.trim().split(/\s+/)[0]).sort()).toEqual(['ELODIE', 'HARPS', 'HIRES', 'Lick13', 'Lick6', 'Lick8'])
    for (const row of rows) {
      // name, n, offset ± err, jitter ± err, rms: no unrounded value such as 0.9502904
      expect(row).toMatch(/^\s*\S+\s+\d+\s+-?[\d.]+ ± [\d.]+\s+[\d.]+ ± [\d.]+\s+[\d.]+$/)
      for (const num of row.match(/\d+\.\d+/g) ?? []) expect(num.split('.')[1].length).toBeLessThanOrEqual(3)
    }
  })
})

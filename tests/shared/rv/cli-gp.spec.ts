import { describe, it, expect, beforeAll } from 'vitest'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { main } from '../../../scripts/cli.ts'
import { spottedStar, STAR } from './gp/spotted-star.ts'

// The command line on the seeded spotted star (./gp/spotted-star.ts) written to a CSV with a bisector
// column: the automatic search uses the indicator, ties a GP to the rotation and reports one planet +
// the activity; the same table without the bisector column fits with a GP from --rotation-period.
function run(argv: string[]): { code: number; out: string; err: string[] } {
  const out: string[] = [], err: string[] = []
  const code = main(argv, { out: (s) => out.push(s), err: (s) => err.push(s) })
  return { code, out: out.join('\n'), err }
}

let withBis: string, noBis: string
beforeAll(() => {
  const dir = mkdtempSync(join(tmpdir(), 'starsway-cli-gp-'))
  const s = spottedStar(1, 160, 420, false)
  const rows = Array.from(s.data.t, (t, i) => [t.toFixed(6), s.data.y[i].toFixed(3), s.data.dy[i].toFixed(3), s.bisector[i].toFixed(3)])
  withBis = join(dir, 'spotted.csv')
  writeFileSync(withBis, ['time,rv,err,bisector', ...rows.map((r) => r.join(','))].join('\n') + '\n')
  noBis = join(dir, 'spotted-rv.csv')
  writeFileSync(noBis, ['time,rv,err', ...rows.map((r) => r.slice(0, 3).join(','))].join('\n') + '\n')
})

describe('command line: fit with a GP noise model', () => {
  it('automatic mode with an indicator: N planets + M activity candidates, the GP and both BICs (JSON with units)', () => {
    const r = run(['fit', withBis, '--json'])
    expect(r.code, r.err.join('\n')).toBe(0)
    const doc = JSON.parse(r.out)
    expect(doc.mode).toBe('search with activity')
    expect(doc.noise).toBe('gp')
    expect(doc.planets).toHaveLength(1)
    expect(Math.abs(doc.planets[0].period - STAR.planet.period)).toBeLessThan(0.15)
    expect(Math.abs(doc.planets[0].K - STAR.planet.K)).toBeLessThan(2 * doc.planets[0].uncertainty.K)
    expect(doc.summary).toBe(`1 planet + ${doc.activity.length} activity candidate${doc.activity.length === 1 ? '' : 's'}`)
    expect(doc.activity.length).toBeGreaterThan(0)
    expect(doc.gp.rotationPeriod.unit).toBe('d')
    expect(Math.abs(doc.gp.rotationPeriod.value - STAR.rotation.period)).toBeLessThan(1.5)
    expect(doc.gp.amplitude[0].unit).toBe('m / s')
    expect(doc.bic.planetsGp).toBeLessThan(doc.bic.planetsWhiteNoise)
    expect(doc.units).toMatchObject({ period: 'd', K: 'm / s', rotationPeriod: 'd', decayTime: 'd', amplitude: 'm / s' })
  }, 600_000)

  it('prints the headline, the hyperparameters and both BICs as text', () => {
    const r = run(['fit', withBis])
    expect(r.code).toBe(0)
    expect(r.out).toMatch(/search with activity: 1 planet \+ \d+ activity candidates?; noise model preferred: planets \+ GP/)
    expect(r.out).toMatch(/GP noise \(rotation kernel\): rotation period .* d, decay time .* d/)
    expect(r.out).toMatch(/BIC: planets \+ white noise .*, planets \+ GP /)
    expect(r.out).toMatch(/'bisector_span'/)
  }, 600_000)

  it('a model without indicators fits with a GP from --rotation-period', () => {
    const r = run(['fit', noBis, '--planet', 'period=12.3', '--noise', 'gp', '--rotation-period', '23.5,2', '--json'])
    expect(r.code, r.err.join('\n')).toBe(0)
    const doc = JSON.parse(r.out)
    expect(doc.noise).toBe('gp')
    expect(doc.stats.converged).toBe(true)
    expect(doc.gp.priors[0]).toMatch(/rotation period ~ N\(23.5, 2.00²\) d \(from the user\)/)
    expect(Math.abs(doc.planets[0].K - STAR.planet.K)).toBeLessThan(2 * doc.planets[0].uncertainty.K)
    expect(doc.bic.planetsGp).toBeLessThan(doc.bic.planetsWhiteNoise)
  }, 600_000)

  it('a GP model keeps the planet fixes and priors it is given (they reach the GP fit, not only the white one)', () => {
    const r = run(['fit', noBis, '--planet', 'period=12.3,e=0,fix=period+e', '--prior', 'b.K=normal:5:0.5', '--noise', 'gp', '--rotation-period', '23.5,2', '--json'])
    expect(r.code, r.err.join('\n')).toBe(0)
    const doc = JSON.parse(r.out)
    expect(doc.planets[0].period).toBe(12.3)
    expect(doc.planets[0].e).toBe(0)
    expect(doc.planets[0].uncertainty.period).toBe(0)
    expect(doc.gp.priors.join('; ')).toMatch(/planet 1 period fixed at 12.3 d/)
    expect(doc.gp.priors.join('; ')).toMatch(/planet 1 K ~ N\(5, 0.5/)
  }, 600_000)

  it('refuses bad noise options with a message naming the fix', () => {
    expect(run(['fit', noBis, '--rotation-period', 'abc']).err.join(' ')).toMatch(/--rotation-period must be D or D,SIGMA/)
    expect(run(['fit', noBis, '--noise', 'gp']).err.join(' ')).toMatch(/needs a rotation period: give --rotation-period/)
    expect(run(['fit', noBis, '--planet', 'period=12.3', '--noise', 'gp']).err.join(' ')).toMatch(/needs --rotation-period/)
    expect(run(['fit', noBis, '--noise', 'white', '--rotation-period', '23']).err.join(' ')).toMatch(/belongs to a GP/)
    expect(run(['fit', noBis, '--gp-kernel', 'spline']).err.join(' ')).toMatch(/--gp-kernel must be rotation or quasi-periodic/)
    expect(run(['fit', noBis, '--rotation-period', '23.5', '--decay-time', '5']).err.join(' ')).toMatch(/--decay-time must exceed half/)
  })

  it('documents the noise options in --help', () => {
    const r = run(['fit', '--help'])
    expect(r.out).toMatch(/--noise auto\|white\|gp/)
    expect(r.out).toMatch(/--rotation-period D\[,SIGMA\]/)
    expect(r.out).toMatch(/--gp-kernel K/)
  })
})

import { createHash } from 'node:crypto'
import { describe, expect, it } from 'vitest'
import { escapeLatex, tabular, texInterval, texValue } from '../../../shared/report/latex.ts'
import { sha256Hex } from '../../../shared/report/sha256.ts'
import { dataContentHash } from '../../../shared/report/hash.ts'
import { methodsParagraph } from '../../../shared/report/methods.ts'

describe('LaTeX tabular', () => {
  it('escapes the special characters of text cells', () => {
    expect(escapeLatex('a_b & 50% #1 $x {y} ~ ^ \\')).toBe('a\\_b \\& 50\\% \\#1 \\$x \\{y\\} \\textasciitilde{} \\textasciicircum{} \\textbackslash{}')
  })
  it('builds a plain tabular with hlines and passes LaTeX cells through', () => {
    const tex = tabular({ align: 'lr', header: ['Name', { tex: '$K$ (m\\,s$^{-1}$)' }], rows: [['HARPS_N', { tex: texValue(9.1234, 0.456) }]] })
    expect(tex).toBe([
      '\\begin{tabular}{lr}', '  \\hline', '  Name & $K$ (m\\,s$^{-1}$) \\\\', '  \\hline', '  HARPS\\_N & $9.1 \\pm 0.5$ \\\\', '  \\hline', '\\end{tabular}',
    ].join('\n'))
  })
  it('throws naming the parameter for a row of the wrong width or a bad alignment', () => {
    expect(() => tabular({ header: ['a', 'b'], rows: [['x']] })).toThrow(/rows\[0\]/)
    expect(() => tabular({ align: 'l', header: ['a', 'b'], rows: [] })).toThrow(/align/)
  })
  it('writes values by the PDG rounding rule and intervals as ^{+a}_{-b}', () => {
    expect(texValue(1.23456, 0.0123)).toBe('$1.235 \\pm 0.012$')
    expect(texValue(0.25, 0)).toBe('$0.25$ (fixed)')
    expect(texValue(null, 1)).toBe('---')
    expect(texInterval(10.06, 0.6, 2.44)).toBe('$10.1^{+0.6}_{-2.4}$')
  })
})

describe('content hash', () => {
  it('SHA-256 matches node:crypto (FIPS 180-4 reference implementation in Node 20)', () => {
    for (const text of ['', 'abc', 'a'.repeat(55), 'a'.repeat(56), 'a'.repeat(64), 'ω m 1 2459000.5 10 1\n'.repeat(40)]) {
      expect(sha256Hex(text)).toBe(createHash('sha256').update(text, 'utf8').digest('hex'))
    }
    // FIPS 180-2 appendix B.1 example
    expect(sha256Hex('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad')
  })
  it('does not depend on the order of points; changes with a value, a point or a reason', () => {
    const pts = [{ id: 2, time: 2459001.5, rv: 12, error: 1.1 }, { id: 1, time: 2459000.5, rv: 10, error: 1 }]
    const h = dataContentHash(pts, [{ id: 3, reason: 'bad night' }])
    expect(dataContentHash([...pts].reverse(), [{ id: 3, reason: 'bad night' }])).toBe(h)
    expect(dataContentHash([pts[0]!, { ...pts[1]!, rv: 10.001 }], [{ id: 3, reason: 'bad night' }])).not.toBe(h)
    expect(dataContentHash(pts, [{ id: 3, reason: 'clouds' }])).not.toBe(h)
    expect(dataContentHash(pts, [])).not.toBe(h)
  })
})

describe('methods paragraph', () => {
  const base = { nPoints: 220, instruments: ['Kestrel', 'Harrier'], nExcluded: 1, periodogram: { minPeriod: 1.1, maxPeriod: 1800, oversample: 10 }, residualPeriodogram: false, planets: 2, trend: 'none' as const, compared: false, derived: true, sampling: null }
  it('names the methods done and cites exactly their references', () => {
    const m = methodsParagraph(base)
    expect(m.text).toMatch(/220 radial velocities from 2 instruments \(Kestrel and Harrier\); 1 measurement was excluded/)
    expect(m.text).toMatch(/generalised Lomb–Scargle periodogram .*\(Zechmeister & Kürster 2009\)/)
    expect(m.text).toMatch(/Baluev \(2008\)/)
    expect(m.text).toMatch(/two|2 Keplerian orbits/)
    expect(m.text).toMatch(/jitter .*\(Ford 2006\)/)
    expect(m.references.map((r) => r.key)).toEqual(['ZK09', 'Baluev08', 'Ford06', 'IAU15'])
  })
  it('adds the sampler and BIC only when they were used', () => {
    const m = methodsParagraph({ ...base, periodogram: null, compared: true, sampling: { walkers: 32, steps: 5000, burn: 1250, thin: 1, seed: 7 } })
    expect(m.text).toMatch(/affine-invariant ensemble sampler \(Goodman & Weare 2010\) using 32 walkers for 5000 steps/)
    expect(m.text).toMatch(/seed 7/)
    expect(m.text).toMatch(/Bayesian information criterion \(Schwarz 1978\).*Kass & Raftery \(1995\)/)
    expect(m.references.map((r) => r.key)).toEqual(['Ford06', 'Schwarz78', 'KR95', 'IAU15', 'GW10', 'FM13'])
    expect(m.text).not.toMatch(/Lomb/)
  })
})

import { describe, it } from 'vitest'
import { readFileSync } from 'node:fs'
import { nonCentralChi2Sf2, detectionProbability, detectionProbabilityChi2 } from '../../../shared/limits/index.ts'
import { expectClose } from '../../helpers/expect-close.ts'

// scipy 1.10 stats.ncx2.sf / stats.ncf.sf: scripts/reference/limits_detection_probability.py
const fx = JSON.parse(readFileSync('fixtures/limits/detection-probability-scipy.json', 'utf8')) as {
  ncx2: number[][]; ncf: number[][]
}

describe('detection probability at a known frequency (Cumming 2004)', () => {
  it('the non-central χ²₂ survival function matches scipy', () => {
    for (const [lam, x, sf] of fx.ncx2) expectClose(nonCentralChi2Sf2(lam, x), sf, { rtol: 1e-9, atol: 1e-14 }, `ncx2.sf(${x}, 2, ${lam})`)
  })

  it('the probability that the normalised power reaches a level matches scipy\'s non-central F', () => {
    for (const [n, level, lam, p] of fx.ncf) expectClose(detectionProbability(lam, level, n), p, { rtol: 1e-6, atol: 1e-9 }, `N=${n} level=${level} λ=${lam}`)
  })

  it('the χ² approximation approaches the exact form as N grows', () => {
    const exact = detectionProbability(30, 20 / 997 / (1 + 20 / 997), 1000)
    expectClose(detectionProbabilityChi2(30, 20 / 997 / (1 + 20 / 997), 1000), exact, { atol: 0.02 })
  })
})

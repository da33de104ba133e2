import { describe, it, expect } from 'vitest'
import { createRandom } from '../../../../shared/math/random.ts'
import { radialVelocity, fitKeplerians, candidateDoubts, type RvData } from '../../../../shared/rv/index.ts'

// The warrant's candidate doubt (shared/rv/planet-search/warrant.ts): a signal whose gain comes
// mostly from one instrument that spans less than its period, while the data span many periods,
// is a candidate, not a planet. Invented instruments "Long" (1000 d) and "Short" (60 d).
function make(signalInLong: boolean): RvData {
  const rnd = createRandom(7)
  const t: number[] = [], y: number[] = [], dy: number[] = [], inst: number[] = []
  const orbit = { period: 80, K: 15, e: 0.1, omega: 1, tp: 2456010 }
  for (let i = 0; i < 60; i++) { t.push(2456000 + 1000 * rnd.next()); inst.push(0) }
  for (let i = 0; i < 30; i++) { t.push(2456400 + 60 * rnd.next()); inst.push(1) }
  const model = radialVelocity(Float64Array.from(t), [orbit])
  for (let i = 0; i < t.length; i++) {
    const err = inst[i] === 0 ? 3 : 1
    const withSignal = inst[i] === 1 || signalInLong
    y.push((withSignal ? model[i] : 0) + (inst[i] === 0 ? 100 : -40) + err * rnd.normal())
    dy.push(err)
  }
  return { t: Float64Array.from(t), y: Float64Array.from(y), dy: Float64Array.from(dy), instrument: Int32Array.from(inst), instrumentNames: ['Long', 'Short'] }
}

describe('candidate doubt of the warrant', () => {
  it('flags a signal carried by the short instrument whose span is below the period', () => {
    const data = make(false)
    const fit = fitKeplerians(data, { planets: [{ period: 80, K: 15, e: 0.1, omegaDeg: 57.3, tp: 2456010 }] })
    const d = candidateDoubts(data, fit, 0)
    expect(d).toHaveLength(1)
    expect(d[0]).toMatchObject({ kind: 'candidate-short-instrument', severity: 'warning', instrument: 'Short' })
    expect(d[0].message).toMatch(/candidate, not counted as a planet/)
  })

  it('does not doubt the same signal when the long instrument sees it too', () => {
    const data = make(true)
    const fit = fitKeplerians(data, { planets: [{ period: 80, K: 15, e: 0.1, omegaDeg: 57.3, tp: 2456010 }] })
    expect(candidateDoubts(data, fit, 0)).toEqual([])
  })
})

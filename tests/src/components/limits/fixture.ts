// A small finished detection-limit result for the component tests.
import type { LimitsResult } from '@shared/api/limits.ts'

export const RESULT: LimitsResult = {
  periods: [1, 10, 100], massesEarth: [1, 10, 100, 1000],
  fraction: [[0, 0.4, 1, 1], [0, 0.2, 0.9, 1], [0, 0, 0.5, 1]], perCell: 10,
  contour50: [{ period: 1, massEarth: 5, flag: 'inside' }, { period: 10, massEarth: 20, flag: 'inside' }, { period: 100, massEarth: 100, flag: 'inside' }],
  contour90: [{ period: 1, massEarth: 30, flag: 'inside' }, { period: 10, massEarth: 100, flag: 'inside' }, { period: 100, massEarth: null, flag: 'not-reached' }],
  table: [{ from: 1, to: 10, mass50Earth: 5, mass90Earth: 30, meanCompleteness: 0.6 }, { from: 10, to: 100, mass50Earth: 20, mass90Earth: null, meanCompleteness: 0.5 }],
  planets: [{ label: 'b', period: 12.3, massEarth: 80 }], giants: [{ name: 'Jupiter', period: 4332, massEarth: 317.8 }],
  level: 0.12, nPoints: 40, baseline: 97, starMass: 0.9,
}

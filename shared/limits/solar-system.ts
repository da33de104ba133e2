/**
 * The Solar System's giant planets placed on a period–M sin i chart of another star: same
 * semi-major axis and mass (sin i = 1), period from Kepler's third law around that star.
 * Masses from GM (Jupiter: IAU 2015 B3 nominal; Saturn, Uranus, Neptune: JPL planetary GM values,
 * from memory), semi-major axes: J2000 mean orbital elements (from memory, to 4 figures).
 */
import { GM_EARTH, GM_JUPITER, GM_SUN, AU, DAY } from '../rv/index.ts'

const GIANTS = [
  { name: 'Jupiter', gm: GM_JUPITER, aAu: 5.2026 },
  { name: 'Saturn', gm: 3.7931187e16, aAu: 9.5549 },
  { name: 'Uranus', gm: 5.793939e15, aAu: 19.2184 },
  { name: 'Neptune', gm: 6.836529e15, aAu: 30.1104 },
]

export interface ChartPlanet { name: string; period: number; massEarth: number; aAu: number }

/** The giants around a star of `starMass` solar masses (period in days). */
export function solarSystemGiants(starMass: number): ChartPlanet[] {
  if (!(starMass > 0)) throw new RangeError(`starMass must be > 0, got ${starMass}`)
  return GIANTS.map((g) => {
    const a = g.aAu * AU
    const period = 2 * Math.PI * Math.sqrt(a * a * a / (starMass * GM_SUN + g.gm)) / DAY
    return { name: g.name, period, massEarth: g.gm / GM_EARTH, aAu: g.aAu }
  })
}

// Shared pieces of the detection-limit and planner tests.
import { createRandom } from '../../shared/math/random.ts'
import type { SamplingWorld } from './sampling-setup.ts'

/** A small grid: 4 periods × 4 masses × 2 phases in 4 chunks. */
export const SMALL_GRID = { periods: 4, masses: 4, phases: 2, chunks: 4 }

/** An invented observatory. */
export const SITE = { name: 'South mountain (test)', lonDeg: -70.73, latDeg: -29.26, heightM: 2400 }

/**
 * A finished sampling run of the world's star written straight into the table (no sampler needed):
 * 200 seeded draws around the world's synthetic orbit (P 12.3 d, K 30 m/s, circular).
 */
export async function insertFinishedSamplingRun(w: SamplingWorld): Promise<number> {
  const r = createRandom(3)
  const n = 200
  const col = (f: () => number) => Array.from({ length: n }, f)
  const names = ['P b', 'K b', 'e b', 'ω b', 'Tc b', 'Tp b', 'offset default', 'jitter default', 'ln posterior']
  const P = col(() => 12.3 + 0.01 * r.normal())
  const columns = [P, col(() => 30 + r.normal()), col(() => 0.02 * r.next()), col(() => 360 * r.next()), col(() => 2459001.2 + 0.05 * r.normal()),
    col(() => 2459001.2 + 0.05 * r.normal()), col(() => 0.5 * r.normal()), col(() => 1 + 0.1 * r.next()), col(() => 0)]
  const input = { data: { measurementIds: [], t: [], y: [], dy: [3, 3, 3], instrument: [0, 0, 0], instrumentNames: ['default'] }, model: { planets: [], trend: 'none', epoch: 2459050 }, starMass: null }
  const result = { parameters: [], sample: { names, units: names.map(() => ''), step: col(() => 1), walker: col(() => 0), columns }, diagnostics: {}, settings: {}, start: {} }
  const [rows] = await w.services.sequelize.query(
    `INSERT INTO sampling_runs (star_id, settings, input, state, result, created_at, updated_at)
     VALUES (:star, :settings, :input, 'succeeded', :result, now(), now()) RETURNING id`,
    { replacements: { star: w.starId, settings: JSON.stringify({ walkers: 2, steps: 100, burn: 0, thin: 1, seed: 1 }), input: JSON.stringify(input), result: JSON.stringify(result) } },
  )
  return (rows as Array<{ id: number }>)[0].id
}

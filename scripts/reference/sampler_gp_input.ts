/**
 * Writes the input of scripts/reference/sampler_gp_emcee.py for the GP posterior checks: the seeded
 * spotted star (tests/shared/rv/gp/spotted-star.ts, one instrument), the starting point from the
 * planets + GP MAP (fitWithGp) and the priors both sides state.
 *
 *   npx tsx scripts/reference/sampler_gp_input.ts N OUT.json [MAX_STEPS WALKERS [free]]
 *     (N rows: 60 for the fixtures, 200 for the bench; `free`: GP_FREE_CASE, every hyperparameter sampled)
 */
import { writeFileSync } from 'node:fs'
import { fitKeplerians, fitWithGp, baseline, type RvData } from '../../shared/rv/index.ts'
import { createRandom } from '../../shared/math/random.ts'
import { spottedStar } from '../../tests/shared/rv/gp/spotted-star.ts'

/**
 * The reference case: the rotation period and the amplitude sampled (P_rot ~ N(23.5, 2²) d), the decay
 * time and shape held at the values the star was drawn with (with them free on these 60 rows τ grows
 * past 1000 steps: the decay time–amplitude ridge and K's tail toward 0; GP_FREE_CASE samples them on
 * 120 rows), the planet's period within
 * its periodogram peak (uniform on [12, 12.6] d: the 11.75-d rotation harmonic is another mode).
 */
export const GP_SAMPLER_CASE = {
  noise: { kernel: 'rotation' as const, period: { value: 23.5, sigma: 2 }, decayTime: { value: 120, fixed: true }, shape: { value: 0.2, fixed: true } },
  periodPrior: { min: 12, max: 12.6 },
  seed: 5,
}

/**
 * The same star with every GP hyperparameter sampled (amplitude, rotation period, decay time, shape,
 * jitter): decay time log-uniform between P_rot/2 and 10 × max(baseline, P_rot), shape uniform on [0, 1];
 * their starting values are the star's. fixtures/sampler/gp-all-free-emcee.json.
 */
export const GP_FREE_CASE = {
  noise: { kernel: 'rotation' as const, period: { value: 23.5, sigma: 2 }, decayTime: { value: 120 }, shape: { value: 0.2 } },
  periodPrior: { min: 12, max: 12.6 },
  seed: 5,
}

export function gpSamplerData(n: number): RvData {
  return spottedStar(1, n, 300, false).data
}

/**
 * Points at which both sides' ln posterior is compared one by one (`--log-prob`), seeded: the planet,
 * offset, jitter and amplitude scattered about the start; the decay time drawn log-uniformly over a
 * range a little wider than its prior's (P_rot/2 to 10 × max(baseline, P_rot)), the rotation period
 * about its prior centre, the shape on [−0.1, 1.1] — so some points fall outside the support on purpose.
 */
export function gpFreeCheckPoints(start: number[], span: number, count = 24): number[][] {
  const rng = createRandom(17)
  const spread = [2e-3, 0.3, 0.15, 0.15, 0.3, 1.5, 0.8, 0.4]
  const pts: number[][] = []
  for (let k = 0; k < count; k++) {
    const x = start.slice(0, 8).map((v, i) => v + spread[i] * rng.normal())
    const prot = GP_FREE_CASE.noise.period.value + 3 * rng.normal()
    const lo = Math.log(prot / 2) - 0.3, hi = Math.log(10 * Math.max(span, prot)) + 0.3
    x.push(lo + (hi - lo) * rng.next(), prot, -0.1 + 1.2 * rng.next())
    pts.push(x)
  }
  return pts
}

export function gpSamplerInput(n: number, maxSteps = 200000, walkers = 32, free = false): Record<string, unknown> {
  const cs = free ? GP_FREE_CASE : GP_SAMPLER_CASE
  const data = gpSamplerData(n)
  const white = fitKeplerians(data, { planets: [{ period: 12.3, K: 7, e: 0.1, omegaDeg: 60, tc: 2459003 }] })
  const p0 = white.planets[0]
  const g = fitWithGp(data, { planets: [{ period: p0.period, K: p0.K, e: p0.e, omegaDeg: p0.omegaDeg, tc: p0.tc }], gp: cs.noise })
  const p = g.planets[0], k = g.noise.kernel
  if (k.kind !== 'rotation') throw new Error('rotation kernel expected')
  const w = (p.omegaDeg * Math.PI) / 180
  const start = [Math.log(p.period), Math.log(p.K), Math.sqrt(p.e) * Math.cos(w), Math.sqrt(p.e) * Math.sin(w), p.tc, g.instruments[0].offset,
    Math.log(Math.max(g.noise.jitter[0], 0.1)), Math.log(g.noise.amplitude[0])]
  // coordinate order as the python script's: … ln h, [ln L,] P_rot[, f]
  if (free) start.push(Math.log(k.decayTime), k.period, k.shape)
  else start.push(k.period)
  const scale = free ? [1e-3, 0.15, 0.1, 0.1, 0.2, 2, 0.5, 0.2, 0.3, 0.3, 0.1] : [1e-3, 0.15, 0.1, 0.1, 0.2, 2, 0.5, 0.2, 0.3]
  return {
    t: Array.from(data.t), y: Array.from(data.y), dy: Array.from(data.dy), start, scale,
    ...(free ? { points: gpFreeCheckPoints(start, baseline(data.t)) } : {}),
    ...(free ? {} : { fixed: { decayTime: GP_SAMPLER_CASE.noise.decayTime.value, shape: GP_SAMPLER_CASE.noise.shape.value } }),
    walkers, maxSteps, checkEvery: 500, groups: 4, seed: cs.seed,
    prot: { mu: cs.noise.period.value, sigma: cs.noise.period.sigma }, period: cs.periodPrior,
  }
}

if (process.argv[1] && process.argv[1].endsWith('sampler_gp_input.ts')) {
  const n = Number(process.argv[2] ?? 60)
  writeFileSync(process.argv[3] ?? '/dev/stdout', JSON.stringify(gpSamplerInput(n, Number(process.argv[4] ?? 200000), Number(process.argv[5] ?? 32), process.argv[6] === 'free')))
}

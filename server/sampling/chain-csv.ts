// The kept chain of a finished (or cancelled) sampling run as CSV: one row per walker per kept
// step, the physical parameters (P, K, e, ω, Tc, Tp, M sin i, a, offsets, jitters, trend) and
// ln posterior, with the run's final thinning. Read from the append-only chunks (migration 0008).
import type { Services } from '../services.ts'
import type { SamplingRun } from '../db/models-sampling.ts'
import { ConflictError } from '../errors.ts'
import { fitKeplerians, type PlanetParam, type PlanetStart, type Prior } from '../../shared/rv/index.ts'
import { createLogPosterior, specFromFit } from '../../shared/rv/posterior.ts'
import { physicalColumns } from '../../shared/rv/mcmc.ts'
import { rvDataOf } from './thread.ts'
import { loadChunks } from './runner.ts'

const cell = (v: number): string => (Number.isFinite(v) ? String(v) : '')
const quote = (s: string): string => (/[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s)

/** CSV text of the run's kept chain; 409 when the run has no stored chain (not finished, or run before chunks existed). */
export async function chainCsv(s: Services, run: SamplingRun): Promise<string> {
  const result = run.result
  if (!result || !result.settings.keptThin) throw new ConflictError('This run has no stored chain: it has not finished, or it was made before chains were kept.')
  const { keptThin, stepsDone, burn, seed } = result.settings
  const { rows } = await loadChunks(s, run.id, stepsDone)
  const input = run.input
  const data = rvDataOf(input)
  const planets = input.model.planets as PlanetStart[]
  const fit = fitKeplerians(data, { planets, trend: input.model.trend, epoch: input.model.epoch, priors: input.model.priors as Prior[] })
  const fixed = (result.settings.fixed ?? planets.map((p) => p.fix ?? [])) as PlanetParam[][]
  const post = createLogPosterior(data, specFromFit(fit, { fix: fixed }))
  // a parallel run's merged chain holds every ensemble's walkers (result.settings.walkers)
  const W = result.settings.walkers, D = post.nDim
  if (rows.chain.length !== rows.steps.length * W * D) throw new ConflictError('The stored chain does not match the run\'s model; it cannot be written.')
  const keep: number[] = []
  for (let r = 0; r < rows.steps.length; r++) if (rows.steps[r]! % keptThin === 0 && rows.steps[r]! <= stepsDone) keep.push(r)
  const chain = new Float64Array(keep.length * W * D)
  keep.forEach((r, i) => chain.set(rows.chain.subarray(r * W * D, (r + 1) * W * D), i * W * D))
  const { cols } = physicalColumns(data, fit, post, chain, keep.length * W, input.starMass ?? undefined, seed)
  const header = ['step', 'walker', 'after_burn_in', ...cols.map((c) => (c.unit ? `${c.name} (${c.unit})` : c.name)), 'ln posterior']
  const lines = [header.map(quote).join(',')]
  keep.forEach((r, i) => {
    const step = rows.steps[r]!
    for (let w = 0; w < W; w++) {
      const j = i * W + w
      lines.push([String(step), String(w), step > burn ? '1' : '0', ...cols.map((c) => cell(c.v[j]!)), cell(rows.lnProb[r * W + w]!)].join(','))
    }
  })
  return lines.join('\n') + '\n'
}

// The next-observation planner for one star: posterior draws of a finished sampling run, the
// star's coordinates and an observatory → the recommended instants (shared/plan), computed on a
// thread (server/limits/threads.ts) so the event loop stays free.
import { QueryTypes } from 'sequelize'
import type { Services } from '../services.ts'
import type { Star } from '../db/models.ts'
import { ConflictError, NotFoundError, ValidationError } from '../errors.ts'
import { runInThread } from '../limits/threads.ts'
import { dateToJd, resolveLimits } from '../../shared/plan/index.ts'
import { PLAN_DEFAULTS, planRequestSchema, type PlanRequest, type PlanResponse } from '../../shared/api/plan.ts'

function median(v: number[]): number {
  const s = [...v].filter(Number.isFinite).sort((a, b) => a - b)
  if (!s.length) return NaN
  const h = (s.length - 1) / 2
  return 0.5 * (s[Math.floor(h)] + s[Math.ceil(h)])
}

interface SamplingRow {
  star_id: number; state: string
  result: { sample: { names: string[]; columns: Array<Array<number | null>> } } | null
  input: { data: { dy: number[]; instrument: number[]; instrumentNames: string[] }; model: { epoch?: number } }
}

export async function planFor(s: Services, star: Star, raw: PlanRequest): Promise<PlanResponse> {
  const body = planRequestSchema.parse(raw)
  if (star.raDeg === null || star.decDeg === null || star.raDeg === undefined || star.decDeg === undefined) {
    throw new ConflictError('The star has no coordinates: set its right ascension and declination first (the planner needs them to know when it is up).')
  }
  const site = body.site ?? star.defaultSite ?? null
  if (!site) throw new ValidationError('is required: choose an observatory (or set the star\'s default site)', 'site')
  const rows = await s.sequelize.query<SamplingRow>(
    'SELECT star_id, state, result, input FROM sampling_runs WHERE id = :id', { replacements: { id: body.samplingRunId }, type: QueryTypes.SELECT },
  )
  const run = rows[0]
  if (!run || run.star_id !== star.id) throw new NotFoundError('Sampling run')
  if (run.state !== 'succeeded' || !run.result) throw new ConflictError(`The sampling run has not succeeded (it is ${run.state}): the planner needs its posterior draws.`, 'samplingRunId')
  const names = run.input.data.instrumentNames
  const instrument = body.instrument ?? names[0]
  const k = names.indexOf(instrument)
  if (k < 0) throw new ValidationError(`must be one of the run's instruments (${names.join(', ')})`, 'instrument')
  // rows with a missing value (non-finite in the run) are left out
  const cols = run.result.sample.columns
  const keep = cols[0].map((_, i) => cols.every((c) => c[i] !== null && Number.isFinite(c[i])))
  const columns = cols.map((c) => c.filter((_, i) => keep[i]) as number[])
  if (columns[0].length < 10) throw new ConflictError('The sampling run kept fewer than 10 complete draws: run it longer.', 'samplingRunId')
  let noise = body.noise
  if (noise === undefined) {
    const dy = median(run.input.data.dy.filter((_, i) => run.input.data.instrument[i] === k))
    const jIdx = run.result.sample.names.indexOf(`jitter ${instrument}`)
    const jit = jIdx >= 0 ? median(columns[jIdx]) : 0
    noise = Math.hypot(dy, Number.isFinite(jit) ? jit : 0)
  }
  if (!(noise > 0)) throw new ValidationError('could not be derived from the data: give the error of the new velocity', 'noise')
  const limits = resolveLimits({ sunMaxAltDeg: body.sunMaxAltDeg, minAltDeg: body.minAltDeg, maxAirmass: body.maxAirmass, minMoonSeparationDeg: body.minMoonSeparationDeg })
  const startJd = body.startJd ?? dateToJd(new Date())
  const endJd = startJd + (body.days ?? PLAN_DEFAULTS.days)
  const stepMinutes = body.stepMinutes ?? PLAN_DEFAULTS.stepMinutes
  const out = await runInThread('plan', {
    sample: { names: run.result.sample.names, columns },
    instrument, epoch: run.input.model.epoch,
    options: {
      star: { raDeg: star.raDeg, decDeg: star.decDeg }, site, grid: { startJd, endJd, stepMinutes },
      limits, noise, count: body.count ?? PLAN_DEFAULTS.count, minSpacingDays: body.minSpacingDays ?? PLAN_DEFAULTS.minSpacingDays,
    },
    curveFrom: startJd, curveTo: endJd, curvePoints: 400,
  }).catch((e: Error) => { throw new ValidationError(`The plan cannot be computed: ${e.message}`) })
  return {
    starId: star.id, samplingRunId: body.samplingRunId, instrument, noise, site,
    star: { name: star.name, raDeg: star.raDeg, decDeg: star.decDeg },
    window: { startJd, endJd, stepMinutes },
    limits: { sunMaxAltDeg: limits.sunMaxAltDeg, minAltDeg: limits.minAltDeg, maxAirmass: limits.maxAirmass, minMoonSeparationDeg: limits.minMoonSeparationDeg },
    recommendations: out.plan.recommendations, observableCount: out.plan.observableCount, warnings: out.plan.warnings, timeNote: out.plan.timeNote,
    slots: out.plan.slots, curve: out.curve,
  }
}

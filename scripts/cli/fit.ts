// `cli.ts fit`: the core's search (no --planet) or the core's fitSpec (one --planet per planet),
// the same functions and defaults as the server's compute tasks. With activity indicators in the
// table, a rotation period or --noise gp, the GP paths of ./fit-noise.ts take over.
import { roundByUncertainty } from '../../shared/report/round.ts'
import { planetSpecSchema } from '../../shared/api/analyses.ts'
import {
  searchPlanets, fitSpec, derivedPlanet, fitWarnings, planetLetter, searchSummary,
  type FitResult, type PlanetSpecInput, type PlanetPrior, type TrendKind, type SearchStep, type SearchSummary,
} from '../../shared/rv/index.ts'
import { UsageError, num, str, list, type Parsed } from './args.ts'
import { load } from './load.ts'
import { fmt, table, finiteOrNull, epochUnit, instrumentTable, UNITS, PEAK_CAUTION, type CliIo } from './format.ts'
import { noiseOptions, noiseRoute, runActivitySearch, runGpModel } from './fit-noise.ts'

const PLANET_KEYS = ['period', 'K', 'e', 'omegaDeg', 'tc', 'tp'] as const

/** `period=4.23,K=55,e=0,fix=e+omegaDeg` → a planet spec, checked by the API's schema. */
export function parsePlanet(s: string, k: number): PlanetSpecInput {
  const out: Record<string, unknown> = {}
  for (const part of s.split(',').map((x) => x.trim()).filter(Boolean)) {
    const eq = part.indexOf('=')
    if (eq <= 0) throw new UsageError(`--planet ${planetLetter(k)}: '${part}' is not KEY=VALUE (keys: ${PLANET_KEYS.join(', ')}, fix)`)
    const key = part.slice(0, eq), value = part.slice(eq + 1)
    if (key === 'fix') { out.fix = value.split('+').filter(Boolean); continue }
    if (!(PLANET_KEYS as readonly string[]).includes(key)) throw new UsageError(`--planet ${planetLetter(k)}: unknown key '${key}' (keys: ${PLANET_KEYS.join(', ')}, fix)`)
    const v = Number(value)
    if (value.trim() === '' || !Number.isFinite(v)) throw new UsageError(`--planet ${planetLetter(k)}: ${key} must be a number, got '${value}'`)
    out[key] = v
  }
  const r = planetSpecSchema.safeParse(out)
  if (!r.success) {
    const issue = r.error.issues[0]!
    throw new UsageError(`--planet ${planetLetter(k)}: ${issue.path.join('.') || 'period'} ${issue.message}`)
  }
  return r.data
}

/** `b.period=normal:4.23:0.01` or `2.e=uniform:0:0.5` → [planet index, prior]. */
export function parsePrior(s: string, nPlanets: number): [number, PlanetPrior] {
  const m = /^([a-z]|\d+)\.(period|K|e|omegaDeg|tc|tp)=(normal|uniform):([^:]+):([^:]+)$/.exec(s.trim())
  if (!m) throw new UsageError(`--prior '${s}': write PLANET.PARAM=normal:MU:SIGMA or PLANET.PARAM=uniform:MIN:MAX (e.g. b.period=normal:4.23:0.01)`)
  const k = /^\d+$/.test(m[1]!) ? Number(m[1]) - 1 : m[1]!.charCodeAt(0) - 98
  if (!(k >= 0 && k < nPlanets)) throw new UsageError(`--prior '${s}': planet ${m[1]} is not among the ${nPlanets} --planet given`)
  const a = Number(m[4]), b = Number(m[5])
  if (!Number.isFinite(a) || !Number.isFinite(b)) throw new UsageError(`--prior '${s}': the two values must be numbers`)
  const param = m[2] as PlanetPrior['param']
  if (m[3] === 'normal') {
    if (!(b > 0)) throw new UsageError(`--prior '${s}': SIGMA must be > 0`)
    return [k, { param, gaussian: { mu: a, sigma: b } }]
  }
  if (!(b > a)) throw new UsageError(`--prior '${s}': MAX must exceed MIN`)
  return [k, { param, uniform: { min: a, max: b } }]
}

interface Options {
  planets: number | 'auto'
  trend: TrendKind | 'auto'
  spec: PlanetSpecInput[] | null
  minPeriod?: number; maxPeriod?: number; maxPlanets?: number; falseAlarm?: number; maxIterations?: number
  starMass?: number; starMassErr?: number
}

function options(p: Parsed): Options {
  const ps = str(p, 'planets') ?? 'auto'
  let planets: number | 'auto'
  if (ps === 'auto') planets = 'auto'
  else if (/^\d+$/.test(ps)) planets = Number(ps)
  else throw new UsageError(`--planets must be a non-negative integer or auto, got '${ps}'`)
  const trendIn = str(p, 'trend')
  if (trendIn !== undefined && !['auto', 'none', 'linear', 'quadratic'].includes(trendIn)) throw new UsageError(`--trend must be auto, none, linear or quadratic, got '${trendIn}'`)
  const starMass = num(p, 'star-mass', (v) => v > 0, 'a positive stellar mass in solar masses')
  const starMassErr = num(p, 'star-mass-err', (v) => v >= 0, 'a non-negative error in solar masses')
  if (starMassErr !== undefined && starMass === undefined) throw new UsageError('--star-mass-err needs --star-mass')
  const minPeriod = num(p, 'min-period', (v) => v > 0, 'a positive number of days')
  const maxPeriod = num(p, 'max-period', (v) => v > 0, 'a positive number of days')
  if (minPeriod !== undefined && maxPeriod !== undefined && !(maxPeriod > minPeriod)) throw new UsageError('--max-period must exceed --min-period')
  const maxPlanets = num(p, 'max-planets', (v) => Number.isInteger(v) && v >= 1 && v <= 8, 'an integer from 1 to 8')
  const falseAlarm = num(p, 'false-alarm', (v) => v > 0 && v < 1, 'a probability in (0, 1)')
  const maxIterations = num(p, 'max-iterations', (v) => Number.isInteger(v) && v >= 1 && v <= 2000, 'an integer from 1 to 2000')
  const planetArgs = list(p, 'planet'), priorArgs = list(p, 'prior')
  let spec: PlanetSpecInput[] | null = null
  if (planetArgs.length) {
    if (str(p, 'planets') !== undefined) throw new UsageError('give --planets (search) or --planet (model), not both')
    for (const [flag, v] of [['min-period', minPeriod], ['max-period', maxPeriod], ['max-planets', maxPlanets], ['false-alarm', falseAlarm]] as const) {
      if (v !== undefined) throw new UsageError(`--${flag} is a search option; with --planet the periods are given`)
    }
    if (trendIn === 'auto') throw new UsageError('with --planet give --trend none, linear or quadratic (auto belongs to the search)')
    spec = planetArgs.map((s, k) => parsePlanet(s, k))
    for (const s of priorArgs) { const [k, pr] = parsePrior(s, spec.length); spec[k] = { ...spec[k]!, priors: [...(spec[k]!.priors ?? []), pr] } }
  } else {
    if (priorArgs.length) throw new UsageError('--prior needs the planets it is about: give them with --planet')
    if (maxIterations !== undefined) throw new UsageError('--max-iterations applies to a model given with --planet')
  }
  const trend = (trendIn ?? (spec ? 'none' : 'auto')) as TrendKind | 'auto'
  return { planets, trend, spec, minPeriod, maxPeriod, maxPlanets, falseAlarm, maxIterations, starMass, starMassErr }
}

export function runFit(p: Parsed, io: CliIo): void {
  const o = options(p)
  const noise = noiseOptions(p)
  const { data, input, indicators } = load(p, io)
  const t0 = performance.now()
  // a fixed number of planets (--planets N) keeps the plain search unless a GP is asked for
  const route = noiseRoute(noise, o.spec !== null, indicators.length > 0 && o.planets === 'auto')
  const common = { data, input, starMass: o.starMass, starMassErr: o.starMassErr, json: !!p.values.json, io, t0 }
  if (route === 'activity') {
    if (o.planets !== 'auto') throw new UsageError('the search with activity decides the number of planets itself: drop --planets N with --noise gp or --rotation-period')
    runActivitySearch(common, indicators, noise, { minPeriod: o.minPeriod, maxPeriod: o.maxPeriod, maxPlanets: o.maxPlanets, trend: o.trend })
    return
  }
  if (route === 'gp-model') { runGpModel(common, o.spec!, o.trend as TrendKind, noise, o.maxIterations); return }
  let fit: FitResult, steps: SearchStep[] = [], report: SearchSummary | null = null
  try {
    if (o.spec) {
      fit = fitSpec(data, o.spec, { trend: o.trend as TrendKind, maxIterations: o.maxIterations }).fit
    } else {
      const res = searchPlanets(data, {
        planets: o.planets, trend: o.trend, minPeriod: o.minPeriod, maxPeriod: o.maxPeriod, maxPlanets: o.maxPlanets, falseAlarm: o.falseAlarm,
      })
      fit = res.fit
      steps = res.steps
      report = searchSummary(res)
    }
  } catch (e) {
    if (e instanceof RangeError) throw new UsageError(`${e.message}; check the model options (see cli.ts fit --help)`)
    throw e
  }
  const planetsOut = fit.planets.map((pl) => {
    const d = o.starMass !== undefined ? derivedPlanet(pl, o.starMass, { starMassErr: o.starMassErr ?? 0, covariance: pl.covPKe }) : null
    return {
      period: pl.period, K: pl.K, e: pl.e, omegaDeg: pl.omegaDeg, tp: pl.tp, tc: pl.tc,
      msiniMjup: d ? d.msiniMjup : null, msiniMearth: d ? d.msiniMearth : null, aAu: d ? d.aAu : null,
      uncertainty: {
        period: finiteOrNull(pl.uncertainty.period), K: finiteOrNull(pl.uncertainty.K), e: finiteOrNull(pl.uncertainty.e),
        omegaDeg: finiteOrNull(pl.uncertainty.omegaDeg), tp: finiteOrNull(pl.uncertainty.tp), tc: finiteOrNull(pl.uncertainty.tc),
        msiniMjup: d ? finiteOrNull(d.uncertainty.msiniMjup) : null, aAu: d ? finiteOrNull(d.uncertainty.aAu) : null,
      },
    }
  })
  const ms = performance.now() - t0
  const doc = {
    input,
    mode: o.spec ? 'model' : 'search',
    planets: planetsOut,
    instruments: fit.instruments.map((i) => ({ name: i.name, n: i.n, offset: i.offset, jitter: i.jitter, rms: i.rms })),
    trend: fit.trend ? { kind: fit.trend.kind, slope: fit.trend.slope, curvature: fit.trend.curvature, epoch: fit.trend.epoch } : null,
    stats: {
      nPoints: fit.stats.nPoints, nParams: fit.stats.nParams, chi2: fit.stats.chi2, lnL: fit.stats.lnL,
      bic: fit.stats.bic, aic: fit.stats.aic, rms: fit.stats.rms, converged: fit.converged, status: fit.status,
    },
    warnings: fitWarnings(fit, input.baselineDays),
    report,
    search: steps.map((s) => ({ planets: s.planets, trend: s.trend, bic: s.bic, lnL: s.lnL, nextPeakFap: s.nextPeakFap, nextPeakPeriod: s.nextPeakPeriod })),
    starMass: o.starMass !== undefined ? { value: o.starMass, error: o.starMassErr ?? 0 } : null,
    units: UNITS,
    timingMs: { total: ms },
  }
  if (p.values.json) { io.out(JSON.stringify(doc)); return }
  io.out(`${input.file}: ${input.rows} rows, instruments ${input.instruments.join(', ')}, unit ${input.unit}, time ${input.timeFormat}, baseline ${fmt(input.baselineDays)} d`)
  io.out(`model: ${planetsOut.length} Keplerian${planetsOut.length === 1 ? '' : 's'}, trend ${fit.trend ? fit.trend.kind : 'none'}; ${fit.converged ? 'converged' : `NOT converged (${fit.message})`}`)
  io.out('')
  if (planetsOut.length) {
    const pm = (v: number | null, e: number | null): string => {
      if (v === null) return '—'
      if (e === null || !(e > 0) || !Number.isFinite(e)) return fmt(v)
      const r = roundByUncertainty(v, e)
      return `${r.value} ± ${r.error}`
    }
    io.out(table(planetsOut.map((q, i) => [
      planetLetter(i), pm(q.period, q.uncertainty.period), pm(q.K, q.uncertainty.K), pm(q.e, q.uncertainty.e),
      pm(q.omegaDeg, q.uncertainty.omegaDeg), pm(q.tp, q.uncertainty.tp), pm(q.tc, q.uncertainty.tc),
      pm(q.msiniMjup, q.uncertainty.msiniMjup), pm(q.aAu, q.uncertainty.aAu),
    ]), ['planet', 'P [d]', 'K [m/s]', 'e', 'ω [deg]', `Tp [${epochUnit(input.timeFormat)}]`, `Tc [${epochUnit(input.timeFormat)}]`, 'M sin i [M_Jup]', 'a [au]']))
    io.out('')
  }
  io.out(instrumentTable(fit.instruments))
  if (doc.trend) io.out(`\ntrend: slope ${fmt(doc.trend.slope)} m/s/d, curvature ${fmt(doc.trend.curvature)} m/s/d², epoch ${fmt(doc.trend.epoch)}`)
  io.out('')
  io.out(`χ² ${fmt(doc.stats.chi2)}  lnL ${fmt(doc.stats.lnL)}  BIC ${fmt(doc.stats.bic)}  AIC ${fmt(doc.stats.aic)}  rms ${fmt(doc.stats.rms)} m/s  (${doc.stats.nPoints} points, ${doc.stats.nParams} parameters)`)
  for (const w of doc.warnings) io.out(`warning: ${w.message}`)
  if (doc.search.length) {
    io.out('')
    io.out(table(doc.search.map((s) => [s.planets, s.trend, s.bic, s.lnL, s.nextPeakFap]), ['planets', 'trend', 'BIC', 'lnL', 'next peak FAP']))
  }
  if (report) {
    for (const sg of report.signals) {
      const partners = sg.aliases.map((x) => `${fmt(x.period)} d (${x.relation}, lnL ${fmt(x.lnL)})`).join('; ')
      io.out(`planet ${planetLetter(sg.planet)}: alias partners fitted: ${partners || 'none'}${sg.runnerUpDeltaLnL !== null ? `; ΔlnL to the runner-up ${fmt(sg.runnerUpDeltaLnL)}` : ''}`)
    }
    for (const f of report.flags) io.out(`${f.severity}: ${f.message}`)
    for (const a of report.alternatives) io.out(`alternative: ${a.description} (BIC ${fmt(a.bic)}, lnL ${fmt(a.lnL)})`)
    io.out(PEAK_CAUTION)
  }
}

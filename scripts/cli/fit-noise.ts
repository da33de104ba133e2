// `cli.ts fit` with a GP noise model: the search that weighs activity (searchWithActivity) and a model
// given with --planet fitted as planets + GP (fitWithGp), the same core functions as the server's.
import {
  searchWithActivity, fitWithGp, fitSpec, flattenPriors, derivedPlanet, gpHyperparameters,
  type RvData, type IndicatorColumn, type GpHyperSpec, type PlanetSpecInput, type TrendKind, type GpPlanetFit,
} from '../../shared/rv/index.ts'
import { UsageError, str, type Parsed } from './args.ts'
import type { InputInfo } from './load.ts'
import { fmt, UNITS, PEAK_CAUTION, type CliIo } from './format.ts'
import { NOISE_UNITS, gpPlanetsOut, hyperJson, planetTable, hyperLines, activityLines, headline } from './format-noise.ts'

export interface NoiseOptions {
  mode: 'auto' | 'white' | 'gp'
  rotation: { value: number; sigma?: number } | null
  kernel: GpHyperSpec['kernel']
  decayTime?: number
}

/** Reads --noise, --rotation-period, --gp-kernel, --decay-time; bad values are UsageErrors naming the option. */
export function noiseOptions(p: Parsed): NoiseOptions {
  const mode = str(p, 'noise') ?? 'auto'
  if (!['auto', 'white', 'gp'].includes(mode)) throw new UsageError(`--noise must be auto, white or gp, got '${mode}'`)
  const kernel = str(p, 'gp-kernel') ?? 'rotation'
  if (kernel !== 'rotation' && kernel !== 'quasi-periodic') throw new UsageError(`--gp-kernel must be rotation or quasi-periodic, got '${kernel}'`)
  let rotation: NoiseOptions['rotation'] = null
  const rp = str(p, 'rotation-period')
  if (rp !== undefined) {
    const parts = rp.split(',').map((x) => x.trim())
    const v = Number(parts[0]), s = parts[1] !== undefined ? Number(parts[1]) : undefined
    if (parts.length > 2 || parts[0] === '' || !(v > 0) || (s !== undefined && !(s > 0))) {
      throw new UsageError(`--rotation-period must be D or D,SIGMA with D > 0 days and SIGMA > 0 (e.g. 23.5 or 23.5,1.5), got '${rp}'`)
    }
    rotation = { value: v, ...(s !== undefined ? { sigma: s } : {}) }
  }
  let decayTime: number | undefined
  const dt = str(p, 'decay-time')
  if (dt !== undefined) {
    decayTime = Number(dt)
    if (!(decayTime > 0)) throw new UsageError(`--decay-time must be a positive number of days, got '${dt}'`)
    if (rotation && !(decayTime > rotation.value / 2)) throw new UsageError(`--decay-time must exceed half the rotation period (${rotation.value / 2} d), got ${decayTime}`)
  }
  if (mode === 'white') {
    for (const f of ['rotation-period', 'gp-kernel', 'decay-time']) if (str(p, f) !== undefined) throw new UsageError(`--${f} belongs to a GP; drop it or use --noise gp`)
  }
  return { mode: mode as NoiseOptions['mode'], rotation, kernel, decayTime }
}

/** Which path a fit takes: the plain white-noise one, the activity search, or a model + GP. */
export function noiseRoute(o: NoiseOptions, model: boolean, hasIndicators: boolean): 'white' | 'activity' | 'gp-model' {
  if (o.mode === 'white') return 'white'
  if (model) {
    if (o.mode === 'gp' || o.rotation) {
      if (!o.rotation) throw new UsageError('a model with --noise gp needs --rotation-period D[,SIGMA] (the GP is tied to it)')
      return 'gp-model'
    }
    return 'white'
  }
  if (o.mode === 'gp' && !o.rotation && !hasIndicators) {
    throw new UsageError('--noise gp needs a rotation period: give --rotation-period D[,SIGMA] or a table with an activity-indicator column')
  }
  return o.mode === 'gp' || o.rotation || hasIndicators ? 'activity' : 'white'
}

interface Common { data: RvData; input: InputInfo; starMass?: number; starMassErr?: number; json: boolean; io: CliIo; t0: number }

function derive(c: Common) {
  return (p: GpPlanetFit) => {
    if (c.starMass === undefined) return null
    const u = p.uncertainty
    const cov = [u.period ** 2, 0, 0, 0, u.K ** 2, 0, 0, 0, u.e ** 2].map((v) => (Number.isFinite(v) ? v : 0))
    return derivedPlanet(p, c.starMass, { starMassErr: c.starMassErr ?? 0, covariance: cov })
  }
}

/** Search with activity: N planets + M activity candidates, the GP and both BICs. */
export function runActivitySearch(
  c: Common, indicators: IndicatorColumn[], o: NoiseOptions,
  search: { minPeriod?: number; maxPeriod?: number; maxPlanets?: number; trend: TrendKind | 'auto' },
): void {
  let r
  try {
    r = searchWithActivity(c.data, {
      indicators, rotationPeriod: o.rotation, kernel: o.kernel, minPeriod: search.minPeriod, maxPeriod: search.maxPeriod,
      ...(search.maxPlanets !== undefined ? { maxPlanets: search.maxPlanets } : {}),
      search: { trend: search.trend, ...(search.maxPlanets !== undefined ? { maxPlanets: search.maxPlanets } : {}) },
    })
  } catch (e) {
    if (e instanceof RangeError) throw new UsageError(`${e.message}; check the noise options (see cli.ts fit --help)`)
    throw e
  }
  const planets = gpPlanetsOut(r.planets, derive(c))
  const doc = {
    input: c.input, mode: 'search with activity', noise: r.preferred === 'gp' ? 'gp' : 'white',
    summary: headline(planets.length, r.activity.length),
    planets, activity: r.activity, rotation: r.rotation,
    gp: r.gp ? hyperJson(r.gp) : null,
    instruments: r.gpFit && r.preferred === 'gp' ? r.gpFit.instruments : r.whiteFit?.instruments.map((i) => ({ name: i.name, offset: i.offset, jitter: i.jitter })) ?? [],
    bic: { planetsWhiteNoise: r.bic.white, planetsGp: r.bic.gp, whiteNoiseSearch: r.bic.whiteSearch },
    steps: r.steps, cautions: r.cautions,
    units: { ...UNITS, ...NOISE_UNITS },
    timingMs: { total: performance.now() - c.t0 },
  }
  if (c.json) { c.io.out(JSON.stringify(doc)); return }
  const io = c.io
  io.out(`${c.input.file}: ${c.input.rows} rows, instruments ${c.input.instruments.join(', ')}, unit ${c.input.unit}, time ${c.input.timeFormat}, baseline ${fmt(c.input.baselineDays)} d`)
  io.out(`search with activity: ${doc.summary}; noise model preferred: ${r.preferred === 'gp' ? 'planets + GP' : 'planets + white noise'}`)
  io.out('')
  if (planets.length) { io.out(planetTable(planets, c.input.timeFormat)); io.out('') }
  for (const l of activityLines(r.activity)) io.out(l)
  if (r.gp) { io.out(''); for (const l of hyperLines(r.gp)) io.out(l) }
  io.out('')
  io.out(`BIC: planets + white noise ${fmt(r.bic.white)}${r.bic.gp !== null ? `, planets + GP ${fmt(r.bic.gp)}` : ''} (same planets); the white-noise search's own model ${fmt(r.bic.whiteSearch)}`)
  for (const w of r.cautions) io.out(`caution: ${w}`)
  io.out(PEAK_CAUTION)
}

/** A model given with --planet, fitted as planets + GP; BIC beside the same planets with white noise. */
export function runGpModel(c: Common, spec: PlanetSpecInput[], trend: TrendKind, o: NoiseOptions, maxIterations?: number): void {
  const gp: GpHyperSpec = {
    kernel: o.kernel, period: { value: o.rotation!.value, sigma: o.rotation!.sigma, source: 'the user' },
    ...(o.decayTime !== undefined ? { decayTime: { value: o.decayTime } } : {}),
  }
  let white, g
  try {
    const w = fitSpec(c.data, spec, { trend, maxIterations })
    white = w.fit
    // the GP starts from the white-noise orbits, with the model's fixed parameters and priors (as the server's fit)
    g = fitWithGp(c.data, {
      planets: white.planets.map((p, k) => {
        const fix = w.starts[k]?.fix ?? []
        return { period: p.period, K: p.K, e: p.e, omegaDeg: p.omegaDeg, ...(fix.includes('tp') ? { tp: p.tp } : { tc: p.tc }), fix }
      }),
      priors: flattenPriors(spec), gp, trend,
    })
  } catch (e) {
    if (e instanceof RangeError) throw new UsageError(`${e.message}; check the model and noise options (see cli.ts fit --help)`)
    throw e
  }
  const planets = gpPlanetsOut(g.planets, derive(c))
  const hyper = gpHyperparameters(g, c.data.instrumentNames)
  const doc = {
    input: c.input, mode: 'model', noise: 'gp', planets, gp: hyperJson(hyper),
    instruments: g.instruments,
    stats: { nPoints: g.stats.nPoints, nParams: g.stats.nParams, lnL: g.stats.lnL, lnPosterior: g.stats.lnPosterior, bic: g.stats.bic, aic: g.stats.aic, converged: g.success, status: g.status, message: g.message },
    bic: { planetsWhiteNoise: white.stats.bic, planetsGp: g.stats.bic },
    units: { ...UNITS, ...NOISE_UNITS },
    timingMs: { total: performance.now() - c.t0 },
  }
  if (c.json) { c.io.out(JSON.stringify(doc)); return }
  const io = c.io
  io.out(`${c.input.file}: ${c.input.rows} rows, instruments ${c.input.instruments.join(', ')}, unit ${c.input.unit}, time ${c.input.timeFormat}, baseline ${fmt(c.input.baselineDays)} d`)
  io.out(`model: ${planets.length} Keplerian${planets.length === 1 ? '' : 's'} + GP noise; ${g.success ? 'converged' : `NOT converged (${g.message})`}`)
  io.out('')
  if (planets.length) { io.out(planetTable(planets, c.input.timeFormat)); io.out('') }
  for (const l of hyperLines(hyper)) io.out(l)
  io.out(`offsets: ${g.instruments.map((i) => `${i.name} ${fmt(i.offset)} m/s`).join(', ')}`)
  io.out('')
  io.out(`lnL ${fmt(g.stats.lnL)}  BIC: planets + GP ${fmt(g.stats.bic)}, planets + white noise ${fmt(white.stats.bic)} (same planets)`)
}

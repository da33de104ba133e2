// How sampling settings are checked and results are written on screen: defaults and limits of a
// run, a time estimate, credible intervals "median +plus −minus unit", and the diagnostics in words.
import { formatCount } from '@/format/index.ts'
import type { FitResultJson } from '@shared/api/analyses.ts'
import type { ParameterSummary, SamplingEstimate, SamplingResult, SamplingRunSummary } from '@shared/api/sampling.ts'
import { SAMPLING_DEFAULTS, SAMPLING_LIMITS } from '@shared/api/sampling.ts'

/** Limits of the server's request schema (shared/api/sampling.ts). */
export const LIMITS = SAMPLING_LIMITS

/**
 * Parameters the server samples for a fitted model when its estimate is not at hand: five per
 * planet (P, K, e and ω through √e·cos ω and √e·sin ω, Tc) less those the model fixes (e fixed at 0
 * also drops ω; a fixed Tc or Tp drops the phase), an offset per instrument, a jitter per instrument
 * whose jitter was fitted, and the trend's slope (and curvature). Fixed parameters are those with an
 * error of exactly 0 (the fitter's mark).
 */
export function sampledParameterCount(result: Pick<FitResultJson, 'planets' | 'instruments' | 'trend'>): number {
  const trend = result.trend?.kind === 'quadratic' ? 2 : result.trend?.kind === 'linear' ? 1 : 0
  let planets = 0
  for (const p of result.planets) {
    const u = (p as { uncertainty?: Partial<Record<'period' | 'K' | 'e' | 'omegaDeg' | 'tc' | 'tp', number | null>> }).uncertainty ?? {}
    const eFixed = u.e === 0, wFixed = u.omegaDeg === 0 || (eFixed && p.e === 0)
    planets += (u.period === 0 ? 0 : 1) + (u.K === 0 ? 0 : 1) + (eFixed && wFixed ? 0 : eFixed || wFixed ? 1 : 2) + (u.tc === 0 || u.tp === 0 ? 0 : 1)
  }
  return planets + result.instruments.length + result.instruments.filter((i) => i.jitter !== null).length + trend
}

/** At least 32 walkers and twice the number of sampled parameters (always even). */
export function defaultWalkers(nDim: number): number {
  return Math.max(SAMPLING_DEFAULTS.walkers, 2 * nDim)
}

/** `ensembles` (parallel mode) is optional: blank or absent means one. */
export interface LauncherInput { walkers: string; steps: string; seed: string; untilConverged: boolean; ensembles?: string }
export type LauncherErrors = Partial<Record<'walkers' | 'steps' | 'seed' | 'ensembles', string>>

const whole = (text: string): number | null => {
  const t = text.trim()
  if (!/^[+]?\d+$/.test(t)) return null
  return Number(t)
}

/** Checks the launcher's fields as the server will (limits from the shared schema); a blank seed means "let the server choose". */
export function validateLauncher(input: LauncherInput, nDim: number, workers: number | null = null): LauncherErrors {
  const errors: LauncherErrors = {}
  const walkers = whole(input.walkers)
  const need = Math.max(LIMITS.walkersMin, 2 * nDim)
  if (walkers === null) errors.walkers = 'Walkers must be a whole number'
  else if (walkers % 2 !== 0) errors.walkers = 'Walkers must be an even number'
  else if (walkers < need) errors.walkers = `At least ${need} walkers (twice the ${nDim} free parameters)`
  else if (walkers > LIMITS.walkersMax) errors.walkers = `At most ${LIMITS.walkersMax} walkers`
  const steps = whole(input.steps)
  if (steps === null || steps <= 0) errors.steps = 'Steps must be a whole number greater than 0'
  else if (steps < LIMITS.stepsMin) errors.steps = `At least ${LIMITS.stepsMin} steps`
  else if (steps > LIMITS.stepsMax) errors.steps = `At most ${formatCount(LIMITS.stepsMax)} steps`
  if (input.seed.trim() !== '') {
    const seed = whole(input.seed)
    if (seed === null || seed > LIMITS.seedMax) errors.seed = `Seed must be a whole number from 0 to ${LIMITS.seedMax}`
  }
  if (input.ensembles !== undefined && input.ensembles.trim() !== '') {
    const k = whole(input.ensembles)
    const most = Math.min(LIMITS.ensemblesMax, Math.max(1, workers ?? LIMITS.ensemblesMax))
    if (k === null || k < 1) errors.ensembles = 'Ensembles must be a whole number, 1 or more'
    else if (k > most) errors.ensembles = workers !== null && workers < LIMITS.ensemblesMax ? `At most ${most}: ${workers} job worker${workers === 1 ? ' is' : 's are'} connected now` : `At most ${most} ensembles`
  }
  return errors
}

/**
 * Expected seconds for `walkers × steps` from the server's estimate for the model (its time is
 * 1.5 s of set-up plus a cost per walker-step).
 */
export function secondsFromEstimate(e: Pick<SamplingEstimate, 'seconds' | 'walkers' | 'expectedSteps'>, walkers: number, steps: number): number {
  const perStep = Math.max(0, e.seconds - 1.5) / Math.max(1, e.walkers * e.expectedSteps)
  return 1.5 + perStep * walkers * steps
}

/**
 * Expected wall-clock time of walkers × steps, scaled from the server's estimate for an earlier run
 * of the same star (its estimate is about 1.5 s of set-up plus a cost per walker-step). Null when no
 * earlier run had an estimate: the server then gives one when the run is queued.
 */
export function estimateFromRuns(runs: SamplingRunSummary[], walkers: number, steps: number): number | null {
  const ref = runs.find((r) => r.estimateSeconds !== null && r.settings.walkers > 0 && r.settings.steps > 0)
  if (!ref || ref.estimateSeconds === null) return null
  const perStep = Math.max(0, ref.estimateSeconds - 1.5) / (ref.settings.walkers * ref.settings.steps)
  return 1.5 + perStep * walkers * steps
}

/** "45 s", "3 min 20 s", "1 h 05 min". */
export function formatDuration(seconds: number | null | undefined): string {
  if (seconds === null || seconds === undefined || !Number.isFinite(seconds)) return '—'
  const s = Math.max(0, Math.round(seconds))
  if (s < 60) return `${s} s`
  if (s < 3600) return `${Math.floor(s / 60)} min ${String(s % 60).padStart(2, '0')} s`
  return `${Math.floor(s / 3600)} h ${String(Math.floor((s % 3600) / 60)).padStart(2, '0')} min`
}

/** Units as written on screen ('' → none). */
export function unitText(unit: string): string {
  if (unit === 'deg') return '°'
  if (unit === 'M_Jup') return 'M_Jup'
  if (unit === 'M_Earth') return 'M_Earth'
  return unit
}

/** Axis name "K b [m/s]" (no brackets for unitless values). */
export function axisName(name: string, unit: string): string {
  const u = unitText(unit)
  return u ? `${name} [${u}]` : name
}

/** Decimals that show `error` to two significant figures (common practice). */
function decimalsFor(error: number): number {
  if (!(error > 0) || !Number.isFinite(error)) return 4
  return Math.max(0, Math.min(10, 1 - Math.floor(Math.log10(error))))
}

export interface IntervalText { median: string; plus: string; minus: string; unit: string; text: string }

/**
 * A parameter's median with its 16th–84th percentile interval, all rounded to two significant
 * figures of the smaller side (common practice): e.g. "9.84 +0.31 −0.29 m/s".
 */
export function formatInterval(s: Pick<ParameterSummary, 'median' | 'lo' | 'hi' | 'unit'>): IntervalText {
  const unit = unitText(s.unit)
  if (![s.median, s.lo, s.hi].every(Number.isFinite)) return { median: '—', plus: '—', minus: '—', unit, text: '—' }
  const plus = Math.max(0, s.hi - s.median)
  const minus = Math.max(0, s.median - s.lo)
  const smaller = Math.min(plus, minus) > 0 ? Math.min(plus, minus) : Math.max(plus, minus)
  const d = decimalsFor(smaller)
  const m = s.median.toFixed(d)
  const p = plus.toFixed(d)
  const n = minus.toFixed(d)
  const sep = unit === '°' || unit === '' ? '' : ' '
  return { median: m, plus: `+${p}`, minus: `−${n}`, unit, text: `${m} +${p} −${n}${sep}${unit}` }
}

/** Plain-words reading of the convergence diagnostics; the server's warnings come first. */
export function convergenceNotes(d: SamplingResult['diagnostics'], settings: SamplingResult['settings']): string[] {
  const notes = [...d.warnings]
  if (settings.stopped && !notes.some((n) => /stopped after/.test(n))) notes.push(`The run was stopped after ${settings.stepsDone} of ${settings.steps} steps; these numbers come from the steps done and may change with a full run.`)
  if (!d.converged && notes.length === 0) notes.push('The chains have not settled: run longer (more steps) before trusting these intervals.')
  return notes
}

/** Planet labels ('b', 'c', …) in the sample, from its "P <label>" columns. */
export function planetLabels(names: string[]): string[] {
  return names.filter((n) => /^P \S+$/.test(n)).map((n) => n.slice(2))
}

/** The parameters a corner plot starts with: P, K and e of the first planet, and its M sin i. */
export function defaultCornerNames(names: string[]): string[] {
  const first = planetLabels(names)[0]
  if (!first) return names.filter((n) => n !== 'ln posterior').slice(0, 3)
  return [`P ${first}`, `K ${first}`, `e ${first}`, `M sin i ${first}`].filter((n) => names.includes(n))
}

/** Columns that can be plotted (the sample's, without the Earth-mass copy of M sin i and without parameters held fixed). */
export function plottableNames(names: string[], fixed: readonly string[] = []): string[] {
  return names.filter((n) => !n.endsWith('(Earth masses)') && !fixed.includes(n))
}

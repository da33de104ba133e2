/**
 * When a star can be observed from a site: night (the Sun below the twilight altitude, −18° for
 * astronomical twilight — common practice), the star above an altitude / below an air-mass limit,
 * and far enough from the Moon. Evaluated on a regular grid of instants (slots); every slot keeps
 * the reasons it was rejected so the screen can say why a night is lost.
 */
import { AstroTime, Body, SearchAltitude } from 'astronomy-engine'
import { airmass, altitudeForAirmass, observerOf, skyAt, checkStarPosition, type Site, type StarPosition, type SkyState } from './sky.ts'

const JD_J2000 = 2451545.0

export interface ObservingLimits {
  /** The Sun must be at or below this altitude (degrees; default −18, astronomical twilight). */
  sunMaxAltDeg?: number
  /** The star must be at or above this altitude (degrees; default 30). */
  minAltDeg?: number
  /** The star's air mass must be at or below this (default 2; the stricter of this and minAltDeg wins). */
  maxAirmass?: number
  /** Smallest angle between the star and the Moon while the Moon is up (degrees; default 30). */
  minMoonSeparationDeg?: number
}

export const OBSERVING_DEFAULTS: Required<ObservingLimits> = {
  sunMaxAltDeg: -18, minAltDeg: 30, maxAirmass: 2, minMoonSeparationDeg: 30,
}

export type RejectReason = 'daylight' | 'low' | 'moon'

/** One instant of the grid with the sky and the verdict. */
export interface Slot extends SkyState {
  airmass: number
  observable: boolean
  /** Empty when observable. */
  reasons: RejectReason[]
}

export interface SlotGrid {
  /** First instant, Julian day UTC. */
  startJd: number
  /** Last instant considered (inclusive), Julian day UTC. */
  endJd: number
  /** Spacing of the instants, minutes (default 20). */
  stepMinutes?: number
}

/** Limits with defaults filled in and checked; throws a RangeError naming the field. */
export function resolveLimits(limits: ObservingLimits = {}): Required<ObservingLimits> & { effectiveMinAltDeg: number } {
  // a field given as undefined takes its default (a plain spread would keep the undefined)
  const l: Required<ObservingLimits> = {
    sunMaxAltDeg: limits.sunMaxAltDeg ?? OBSERVING_DEFAULTS.sunMaxAltDeg,
    minAltDeg: limits.minAltDeg ?? OBSERVING_DEFAULTS.minAltDeg,
    maxAirmass: limits.maxAirmass ?? OBSERVING_DEFAULTS.maxAirmass,
    minMoonSeparationDeg: limits.minMoonSeparationDeg ?? OBSERVING_DEFAULTS.minMoonSeparationDeg,
  }
  const check = (name: keyof ObservingLimits, lo: number, hi: number): void => {
    const v = l[name]
    if (!(Number.isFinite(v) && v >= lo && v <= hi)) throw new RangeError(`${name} must be in [${lo}, ${hi}], got ${v}`)
  }
  check('sunMaxAltDeg', -90, 0)
  check('minAltDeg', 0, 89)
  check('maxAirmass', 1.001, 40)
  check('minMoonSeparationDeg', 0, 180)
  return { ...l, effectiveMinAltDeg: Math.max(l.minAltDeg, altitudeForAirmass(l.maxAirmass)) }
}

/** Most instants one call evaluates (a year at 5-minute steps). */
export const MAX_SLOTS = 110_000

/** The instants of a grid, Julian days UTC. */
export function slotTimes(grid: SlotGrid): Float64Array {
  const step = grid.stepMinutes ?? 20
  if (!(Number.isFinite(step) && step >= 1 && step <= 1440)) throw new RangeError(`stepMinutes must be in [1, 1440], got ${step}`)
  if (!(Number.isFinite(grid.startJd) && Number.isFinite(grid.endJd))) throw new RangeError('startJd and endJd must be finite Julian days')
  if (!(grid.endJd > grid.startJd)) throw new RangeError(`endJd must be after startJd (got ${grid.startJd} … ${grid.endJd})`)
  const n = Math.floor((grid.endJd - grid.startJd) / (step / 1440) + 1e-9) + 1
  if (n > MAX_SLOTS) throw new RangeError(`the window holds ${n} instants at ${step}-minute steps; at most ${MAX_SLOTS} — shorten it or lengthen stepMinutes`)
  const t = new Float64Array(n)
  for (let i = 0; i < n; i++) t[i] = grid.startJd + i * step / 1440
  return t
}

/** The verdict for one sky state (pure: the test of the rules without ephemerides). */
export function judgeSlot(s: SkyState, limits: ReturnType<typeof resolveLimits>): Slot {
  const reasons: RejectReason[] = []
  if (s.sunAltDeg > limits.sunMaxAltDeg) reasons.push('daylight')
  if (s.starAltDeg < limits.effectiveMinAltDeg) reasons.push('low')
  if (s.moonAltDeg > 0 && s.moonSeparationDeg < limits.minMoonSeparationDeg) reasons.push('moon')
  return { ...s, airmass: airmass(s.starAltDeg), observable: reasons.length === 0, reasons }
}

/** Every instant of `grid` for `star` from `site`, with the sky and the verdict. */
export function observabilitySlots(star: StarPosition, site: Site, grid: SlotGrid, limits: ObservingLimits = {}): Slot[] {
  checkStarPosition(star)
  const l = resolveLimits(limits)
  const observer = observerOf(site)
  return Array.from(slotTimes(grid), (jd) => judgeSlot(skyAt(star, site, jd, observer), l))
}

export interface NightWindow {
  /** The Sun sinks through the twilight altitude (Julian day UTC). */
  start: number
  /** The Sun rises through it again. */
  end: number
}

/**
 * Dark intervals between `fromJd` and `toJd`: the Sun below `sunAltDeg` (default −18°), from the
 * library's altitude search (to about a second). Intervals are clipped to the window; at polar
 * sites a night with no crossing is either entirely dark or absent.
 */
export function nightWindows(site: Site, fromJd: number, toJd: number, sunAltDeg = -18): NightWindow[] {
  const observer = observerOf(site)
  if (!(toJd > fromJd)) throw new RangeError(`toJd must be after fromJd (got ${fromJd} … ${toJd})`)
  if (!(sunAltDeg >= -90 && sunAltDeg <= 0)) throw new RangeError(`sunAltDeg must be in [−90, 0], got ${sunAltDeg}`)
  const limit = toJd - fromJd
  const start = new AstroTime(fromJd - JD_J2000)
  const dark = skyAt({ raDeg: 0, decDeg: 0 }, site, fromJd, observer).sunAltDeg <= sunAltDeg
  const out: NightWindow[] = []
  let open: number | null = dark ? fromJd : null
  let t = start
  for (;;) {
    const dir = open === null ? -1 : +1 // looking for sunset through the level, or sunrise
    const found = SearchAltitude(Body.Sun, observer, dir, t, limit - (t.ut - start.ut), sunAltDeg)
    if (!found || found.ut + JD_J2000 > toJd) break
    const jd = found.ut + JD_J2000
    if (open === null) open = jd
    else { out.push({ start: open, end: jd }); open = null }
    t = found.AddDays(1e-4)
  }
  if (open !== null) out.push({ start: open, end: toJd })
  return out
}

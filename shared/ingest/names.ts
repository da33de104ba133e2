import { formatForOffset } from './time.ts'
import { readTimeWords } from './time-words.ts'
import type { ColumnRole, TimeFormat, VelocityUnit } from './types.ts'
import { unitInText } from './units.ts'

export { describeTimeFormat } from './time.ts'

/** What a header name says about its column. */
export interface NameReading {
  role: ColumnRole | null
  indicator?: string
  unit?: VelocityUnit
  /** Time scale or zero point named in the header, if any. */
  time?: TimeFormat
}

/** Header names are read up to this length (longer ones are not names; keeps regexes cheap). */
const MAX_NAME_CHARS = 120

/** Velocity unit named in a header (or units-row) text, if any, in its usual spelling ('km/s', 'm/s', 'cm/s' …). */
export function unitFromName(raw: string): VelocityUnit | undefined {
  return unitInText(raw.slice(0, MAX_NAME_CHARS))
}

/** Time format named in a header text, if any: 'mjd', 'jd-N' (any N written), 'bjd', 'jd' or 'days'. */
export function timeFromName(raw: string): NameReading['time'] {
  const w = readTimeWords(raw.slice(0, MAX_NAME_CHARS))
  if (w.offset !== undefined) return formatForOffset(w.offset)
  if (w.scale === 'bjd_tdb' || w.scale === 'bjd_utc') return 'bjd'
  if (w.julian) return 'jd'
  if (w.days) return 'days'
  return undefined
}

const UNIT_TOKENS = new Set(['kms', 'kmps', 'km', 'ms', 'mps', 'm', 's', '1', 'days', 'day', 'd'])

/** Lower-case tokens of a header name, without bracketed units and trailing unit tokens. */
export function nameTokens(raw: string): string[] {
  const s = raw.slice(0, MAX_NAME_CHARS).toLowerCase()
    .replace(/σ/g, 'sigma').replace(/α/g, 'alpha').replace(/δ/g, 'd')
    .replace(/[[({].*?[\])}]/g, ' ')
    .replace(/km\s*\/\s*s|m\s*\/\s*s/g, ' ')
    .replace(/log\s*r'?\s*hk|log\s*\(?r'hk\)?/g, 'logrhk')
    .replace(/'/g, '')
  const tokens = s.split(/[^a-z0-9]+/).filter(Boolean)
  const kept = tokens.filter((t, i) => i === 0 || !UNIT_TOKENS.has(t))
  return kept.length > 0 ? kept : tokens
}

const INSTRUMENT = new Set(['inst', 'instrument', 'instr', 'instrumentname', 'instname', 'set', 'setup', 'telescope', 'tel',
  'spectrograph', 'spec', 'source', 'origin', 'site', 'dataset', 'observatory'])
const ERROR_TOKENS = new Set(['err', 'error', 'errors', 'sigma', 'sig', 'unc', 'uncertainty', 'e', 'eps', 'sd', 'std', 'stddev', 'dev'])
const TIME_COMPACT = new Set(['t', 'time', 'jd', 'bjd', 'hjd', 'mjd', 'rjd', 'date', 'epoch', 'days', 'day', 'obstime', 'obsdate', 'btjd', 'bjdtdb', 'jdutc', 'bjdutc', 'hjdutc', 'jdtdb', 'julian', 'julianday', 'juliandate', 'dateobs', 'mjdobs', 'timebjd'])
const TIME_START = /^(?:time|bjd|hjd|mjd|rjd|jd|date|epoch|julian)/
const RV_COMPACT = new Set(['rv', 'vrad', 'vr', 'v', 'vel', 'velocity', 'rvel', 'radialvelocity', 'rvc', 'rvcorr', 'vhelio', 'vbary', 'rvs', 'vhel', 'vbar', 'rvbary'])
const RV_START = /^(?:rv|vrad|radialvel|velocity)/

/** Known activity indicator of a compact name, if any. */
function indicatorOf(compact: string): string | undefined {
  if (/^(?:bis|bisector|bvs|bs|biss)(?:span|velocityspan|inverseslope)?$/.test(compact)) return 'bisector_span'
  if (/^fwhm/.test(compact)) return 'fwhm'
  if (/rhk/.test(compact)) return 'log_rhk'
  if (/^(?:s|sindex|smw|shk|svalue|sval|smwo|sidx|sind|smwindex|mwsindex)$/.test(compact)) return 's_index'
  if (/^(?:ha|halpha|halph|hal|haindex|halphaindex|iha)$/.test(compact)) return 'h_alpha'
  return undefined
}

/** A cleaned key for an unknown indicator column: lower case, [a-z0-9_]. */
export function indicatorKey(raw: string): string {
  const k = raw.slice(0, MAX_NAME_CHARS).toLowerCase().replace(/[[({].*?[\])}]/g, ' ').replace(/[^a-z0-9]+/g, '_').replace(/^_+|_+$/g, '')
  return k === '' ? 'value' : k
}

/** Whether a name is an uncertainty, and of what (the name without its error words). */
function splitError(tokens: string[]): { hasErr: boolean; base: string } {
  let hasErr = false
  const rest: string[] = []
  for (const t of tokens) {
    if (ERROR_TOKENS.has(t)) hasErr = true
    else rest.push(t)
  }
  let base = rest.join('')
  const pre = /^(?:err|error|sigma|sig|unc)(.+)$/.exec(base)
  const post = /^(.+?)(?:err|error|sigma|sig|unc)$/.exec(base)
  if (pre) { hasErr = true; base = pre[1]! }
  else if (post) { hasErr = true; base = post[1]! }
  else if (/^[esd](?:rv|vr|vrad|vel)$/.test(base)) { hasErr = true; base = base.slice(1) }
  return { hasErr, base }
}

const RV_BASE = /^(?:rv|vr|vrad|v|vel|velocity|rvel)$/

/** Read a header name: its likely role, indicator key, unit and time scale. */
export function readName(raw: string): NameReading {
  const tokens = nameTokens(raw)
  const compact = tokens.join('')
  const out: NameReading = { role: null }
  const unit = unitFromName(raw)
  if (unit) out.unit = unit
  if (compact === '') return out
  const { hasErr, base } = splitError(tokens)
  if (hasErr && (base === '' || RV_BASE.test(base))) return { ...out, role: 'error' }
  if (INSTRUMENT.has(base)) return { ...out, role: 'instrument' }
  const ind = indicatorOf(base)
  if (ind) return { ...out, role: 'indicator', indicator: hasErr ? `${ind}_err` : ind }
  if (hasErr) return { ...out, role: 'indicator', indicator: indicatorKey(raw) }
  if (TIME_COMPACT.has(compact) || TIME_START.test(compact) || tokens[0] === 't') {
    const r: NameReading = { role: 'time' }
    const time = timeFromName(raw)
    if (time) r.time = time
    return r
  }
  if (RV_COMPACT.has(compact) || RV_START.test(compact)) return { ...out, role: 'rv' }
  return out
}

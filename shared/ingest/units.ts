import { create, unitDependencies } from 'mathjs'

/**
 * Velocity units as written in headers and archive metadata, read by mathjs's unit system (no
 * hand list of units): `km/s`, `m s-1`, `km.s^-1`, `cm/s`, `[m/s]`, `_kms`. Only the notation is
 * normalised here (brackets, CDS/FITS exponents `s-1`, `.` as a product, the compact `kms`/`ms`
 * of column names); mathjs decides what the unit is and its factor to m/s.
 */
const math = create({ unitDependencies })
const METRE_PER_SECOND = math.unit('m/s')

/** Longest unit text looked at (longer ones are not units; keeps the regexes cheap). */
const MAX_UNIT_CHARS = 40
/** Compact spellings of column-name suffixes (`rv_kms`, `e_ms`, `rv_mps`): notation, not units. */
const COMPACT = /^(k|c|m)?m(?:p|_)?s$/

const cache = new Map<string, number | null>()

/** The unit text in mathjs's notation ('km s-1' → 'km s^-1', 'km.s-1' → 'km s^-1', 'kms' → 'km/s'). */
export function normaliseUnitText(raw: string): string {
  let s = raw.trim().replace(/^[[({]\s*|\s*[\])}]$/g, '').trim().toLowerCase()
  const compact = COMPACT.exec(s)
  if (compact) return `${compact[1] ?? ''}m/s`
  s = s.replace(/\*\*/g, '^').replace(/(?<=[a-z])\s*\.\s*(?=[a-z])/g, ' ').replace(/(?<=[a-z])\s*(-?\d+)/g, '^$1')
  return s.replace(/\s+/g, ' ')
}

/**
 * Factor from a velocity unit as written to m/s (km/s → 1000, cm/s → 0.01), or null when the
 * text is not a velocity unit mathjs knows.
 */
export function velocityFactor(raw: string): number | null {
  if (typeof raw !== 'string' || raw.length > MAX_UNIT_CHARS) return null
  const s = normaliseUnitText(raw)
  if (s === '' || !/^[a-z0-9 ^/()-]+$/.test(s)) return null
  const hit = cache.get(s)
  if (hit !== undefined) return hit
  let factor: number | null = null
  try {
    const u = math.unit(s)
    if (u.equalBase(METRE_PER_SECOND)) factor = math.unit(1, s).toNumber('m/s')
  } catch { factor = null }
  if (factor !== null && !(Number.isFinite(factor) && factor > 0)) factor = null
  cache.set(s, factor)
  return factor
}

/** Whether a text is a velocity unit (see velocityFactor). */
export function isVelocityUnit(raw: string): boolean {
  return velocityFactor(raw) !== null
}

/** A velocity unit in its usual spelling ('km s-1' → 'km/s', 'm.s-1' → 'm/s'), or the text trimmed when unusual. */
export function canonicalUnit(raw: string): string {
  const f = velocityFactor(raw)
  if (f === 1) return 'm/s'
  if (f === 1000) return 'km/s'
  if (f === 0.01) return 'cm/s'
  return raw.trim()
}

/**
 * The velocity unit named in a header or units-row text, if any: a bracketed part (`RV [km/s]`,
 * `eRV (m s-1)`), else a token or a pair of tokens (`vrad km.s^-1`, `rv_kms`, `RV km s-1`).
 * Returned in its usual spelling.
 */
export function unitInText(raw: string): string | undefined {
  const text = raw.slice(0, 120)
  if (text.length <= MAX_UNIT_CHARS && /[a-z]/i.test(text) && isVelocityUnit(text)) return canonicalUnit(text)
  for (const m of text.matchAll(/[[({]([^\])}]{1,40})[\])}]/g)) {
    if (isVelocityUnit(m[1]!)) return canonicalUnit(m[1]!)
  }
  const tokens = text.replace(/[[\](){}]/g, ' ').split(/[\s_,;]+/).filter(Boolean)
  for (let i = 0; i < tokens.length; i++) {
    if (i + 1 < tokens.length && /^[a-z]{1,2}$/i.test(tokens[i]!) && /^s/i.test(tokens[i + 1]!)) {
      const pair = `${tokens[i]} ${tokens[i + 1]}`
      if (isVelocityUnit(pair)) return canonicalUnit(pair)
    }
    if (/[a-z]/i.test(tokens[i]!) && isVelocityUnit(tokens[i]!)) return canonicalUnit(tokens[i]!)
  }
  return undefined
}

/**
 * How to bring a value written in `unit` to m/s: a power of ten is applied in decimal by
 * parseNumber (so '46.30911' km/s is exactly 46309.11 m/s), any other factor by multiplication.
 */
export function unitScale(unit: string): { pow10: number; factor: number } | null {
  const f = velocityFactor(unit)
  if (f === null) return null
  const p = Math.round(Math.log10(f))
  if (Math.abs(f - 10 ** p) <= 1e-12 * f) return { pow10: p, factor: 1 }
  return { pow10: 0, factor: f }
}

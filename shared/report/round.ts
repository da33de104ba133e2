/**
 * Rounding a value by its uncertainty, for tables a reader copies into a paper.
 *
 * The rule is the Particle Data Group's (PDG, Review of Particle Physics, "Introduction", §5.3
 * "Rounding"; common practice in the physical sciences): look at the three highest-order digits of
 * the error as an integer 100–999;
 *   - 100–354: keep two significant digits of the error;
 *   - 355–949: keep one significant digit;
 *   - 950–999: round the error up to 1000 (one power of ten higher) and keep two significant digits.
 * The value is then rounded to the same decimal place as the error.
 *
 *   1.23456 ± 0.0123  → 1.235 ± 0.012     (123 → two digits)
 *   380.8612 ± 0.082  → 380.86 ± 0.08     (820 → one digit)
 *   100.37 ± 0.39     → 100.4 ± 0.4       (390 → one digit)
 *   12345 ± 678       → 12300 ± 700       (678 → one digit)
 *   5.4321 ± 0.0970   → 5.43 ± 0.10       (970 → up to 1000, two digits)
 *
 * Halves round up (away from zero for the error's digits). The value is rounded with
 * `Number.prototype.toFixed` when the last kept digit is after the decimal point, so a value whose
 * binary form lies just below a half (2.675 is 2.67499…) rounds down, as a printed decimal would not.
 */

export interface Rounded {
  /** The value as printed, e.g. "1.235" or "12300". */
  value: string
  /** The error as printed, e.g. "0.012" or "700". */
  error: string
  /** Power of ten of the last kept digit (−3 for 0.012, 2 for 700). */
  place: number
  /** Significant digits kept in the error (1 or 2). */
  digits: 1 | 2
}

function checkError(err: number, name: string): void {
  if (typeof err !== 'number' || !Number.isFinite(err) || err <= 0) {
    throw new RangeError(`${name} must be a finite positive number, got ${String(err)}`)
  }
}

/** The decimal place (power of ten of the last kept digit) and mantissa of `err` rounded by the rule above. */
export function errorPlace(err: number, name = 'err'): { place: number; mantissa: number; digits: 1 | 2 } {
  checkError(err, name)
  let exp = Math.floor(Math.log10(err))
  let three = Math.round(err / 10 ** (exp - 2))
  // log10 can be off by one near powers of ten, and the rounding can reach 1000
  if (three >= 1000) { exp += 1; three = Math.round(err / 10 ** (exp - 2)) }
  if (three < 100) { exp -= 1; three = Math.round(err / 10 ** (exp - 2)) }
  if (three <= 354) return { place: exp - 1, mantissa: Math.round(three / 10), digits: 2 }
  if (three <= 949) return { place: exp, mantissa: Math.round(three / 100), digits: 1 }
  return { place: exp, mantissa: 10, digits: 2 }
}

/** Prints `x` rounded to the power of ten `place` (negative: digits after the point). */
export function atPlace(x: number, place: number): string {
  if (!Number.isFinite(x)) throw new RangeError(`value must be finite, got ${String(x)}`)
  let s: string
  if (place < 0) s = x.toFixed(Math.min(-place, 100))
  else {
    const q = 10 ** place
    s = String(Math.round(x / q) * q)
  }
  return /^-0(\.0*)?$/.test(s) ? s.slice(1) : s // no "-0.00"
}

function mantissaString(mantissa: number, place: number): string {
  // the error is mantissa × 10^place, printed exactly from its integer digits
  if (place >= 0) return String(mantissa) + '0'.repeat(place)
  const digits = String(mantissa).padStart(-place + 1, '0')
  return `${digits.slice(0, digits.length + place)}.${digits.slice(digits.length + place)}`
}

/** `value ± err` rounded by the PDG rule (see the module comment). Throws RangeError for a non-positive or non-finite `err`. */
export function roundByUncertainty(value: number, err: number): Rounded {
  const { place, mantissa, digits } = errorPlace(err, 'err')
  return { value: atPlace(value, place), error: mantissaString(mantissa, place), place, digits }
}

export interface RoundedAsymmetric { value: string; plus: string; minus: string; place: number }

/**
 * `value +plus −minus` (a credible interval): both sides rounded at the decimal place the SMALLER
 * side needs by the PDG rule (common practice: the smaller error sets the precision), each side to
 * that place (at least one unit of it, never printed as zero).
 */
export function roundAsymmetric(value: number, plus: number, minus: number): RoundedAsymmetric {
  checkError(plus, 'plus')
  checkError(minus, 'minus')
  const { place } = errorPlace(Math.min(plus, minus), plus <= minus ? 'plus' : 'minus')
  const side = (x: number) => {
    const q = 10 ** place
    const m = Math.max(1, Math.round(x / q))
    return mantissaString(m, place)
  }
  return { value: atPlace(value, place), plus: side(plus), minus: side(minus), place }
}

/** A value without an uncertainty (a fixed parameter, a count): `sig` significant digits, no exponent for ordinary sizes. */
export function formatPlain(value: number, sig = 6): string {
  if (!Number.isFinite(value)) return '—'
  if (value === 0) return '0'
  const abs = Math.abs(value)
  if (abs >= 1e-4 && abs < 1e15) {
    const place = Math.floor(Math.log10(abs)) - sig + 1
    const s = atPlace(value, place)
    return s.includes('.') ? s.replace(/0+$/, '').replace(/\.$/, '') : s
  }
  return value.toPrecision(sig)
}

// Numbers, counts and dates as the screens write them: one home for every component. Dates and
// times in the reader's locale with the time zone named (Intl), counts grouped in that locale,
// English plurals by Intl.PluralRules ("1 iteration", "2 iterations"), and numbers without float
// noise ("1.465", never "1.4649999999999999"): to significant digits, or to the precision their
// uncertainty allows (two significant digits of the error, common practice).

const date = new Intl.DateTimeFormat(undefined, { year: 'numeric', month: 'short', day: 'numeric' })
const dateTime = new Intl.DateTimeFormat(undefined, { year: 'numeric', month: 'short', day: 'numeric', hour: '2-digit', minute: '2-digit', timeZoneName: 'short' })
const count = new Intl.NumberFormat(undefined, { maximumFractionDigits: 0 })
const rules = new Intl.PluralRules('en')

type When = string | number | Date | null | undefined
const valid = (d: When): Date | null => {
  if (d === null || d === undefined || d === '') return null
  const x = d instanceof Date ? d : new Date(d)
  return Number.isFinite(x.getTime()) ? x : null
}

/** Day, month and year in the reader's locale ("2 Dec 2026", "Dec 2, 2026"); "—" when missing. */
export function formatDate(d: When): string {
  const x = valid(d)
  return x ? date.format(x) : '—'
}

/** Date and time in the reader's locale with the time zone ("2 Dec 2026, 10:31 UTC"); "—" when missing. */
export function formatDateTime(d: When): string {
  const x = valid(d)
  return x ? dateTime.format(x) : '—'
}

/** A whole count grouped in the reader's locale ("40,000", "40 000"). */
export function formatCount(n: number | null | undefined): string {
  return n === null || n === undefined || !Number.isFinite(n) ? '—' : count.format(n)
}

/** "1 iteration", "2 iterations", "0 walkers": the count and the noun in the right number (`many` when not a plain "s"). */
export function plural(n: number, one: string, many = `${one}s`): string {
  return `${formatCount(n)} ${rules.select(n) === 'one' ? one : many}`
}

/** `digits` significant figures without float noise or exponent for everyday magnitudes ("1.465", "0.0012", "2.5e+8"). */
export function formatSig(v: number | null | undefined, digits = 4): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—'
  if (v === 0) return '0'
  const mag = Math.floor(Math.log10(Math.abs(v)))
  if (mag >= 9 || mag < -5) return v.toPrecision(digits)
  return v.toFixed(Math.max(0, Math.min(20, digits - 1 - mag)))
}

/** Value ± error, both to two significant digits of the error; the value alone to `digits` when the error is unknown. */
export function formatByError(v: number | null | undefined, err: number | null | undefined, digits = 4): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—'
  if (err === null || err === undefined || !Number.isFinite(err) || err <= 0) return formatSig(v, digits)
  const decimals = Math.max(0, Math.min(20, 1 - Math.floor(Math.log10(err))))
  return `${v.toFixed(decimals)} ± ${err.toFixed(decimals)}`
}

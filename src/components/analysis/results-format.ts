// How fitted numbers are written on screen: a value with its 1σ error rounded to the error's two
// significant figures (common practice), "fixed" for held parameters, "undetermined" for missing errors.

export function formatWithError(value: number | null | undefined, error: number | null | undefined, fallbackDigits = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—'
  if (error === 0) return `${trim(value, fallbackDigits)} (fixed)`
  if (error === null || error === undefined || !Number.isFinite(error) || error < 0) return `${trim(value, fallbackDigits)} (± undetermined)`
  const decimals = Math.max(0, Math.min(10, 1 - Math.floor(Math.log10(error))))
  return `${value.toFixed(decimals)} ± ${error.toFixed(decimals)}`
}

/** `digits` significant figures, written plainly. */
export function trim(value: number | null | undefined, digits = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—'
  if (value === 0) return '0'
  const magnitude = Math.floor(Math.log10(Math.abs(value)))
  if (magnitude >= 6 || magnitude < -4) return value.toPrecision(digits)
  return value.toFixed(Math.max(0, digits - 1 - magnitude))
}

/** Fixed decimals, or a dash for a missing value. */
export function fixed(value: number | null | undefined, decimals: number): string {
  return value === null || value === undefined || !Number.isFinite(value) ? '—' : value.toFixed(decimals)
}

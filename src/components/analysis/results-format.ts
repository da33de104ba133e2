// How fitted numbers are written on screen: a value with its 1σ error rounded to the error's two
// significant figures (common practice), "fixed" for held parameters, "undetermined" for missing
// errors. The rounding itself is the screens' one formatting home, src/format.
import { formatByError, formatSig } from '@/format/index.ts'

export function formatWithError(value: number | null | undefined, error: number | null | undefined, fallbackDigits = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—'
  if (error === 0) return `${trim(value, fallbackDigits)} (fixed)`
  if (error === null || error === undefined || !Number.isFinite(error) || error < 0) return `${trim(value, fallbackDigits)} (± undetermined)`
  return formatByError(value, error, fallbackDigits)
}

/** `digits` significant figures, written plainly. */
export const trim = (value: number | null | undefined, digits = 4): string => formatSig(value, digits)

/** Fixed decimals, or a dash for a missing value. */
export function fixed(value: number | null | undefined, decimals: number): string {
  return value === null || value === undefined || !Number.isFinite(value) ? '—' : value.toFixed(decimals)
}

// Instrument colours and symbols: one palette for the app's charts, the report page and the PDF.

/** Colour-blind-safe colours (Okabe & Ito's palette, common practice), paired with distinct symbols. */
export const INSTRUMENT_COLORS = ['#0072B2', '#D55E00', '#009E73', '#CC79A7', '#E69F00', '#56B4E9', '#6b4f2a', '#444444']
/** Filled shapes only: hollow marks are kept for excluded points. */
export const INSTRUMENT_SYMBOLS = [
  'circle', 'rect', 'triangle', 'diamond',
  'path://M0,0L10,0L5,9Z', // triangle pointing down
  'path://M3.5,0H6.5V3.5H10V6.5H6.5V10H3.5V6.5H0V3.5H3.5Z', // plus
  'roundRect', 'pin',
]
export const EXCLUDED_COLOR = '#9aa0a6'
export const EXCLUDED_NAME = 'Excluded'

export interface InstrumentStyle { color: string; symbol: string }

/** Stable style per instrument: the n-th name in alphabetical order gets the n-th colour and symbol. */
export function instrumentStyles(instruments: string[]): Map<string, InstrumentStyle> {
  const names = [...new Set(instruments)].sort()
  return new Map(names.map((name, i) => [name, {
    color: INSTRUMENT_COLORS[i % INSTRUMENT_COLORS.length]!,
    symbol: INSTRUMENT_SYMBOLS[i % INSTRUMENT_SYMBOLS.length]!,
  }]))
}

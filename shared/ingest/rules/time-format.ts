import { timeFromName } from '../names.ts'
import { PLAUSIBLE_JD, describeTimeFormat, formatForOffset, timeOffset } from '../time.ts'
import { readTimeWords } from '../time-words.ts'
import type { Question, TimeFormat } from '../types.ts'
import { median, taken, type DetectContext, type Rule } from './context.ts'

const plausible = (full: number) => full >= PLAUSIBLE_JD.min && full <= PLAUSIBLE_JD.max

function choice(f: TimeFormat): { value: string; label: string } {
  return { value: f, label: describeTimeFormat(f) }
}

function ask(ctx: DetectContext, message: string, formats: TimeFormat[]): void {
  const q: Question = { field: 'timeFormat', message, choices: formats.map(choice) }
  ctx.questions.push(q)
}

/** The time column's own words: its name, units row and archive description. */
export function timeText(ctx: DetectContext): string {
  const j = taken(ctx, 'time')
  return ctx.headerNames || ctx.layout ? `${ctx.names[j]} ${ctx.unitsText[j]}` : ''
}

/**
 * Time format. A zero point written in the header (`BJD_TDB-2457000`, `JD - 2400000`, `RJD`,
 * `MJD`) is used as written when it puts the times in 1850–2100. Otherwise by magnitude: full JD
 * (2,300,000–2,600,000) is read as such; 30,000–90,000 is MJD or JD − 2400000 (half a day apart)
 * and asked; −2,000–40,000 is JD − 2450000 or JD − 2457000 (both plausible) or plain days, and
 * asked; anything else is plain days. A column mixing full and reduced dates is read by its
 * majority and its other rows are refused by parseTable, each with its line.
 */
export const timeFormat: Rule = (ctx) => {
  if (ctx.hints.timeFormat) {
    ctx.timeFormat = ctx.hints.timeFormat
    ctx.notes.push(`times are ${describeTimeFormat(ctx.timeFormat)}, as given`)
    checkRange(ctx)
    return
  }
  const values = ctx.stats[taken(ctx, 'time')]!.values
  const text = timeText(ctx)
  const words = readTimeWords(text)
  const named = text ? timeFromName(text) : undefined
  if (values.length === 0) { ctx.timeFormat = 'days'; ctx.notes.push('no time values to judge by; read as plain days'); return }
  const med = median(values)
  const full = values.filter((v) => v >= 2_300_000).length
  if (full > 0 && full < values.length) {
    ctx.notes.push(`the time column mixes full Julian days (${full} of ${values.length} sampled rows) and reduced dates: the minority rows are refused, each with its line; fix them or skip them`)
  }
  if (words.offset !== undefined && plausible(med + words.offset)) {
    ctx.timeFormat = formatForOffset(words.offset)
    ctx.notes.push(`times are ${describeTimeFormat(ctx.timeFormat)} (the header says so)`)
    return
  }
  if (words.offset !== undefined) {
    ctx.notes.push(`the header names JD − ${words.offset}, but the times (near ${Math.round(med)}) would then fall outside 1850–2100; read by their size instead`)
  }
  if (med >= 2_300_000 && med < 2_600_000) {
    ctx.timeFormat = named === 'bjd' ? 'bjd' : 'jd'
    ctx.notes.push(`times are ${describeTimeFormat(ctx.timeFormat)} (values near ${Math.round(med)})`)
  } else if (med >= 30_000 && med < 90_000) {
    ctx.timeFormat = 'jd-2400000'
    ctx.notes.push(`times near ${Math.round(med)} are MJD or JD − 2400000, which differ by half a day: choose`)
    ask(ctx, `Times near ${Math.round(med)}: are they MJD (JD − 2400000.5) or JD − 2400000? They differ by half a day and the header does not say.`, ['jd-2400000', 'mjd'])
  } else if (med >= -2_000 && med < 40_000) {
    if (words.days) {
      ctx.timeFormat = 'days'
      ctx.notes.push('times are plain days (the header says days)')
    } else {
      ctx.timeFormat = 'jd-2450000'
      ctx.notes.push(`times near ${Math.round(med)} are reduced Julian days without a stated zero point: choose JD − 2450000, JD − 2457000 or another`)
      ask(ctx, `Times near ${Math.round(med)}: which zero point? JD − 2450000 puts them in ${yearOf(med + 2450000)}, JD − 2457000 in ${yearOf(med + 2457000)}.`, ['jd-2450000', 'jd-2457000', 'days'])
    }
  } else {
    ctx.timeFormat = 'days'
    ctx.notes.push(`times (${Math.min(...values)}–${Math.max(...values)}) match no Julian-date form; read as plain days`)
  }
  checkRange(ctx)
}

function yearOf(jd: number): string {
  return String(Math.round(2000 + (jd - 2451545) / 365.25))
}

function checkRange(ctx: DetectContext): void {
  const values = ctx.stats[taken(ctx, 'time')]!.values
  if (ctx.timeFormat === 'days' || values.length === 0) return
  const full = median(values) + timeOffset(ctx.timeFormat)
  if (!plausible(full)) {
    ctx.notes.push(`check the time format: read as ${describeTimeFormat(ctx.timeFormat)}, the times fall near JD ${Math.round(full)}, outside 1850–2100`)
  }
}

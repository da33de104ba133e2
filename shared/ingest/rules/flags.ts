import { nameTokens } from '../names.ts'
import type { Rule } from './context.ts'

/** Names of quality-flag columns (common practice in observing logs and archive tables). */
const FLAG_NAME = /^(?:quality|qual|q|flag|flags|qflag|qualflag|status|qc|weather|sky|conditions?)$/
/** Words observers write for a good measurement; the other values of a flag column exclude their rows. */
const GOOD = new Set(['good', 'ok', 'okay', 'clear', 'fine', 'excellent', 'pass', 'passed', 'nominal', 'valid', 'photometric', 'yes', 'true', '0'])
/** Words that only ever describe observing conditions or quality, never an instrument. */
const QUALITY = new Set([...GOOD, 'bad', 'poor', 'cloudy', 'clouds', 'cloud', 'thin', 'thick', 'moon', 'twilight', 'windy', 'wind', 'humid',
  'fair', 'marginal', 'fail', 'failed', 'no', 'false', 'low_snr', 'lowsnr', 'bright', 'seeing', 'suspect', 'bad_seeing'])

/**
 * Quality-flag columns (`quality` good/cloudy, `flag` 0/1) become exclusion reasons, not
 * instruments: by name, or a text column whose few values are all quality words. Rows whose
 * value is not a good word are stored excluded with the value as the reason. When no value is a
 * known good word, the most frequent one is kept and the user is asked.
 */
export const flags: Rule = (ctx) => {
  for (let j = 0; j < ctx.columnCount; j++) {
    if (ctx.roles[j] !== null && ctx.roles[j] !== 'indicator') continue
    const s = ctx.stats[j]!
    const byName = ctx.headerNames !== null && FLAG_NAME.test(nameTokens(ctx.names[j]!).join(''))
    const values = ctx.isNumeric[j] ? [...new Set(s.values.map(String))] : [...s.distinct.keys()]
    if (values.length === 0 || values.length > 20) continue
    const lower = values.map((v) => v.trim().toLowerCase())
    const byValues = !ctx.isNumeric[j] && s.text >= 2 && lower.every((v) => QUALITY.has(v)) && lower.some((v) => !GOOD.has(v))
    if (!byName && !byValues) continue
    if (ctx.isNumeric[j] && !(byName && s.values.every(Number.isInteger))) continue
    let keep = values.filter((v) => GOOD.has(v.trim().toLowerCase()))
    ctx.roles[j] = 'flag'
    if (keep.length === 0) {
      const counts = ctx.isNumeric[j] ? new Map<string, number>() : s.distinct
      if (ctx.isNumeric[j]) for (const v of s.values) counts.set(String(v), (counts.get(String(v)) ?? 0) + 1)
      const top = [...counts].sort((a, b) => b[1] - a[1])[0]![0]
      keep = [top]
      ctx.questions.push({
        field: 'flag',
        message: `Which values of '${ctx.names[j]}' mean a good measurement? Rows with any other value are stored excluded, the value as the reason.`,
        choices: values.map((v) => ({ value: v, label: v })),
      })
    }
    ctx.keep[j] = keep
    const other = values.filter((v) => !keep.includes(v))
    ctx.notes.push(`'${ctx.names[j]}' is a quality flag, not an instrument: rows marked ${other.map((v) => `'${v}'`).join(', ') || '(none)'} are stored excluded with that reason; '${keep.join("', '")}' kept`)
  }
}

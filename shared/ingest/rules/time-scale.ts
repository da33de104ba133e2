import { describeTimeScale } from '../time.ts'
import { readTimeWords } from '../time-words.ts'
import { commentBody, commentPrefix } from '../text.ts'
import type { Rule } from './context.ts'
import { timeText } from './time-format.ts'

/**
 * Time scale: given; else the archive metadata (ECSV `time_scale`, IPAC `TIMESYS`); else the time
 * column's own words (`BJD_TDB`, `HJD`, `JD_UTC`, "Barycentric Julian Date (TDB)"); else a comment
 * line above the data that names one; else unknown (said in a note). A full-JD barycentric TDB
 * column keeps the format 'bjd'.
 */
export const timeScale: Rule = (ctx) => {
  const { hints, layout } = ctx
  if (hints.timeScale) { ctx.timeScale = hints.timeScale; ctx.notes.push(`time scale ${describeTimeScale(ctx.timeScale)}, as given`) }
  else if (layout?.timeScale) { ctx.timeScale = layout.timeScale; ctx.notes.push(`time scale ${describeTimeScale(ctx.timeScale)} (from ${layout.timeScaleFrom})`) }
  else {
    const own = readTimeWords(timeText(ctx)).scale
    if (own) { ctx.timeScale = own; ctx.notes.push(`time scale ${describeTimeScale(own)} (from the time column's header)`) }
    else {
      const end = ctx.dataIdx[0] ?? 0
      for (let i = 0; i < end && i < 200; i++) {
        const l = ctx.lines[i]!
        if (commentPrefix(l) === null && !(ctx.layout && i < ctx.layout.firstLine)) continue
        const body = commentPrefix(l) === null ? l : commentBody(l)
        if (!/jd|julian|time|date|epoch/i.test(body)) continue
        const s = readTimeWords(body).scale
        if (s) { ctx.timeScale = s; ctx.notes.push(`time scale ${describeTimeScale(s)} (from line ${i + 1}: '${body.slice(0, 60)}')`); break }
      }
    }
    if (ctx.timeScale === 'unknown') {
      if (ctx.timeFormat === 'bjd') ctx.timeScale = 'bjd_tdb'
      else ctx.notes.push('time scale not stated (BJD_TDB, HJD, UTC?): choose it, or the times are kept as written and labelled "scale not stated"')
    }
  }
  if (ctx.timeFormat === 'jd' && ctx.timeScale === 'bjd_tdb') ctx.timeFormat = 'bjd'
  if (ctx.timeFormat === 'bjd' && ctx.timeScale !== 'bjd_tdb' && ctx.timeScale !== 'unknown') ctx.timeFormat = 'jd'
}

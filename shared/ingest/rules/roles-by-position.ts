import { IngestError } from '../errors.ts'
import { median, taken, type Rule } from './context.ts'

const ROW_COUNTER_HEAD = 2000

/** A column of whole numbers rising by one (a row counter) is not data, when three other numeric columns remain. */
export const rowCounter: Rule = (ctx) => {
  const { roles, isNumeric, stats } = ctx
  const useful = (r: (typeof roles)[number]) => r === null || r === 'time' || r === 'rv' || r === 'error'
  let total = roles.filter((r, k) => isNumeric[k] && useful(r)).length
  for (let j = 0; j < ctx.columnCount; j++) {
    if (roles[j] !== null || !isNumeric[j]) continue
    if (total - 1 < 3) continue
    const v = stats[j]!.values.slice(0, ROW_COUNTER_HEAD)
    if (v.length >= 3 && v.every((x, k) => Number.isInteger(x) && (k === 0 || x === v[k - 1]! + 1))) {
      roles[j] = 'ignore'
      ctx.notes.push(`'${ctx.names[j]}' counts rows (1, 2, 3, …), so it is ignored`)
      total--
    }
  }
}

/** Calendar dates as text where a time column should be: say so rather than guess. */
export const calendarDates: Rule = (ctx) => {
  if (taken(ctx, 'time') >= 0 || ctx.hints.time !== undefined) return
  if (ctx.stats.some((s, j) => ctx.roles[j] === null && ctx.isNumeric[j] && median(s.values) > 2_300_000)) return
  const j = ctx.stats.findIndex((s, k) => !ctx.isNumeric[k] && s.text > 0 && [...s.distinct.keys()].every((c) => /^\d{4}-\d{2}-\d{2}/.test(c)))
  if (j >= 0) {
    throw new IngestError('no_time_column',
      `Column '${ctx.names[j]}' holds calendar dates; Starsway reads times as Julian days (JD, BJD, MJD or reduced JD). Convert the dates to Julian days and upload again.`, 'time')
  }
}

/** Time, velocity and error from the free numeric columns, for what names did not settle. */
export const rolesByPosition: Rule = (ctx) => {
  const { roles, isNumeric, stats, names, notes, hints } = ctx
  const how = (what: string) => (ctx.headerNames ? what : 'by position')
  const free = (j: number): boolean => roles[j] === null && isNumeric[j]!
  if (taken(ctx, 'time') < 0 && hints.time === undefined) {
    let j = -1
    for (let k = 0; k < ctx.columnCount; k++) if (free(k) && median(stats[k]!.values) > 2_300_000) { j = k; break }
    if (j < 0) for (let k = 0; k < ctx.columnCount; k++) if (free(k)) { j = k; break }
    if (j >= 0) { roles[j] = 'time'; notes.push(`'${names[j]}' is the time column (${how('first numeric column without a known name')})`) }
  }
  if (taken(ctx, 'rv') < 0 && hints.rv === undefined) {
    let j = -1
    for (let k = 0; k < ctx.columnCount; k++) if (free(k)) { j = k; break }
    if (j >= 0) { roles[j] = 'rv'; notes.push(`'${names[j]}' is the velocity column (${how('next numeric column without a known name')})`) }
  }
  if (taken(ctx, 'time') < 0) throw new IngestError('no_time_column', 'No time column was found. Mark the column that holds the observation times.', 'time')
  if (taken(ctx, 'rv') < 0) {
    throw new IngestError('no_velocity_column',
      `Only one numeric column ('${names[taken(ctx, 'time')]}') was found; a velocity table needs time, velocity and error columns. Check the delimiter, or mark the velocity column.`, 'rv')
  }
  if (taken(ctx, 'error') < 0 && hints.error === undefined) {
    let j = -1
    for (let k = taken(ctx, 'rv') + 1; k < ctx.columnCount; k++) if (free(k)) { j = k; break }
    if (j >= 0) {
      const v = stats[j]!.values
      const positive = v.filter((x) => x > 0).length
      if (v.length > 0 && positive >= 0.9 * v.length) {
        roles[j] = 'error'
        notes.push(`'${names[j]}' is the error column (${how('the numeric column after the velocity')}; ${positive === v.length ? 'all values positive' : `${v.length - positive} values ≤ 0 are reported as row problems`})`)
      } else notes.push(`'${names[j]}' follows the velocity but has many values ≤ 0, so it is not taken as the error column`)
    }
  }
  if (taken(ctx, 'error') < 0) notes.push('no error column: give one error for all rows (defaultError), or mark the error column')
}

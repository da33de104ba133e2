import { archive } from './archive.ts'
import { bodyLines } from './body-lines.ts'
import { columnNames, commentHeader } from './comment-header.ts'
import { columns } from './columns.ts'
import type { Rule } from './context.ts'
import { delimiter } from './delimiter.ts'
import { flags } from './flags.ts'
import { headerRows } from './header-rows.ts'
import { instrument } from './instrument.ts'
import { rolesByName, rolesFromHints } from './roles-by-name.ts'
import { calendarDates, rolesByPosition, rowCounter } from './roles-by-position.ts'
import { decimalComma, sample } from './sample.ts'
import { start } from './start.ts'
import { columnStats, joinedName } from './stats.ts'
import { timeFormat } from './time-format.ts'
import { timeScale } from './time-scale.ts'
import { units } from './units.ts'

/**
 * Detection as a pipeline of small rules, each in its own file, run in this order; each reads
 * what the earlier ones decided (see context.ts and the README's "Detection rules").
 */
export const RULES: ReadonlyArray<readonly [string, Rule]> = [
  ['start', start],
  ['archive format', archive],
  ['body lines', bodyLines],
  ['delimiter', delimiter],
  ['sample', sample],
  ['decimal comma', decimalComma],
  ['header rows', headerRows],
  ['commented header', commentHeader],
  ['column names', columnNames],
  ['column statistics', columnStats],
  ['joined name', joinedName],
  ['roles by name', rolesByName],
  ['roles from hints', rolesFromHints],
  ['row counter', rowCounter],
  ['calendar dates', calendarDates],
  ['roles by position', rolesByPosition],
  ['flag columns', flags],
  ['instrument', instrument],
  ['units', units],
  ['time format', timeFormat],
  ['time scale', timeScale],
  ['columns', columns],
]

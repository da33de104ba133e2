import { DEFAULT_INSTRUMENT } from '../limits.ts'
import { taken, type Rule } from './context.ts'

/** A name for the rows of a file without an instrument column: its file name without the extension. */
export function instrumentFromFileName(fileName: string): string {
  const base = fileName.replace(/^.*[\\/]/, '').replace(/\.[A-Za-z0-9]{1,6}$/, '').trim()
  return base.slice(0, 120) || DEFAULT_INSTRUMENT
}

/** Instrument: a text column whose values repeat; else a name given, else the file's name. */
export const instrument: Rule = (ctx) => {
  const { hints } = ctx
  if (taken(ctx, 'instrument') < 0 && hints.instrument === undefined) {
    for (let j = 0; j < ctx.columnCount; j++) {
      if (ctx.roles[j] !== null || ctx.isNumeric[j]) continue
      const s = ctx.stats[j]!
      if (s.text === 0) continue
      if (s.distinct.size <= Math.max(1, Math.floor(s.text / 2)) && s.distinct.size <= 200) {
        ctx.roles[j] = 'instrument'
        ctx.notes.push(`'${ctx.names[j]}' is the instrument column (text whose values repeat: ${s.distinct.size} distinct)`)
        break
      }
    }
  }
  if (taken(ctx, 'instrument') >= 0) return
  if (hints.instrumentName) ctx.notes.push(`all rows are instrument '${hints.instrumentName}', as given`)
  else if (hints.fileName) ctx.notes.push(`no instrument column: all rows are instrument '${instrumentFromFileName(hints.fileName)}' (from the file name; give the same name as another file's to merge them)`)
  else ctx.notes.push('no instrument column: all rows get one instrument name')
}

import { unitFromName } from '../names.ts'
import { canonicalUnit } from '../units.ts'
import { median, taken, type DetectContext, type Rule } from './context.ts'

/** The unit a column's header, units row or archive metadata names, if any. */
function written(ctx: DetectContext, j: number): string | undefined {
  const meta = ctx.layout?.units?.[j]
  if (meta) { const u = unitFromName(`[${meta}]`); if (u) return u }
  return unitFromName(`${ctx.names[j]} ${ctx.unitsText[j]}`)
}

/**
 * Units per column. The velocity's unit: given, else written for it (header `RV[km/s]`, a units
 * row, archive metadata), else the error's, else judged by value (km/s when the median error is
 * below 0.05 — beyond any spectrograph in m/s; with no error column, when the velocities span
 * less than 0.5). The error column keeps its own written unit (`eRV[m/s]` beside `RV[km/s]`).
 */
export const units: Rule = (ctx) => {
  const rvJ = taken(ctx, 'rv')
  const errJ = taken(ctx, 'error')
  const rvUnit = written(ctx, rvJ)
  const errUnit = errJ >= 0 ? written(ctx, errJ) : undefined
  if (ctx.hints.unit) { ctx.unit = canonicalUnit(ctx.hints.unit); ctx.notes.push(`velocities in ${ctx.unit}, as given`) }
  else if (rvUnit) { ctx.unit = rvUnit; ctx.notes.push(`velocities in ${rvUnit} (from the header)`) }
  else if (errUnit) { ctx.unit = errUnit; ctx.notes.push(`velocities in ${errUnit} (the unit the header gives the errors)`) }
  else {
    const rvValues = ctx.stats[rvJ]!.values
    const span = rvValues.length ? Math.max(...rvValues) - Math.min(...rvValues) : 0
    if (errJ >= 0) {
      const medErr = median(ctx.stats[errJ]!.values)
      ctx.unit = medErr < 0.05 ? 'km/s' : 'm/s'
      ctx.notes.push(ctx.unit === 'km/s'
        ? `velocities taken as km/s: the median error ${medErr} is below 0.05, too small for m/s`
        : `velocities taken as m/s (no unit in the header; median error ${medErr} is plausible in m/s)`)
    } else {
      ctx.unit = rvValues.length >= 3 && span < 0.5 ? 'km/s' : 'm/s'
      ctx.notes.push(ctx.unit === 'km/s'
        ? `velocities taken as km/s: they span only ${span.toPrecision(3)}, too little for m/s`
        : 'velocities taken as m/s (no unit in the header and no error column to judge by)')
    }
  }
  if (errJ >= 0 && errUnit && errUnit !== ctx.unit && !ctx.hints.unit) {
    ctx.units[errJ] = errUnit
    ctx.notes.push(`errors in ${errUnit}, velocities in ${ctx.unit} (each column's own unit, from the header)`)
  }
  for (let j = 0; j < ctx.columnCount; j++) {
    if (ctx.roles[j] === 'indicator' || ctx.roles[j] === null) {
      const u = written(ctx, j)
      if (u) ctx.units[j] = u
    }
  }
}

import { IngestError } from '../errors.ts'
import { indicatorKey, readName } from '../names.ts'
import type { ColumnRef } from '../types.ts'
import { ROLE_NAMES, taken, type Rule } from './context.ts'

/** Roles from the header names: the first column named like each role takes it. */
export const rolesByName: Rule = (ctx) => {
  const { names, isNumeric, notes } = ctx
  ctx.readings = names.map((n) => (ctx.headerNames ? readName(n) : { role: null }))
  ctx.roles = ctx.readings.map((r) => r.role)
  ctx.indicatorKeys = ctx.readings.map((r) => r.indicator)
  for (const role of ['time', 'rv', 'error', 'instrument'] as const) {
    let first = -1
    for (let j = 0; j < ctx.columnCount; j++) {
      if (ctx.roles[j] !== role) continue
      if (role !== 'instrument' && !isNumeric[j]) {
        notes.push(`'${names[j]}' looks like the ${ROLE_NAMES[role]} column by its name but does not hold numbers; ignored`)
        ctx.roles[j] = 'ignore'
      } else if (first >= 0) {
        notes.push(`'${names[j]}' also looks like a ${ROLE_NAMES[role]} column; '${names[first]}' is used, this one kept as an indicator`)
        ctx.roles[j] = isNumeric[j] ? 'indicator' : 'ignore'
        ctx.indicatorKeys[j] = indicatorKey(names[j]!)
      } else first = j
    }
    if (first >= 0) notes.push(`'${names[first]}' is the ${ROLE_NAMES[role]} column (by its name)`)
  }
}

function resolveRef(ref: ColumnRef, names: string[], field: string): number {
  if (typeof ref === 'number') {
    if (!Number.isInteger(ref) || ref < 1 || ref > names.length) {
      throw new IngestError('bad_hint', `${field} column ${ref} does not exist: the table has ${names.length} columns (numbered from 1)`, field)
    }
    return ref - 1
  }
  const want = ref.trim().toLowerCase()
  const i = names.findIndex((n) => n.trim().toLowerCase() === want)
  if (i < 0) {
    if (/^\d+$/.test(want)) return resolveRef(Number(want), names, field)
    throw new IngestError('bad_hint', `${field} column '${ref}' is not in the header (${names.join(', ')})`, field)
  }
  return i
}

/** Column hints override the names. */
export const rolesFromHints: Rule = (ctx) => {
  const { names, isNumeric, hints } = ctx
  const apply = (role: 'time' | 'rv' | 'error' | 'instrument', ref: ColumnRef | null | undefined): void => {
    if (ref === undefined) return
    const old = taken(ctx, role)
    if (old >= 0) ctx.roles[old] = isNumeric[old] && role !== 'instrument' ? 'indicator' : 'ignore'
    if (old >= 0 && ctx.roles[old] === 'indicator') ctx.indicatorKeys[old] = indicatorKey(names[old]!)
    if (ref === null) { ctx.notes.push(`no ${ROLE_NAMES[role]} column, as given`); return }
    const j = resolveRef(ref, names, role)
    if (role !== 'instrument' && !isNumeric[j]) throw new IngestError('bad_hint', `${ROLE_NAMES[role]} column '${names[j]}' does not hold numbers`, role)
    ctx.roles[j] = role
    ctx.notes.push(`'${names[j]}' is the ${ROLE_NAMES[role]} column, as given`)
  }
  apply('time', hints.time)
  apply('rv', hints.rv)
  apply('error', hints.error)
  apply('instrument', hints.instrument)
}

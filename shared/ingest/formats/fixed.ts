import type { FixedField } from './layout.ts'

/**
 * Column positions of a fixed-width table: the character positions that are blank on every
 * sampled line separate the columns (a run of inked positions is one column). Returns null when
 * fewer than two columns are found.
 */
export function findFixedFields(lines: string[]): FixedField[] | null {
  if (lines.length === 0) return null
  const width = Math.min(2000, Math.max(...lines.map((l) => l.length)))
  const ink = new Uint8Array(width)
  for (const l of lines) {
    const n = Math.min(l.length, width)
    for (let k = 0; k < n; k++) { const c = l.charCodeAt(k); if (c !== 32 && c !== 9) ink[k] = 1 }
  }
  const fields: FixedField[] = []
  for (let k = 0; k < width;) {
    if (!ink[k]) { k++; continue }
    const start = k
    while (k < width && ink[k]) k++
    fields.push({ start, end: k })
  }
  if (fields.length < 2) return null
  // Each column extends to the start of the next, so a shorter value in it is still read whole.
  return fields.map((f, k) => ({ start: k === 0 ? 0 : fields[k - 1]!.end, end: k + 1 < fields.length ? f.end : Number.MAX_SAFE_INTEGER }))
}

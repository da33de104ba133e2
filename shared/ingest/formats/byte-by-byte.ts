import { parseNumber } from '../text.ts'
import type { FieldSpec } from '../types.ts'
import { sliceFixed, type ArchiveLayout } from './layout.ts'

const SPEC = /^\s*(\d+)(?:\s*-\s*(\d+))?\s+([AIFE]\d+(?:\.\d+)?)\s+(\S+)\s+(\S+)\s*(.*)$/
const TITLE = /^\s*Byte-by-byte Description of file:\s*(\S+)/i

/**
 * The byte-by-byte descriptions of a CDS/VizieR ReadMe or an AAS machine-readable table (MRT):
 * for each file named after `Byte-by-byte Description of file:`, its columns as 1-based byte
 * ranges with format, unit (`---` = none), label and explanation.
 */
export function readByteDescriptions(lines: string[]): Map<string, { specs: FieldSpec[]; formats: string[]; end: number }> {
  const out = new Map<string, { specs: FieldSpec[]; formats: string[]; end: number }>()
  for (let i = 0; i < lines.length; i++) {
    const t = TITLE.exec(lines[i]!)
    if (!t) continue
    const specs: FieldSpec[] = []
    const formats: string[] = []
    let j = i + 1
    for (; j < lines.length; j++) {
      const l = lines[j]!
      if (TITLE.test(l) || /^\s*Note\s*\(/i.test(l) || /^={5,}\s*$/.test(l)) break
      const m = SPEC.exec(l)
      if (m) {
        const first = Number(m[1])
        const spec: FieldSpec = { first, last: m[2] ? Number(m[2]) : first, label: m[5]! }
        if (m[4] !== '---') spec.unit = m[4]!
        const explanation = m[6]!.trim()
        if (explanation) spec.explanation = explanation
        specs.push(spec)
        formats.push(m[3]!)
      } else if (specs.length > 0 && /^\s{10,}\S/.test(l)) {
        const last = specs[specs.length - 1]!
        last.explanation = `${last.explanation ?? ''} ${l.trim()}`.trim()
      }
    }
    if (specs.length > 0) out.set(t[1]!, { specs, formats, end: j })
    i = j - 1
  }
  return out
}

/** An archive layout from byte-by-byte specs (fixed positions, names, units, explanations). */
export function layoutFromSpecs(specs: FieldSpec[], format: 'mrt' | 'cds', firstLine: number): ArchiveLayout {
  return {
    format, firstLine, hasHeader: false, delimiter: 'fixed',
    fields: specs.map((s) => ({ start: s.first - 1, end: s.last })),
    names: specs.map((s) => s.label),
    units: specs.map((s) => s.unit),
    descriptions: specs.map((s) => s.explanation),
    notes: [],
  }
}

/**
 * AAS machine-readable table: a title block, one byte-by-byte description, notes, then the data
 * in the same file. The body starts at the first line after the description whose numeric
 * fields (formats F, I, E) all read as numbers or blanks, with at least one number.
 */
export function readMrt(lines: string[]): ArchiveLayout | null {
  const head = lines.slice(0, 400)
  const found = readByteDescriptions(head)
  if (found.size !== 1) return null
  const [, { specs, formats, end }] = [...found][0]!
  const numeric = formats.map((f) => /^[IFE]/.test(f))
  const fields = specs.map((s) => ({ start: s.first - 1, end: s.last }))
  for (let i = end; i < lines.length; i++) {
    const l = lines[i]!
    if (l.trim() === '' || /^[-=]{5,}\s*$/.test(l) || /^\s*Note/i.test(l)) continue
    const cells = sliceFixed(l, fields)
    let numbers = 0
    let ok = true
    cells.forEach((c, k) => {
      if (!numeric[k] || c === '') return
      if (Number.isNaN(parseNumber(c))) ok = false
      else numbers++
    })
    if (ok && numbers > 0 && numbers >= numeric.filter(Boolean).length - 1) {
      const layout = layoutFromSpecs(specs, 'mrt', i)
      layout.notes.push(`machine-readable table: ${specs.length} columns from its byte-by-byte description; data from line ${i + 1}`)
      return layout
    }
  }
  return null
}

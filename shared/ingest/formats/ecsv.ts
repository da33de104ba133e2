import { parse as parseYaml } from 'yaml'
import { readTimeWords } from '../time-words.ts'
import type { Delimiter } from '../types.ts'
import { scaleFromMeta, type ArchiveLayout } from './layout.ts'

interface EcsvColumn { name?: unknown; unit?: unknown; description?: unknown; meta?: unknown }

/** Find `key` (case-insensitive) in nested metadata, at most a few levels deep. */
function findKey(obj: unknown, keys: RegExp, depth = 0): string | undefined {
  if (depth > 5 || obj === null || typeof obj !== 'object') return undefined
  if (Array.isArray(obj)) {
    for (const x of obj) { const r = findKey(x, keys, depth + 1); if (r !== undefined) return r }
    return undefined
  }
  for (const [k, v] of Object.entries(obj as Record<string, unknown>)) {
    if (keys.test(k) && typeof v === 'string') return v
    const r = findKey(v, keys, depth + 1)
    if (r !== undefined) return r
  }
  return undefined
}

/**
 * Astropy's ECSV (Enhanced Character Separated Values, ECSV 1.0): `# %ECSV` then a YAML header in
 * comment lines listing each column's name, unit and description, table `meta`, and the
 * delimiter (space by default); the first non-comment line names the columns. Units and a time
 * scale (`time_scale`, `TIMESYS`, or the `scale` of a serialised time column) are honoured.
 */
export function readEcsv(lines: string[]): ArchiveLayout | null {
  if (!/^#\s*%ECSV\b/.test(lines[0] ?? '')) return null
  const yamlLines: string[] = []
  let i = 1
  for (; i < lines.length && /^\s*#/.test(lines[i]!); i++) {
    const body = lines[i]!.replace(/^\s*# ?/, '')
    if (body.trim() === '---') continue
    yamlLines.push(body)
  }
  const notes: string[] = []
  let header: Record<string, unknown> = {}
  try {
    const parsed = parseYaml(yamlLines.join('\n'), { schema: 'yaml-1.1', logLevel: 'silent' }) as unknown
    if (parsed && typeof parsed === 'object') header = parsed as Record<string, unknown>
  } catch (e) {
    notes.push(`the ECSV header is not valid YAML (${(e as Error).message.split('\n')[0]}); columns are detected from the data`)
  }
  const columns = Array.isArray(header.datatype) ? (header.datatype as EcsvColumn[]) : []
  const delimiter: Delimiter = header.delimiter === ',' ? ',' : 'whitespace'
  const names = columns.map((c) => String(c.name ?? ''))
  const units = columns.map((c) => (typeof c.unit === 'string' && c.unit.trim() !== '' ? c.unit : undefined))
  const descriptions = columns.map((c) => (typeof c.description === 'string' ? c.description : undefined))
  const layout: ArchiveLayout = { format: 'ecsv', firstLine: i, hasHeader: true, delimiter, notes }
  if (columns.length > 0) Object.assign(layout, { names, units, descriptions })
  const scale = findKey(header.meta, /^(?:time_?scale|timesys|scale)$/i) ?? findKey(columns.map((c) => c.meta), /^(?:time_?scale|timesys|scale)$/i)
  if (scale !== undefined) {
    const words = columns.map((c) => `${String(c.name ?? '')} ${String(c.description ?? '')}`).join(' ')
    const bary = readTimeWords(words).scale === 'bjd_tdb' || /bary/i.test(findKey(header.meta, /^timeref$/i) ?? '')
    const s = scaleFromMeta(scale, bary)
    if (s) { layout.timeScale = s; layout.timeScaleFrom = `the ECSV metadata (scale '${scale}')` }
  }
  notes.push(`astropy ECSV table: ${columns.length} columns described in its YAML header${units.some(Boolean) ? ', units from it' : ''}`)
  return layout
}

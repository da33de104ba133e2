// Survey uploads: which star each file belongs to (a header line such as "# star: HD 1", else the
// file name), and one table holding several stars split by its star column into one table per
// star (the star column removed), each then read by the ordinary ingest (shared/ingest).

/** Header words naming the star column of a several-star table (compared case-insensitively). */
export const STAR_COLUMN_NAMES = ['star', 'object', 'target', 'starname', 'star_name', 'obj']

/** The star named in a comment line "# star: X" / "# star = X" / "# object: X", or null. */
export function starFromHeader(text: string): string | null {
  for (const line of text.split(/\r?\n/, 40)) {
    const m = /^\s*[#!%;]\s*(?:star|object|target)\s*[:=]\s*(.+?)\s*$/i.exec(line)
    if (m) return m[1]!.replace(/^["']|["']$/g, '').trim() || null
  }
  return null
}

/** Mass of the star (M☉, and its error) from "# starMass: 0.93 ± 0.05" / "# starMass = 0.93 +- 0.05", or null. */
export function massFromHeader(text: string): { mass: number; err: number | null } | null {
  for (const line of text.split(/\r?\n/, 40)) {
    const m = /^\s*[#!%;]\s*star\s*mass\s*[:=]\s*([0-9.eE+-]+)\s*(?:(?:±|\+-|\+\/-)\s*([0-9.eE+-]+))?/i.exec(line)
    if (m) {
      const mass = Number(m[1]); const err = m[2] === undefined ? null : Number(m[2])
      if (mass > 0 && Number.isFinite(mass) && (err === null || (err >= 0 && Number.isFinite(err)))) return { mass, err }
    }
  }
  return null
}

/** The star of a file from its name: the part before the first dot ("HD 1234.rv.txt" → "HD 1234"), underscores kept. */
export function starFromFileName(fileName: string): string {
  const base = fileName.split(/[\\/]/).pop() ?? fileName
  const stem = base.includes('.') ? base.slice(0, base.indexOf('.')) : base
  return stem.trim() || base
}

export interface SplitTable { star: string; text: string; rows: number }

function cellsOf(line: string, delimiter: string | RegExp): string[] {
  return line.split(delimiter).map((c) => c.trim().replace(/^["']|["']$/g, ''))
}

/**
 * A table with a star column (found by `column`, else by STAR_COLUMN_NAMES in its header line)
 * split into one table per star, in the order the stars first appear; null when the table has no
 * such column. Comment lines before the header are kept in every part.
 */
export function splitByStar(text: string, column?: string): SplitTable[] | null {
  const lines = text.split(/\r?\n/)
  let h = 0
  while (h < lines.length && (/^\s*$/.test(lines[h]!) || /^\s*[#!%;]/.test(lines[h]!))) h++
  // a header commented out ("# star time rv err") counts too
  const candidates = [h, h - 1].filter((i) => i >= 0 && i < lines.length)
  for (const hi of candidates) {
    const raw = lines[hi]!.replace(/^\s*[#!%;]\s*/, '')
    const delimiter: string | RegExp = raw.includes('\t') ? '\t' : raw.includes(',') ? ',' : raw.includes(';') ? ';' : /\s+/
    const head = cellsOf(raw.trim(), delimiter)
    const want = column ? [column.toLowerCase()] : STAR_COLUMN_NAMES
    const k = head.findIndex((c) => want.includes(c.toLowerCase()))
    if (k < 0) continue
    const pre = lines.slice(0, hi).filter((l) => !/^\s*$/.test(l))
    const headerOut = lines[hi]!.trimStart().match(/^[#!%;]\s*/)?.[0] ?? ''
    const joiner = typeof delimiter === 'string' ? delimiter : ' '
    const headerLine = headerOut + head.filter((_, j) => j !== k).join(joiner)
    const groups = new Map<string, string[]>()
    for (let i = hi + 1; i < lines.length; i++) {
      const l = lines[i]!
      if (/^\s*$/.test(l) || /^\s*[#!%;]/.test(l)) continue
      const cells = cellsOf(l.trim(), delimiter)
      const star = cells[k] ?? ''
      if (!groups.has(star)) groups.set(star, [])
      groups.get(star)!.push(cells.filter((_, j) => j !== k).join(joiner))
    }
    return [...groups].map(([star, rows]) => ({ star, text: [...pre, headerLine, ...rows].join('\n') + '\n', rows: rows.length }))
  }
  return null
}

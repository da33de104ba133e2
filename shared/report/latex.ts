/**
 * Plain LaTeX `tabular` tables (no packages beyond the LaTeX kernel: no siunitx, no booktabs), with
 * every text cell escaped. Cells that are already LaTeX (numbers with `$\pm$`, headers with math)
 * are passed as `{ tex }`.
 */
import { roundAsymmetric, roundByUncertainty, formatPlain } from './round.ts'

export type Cell = string | { tex: string }

const ESCAPES: Record<string, string> = {
  '\\': '\\textbackslash{}', '&': '\\&', '%': '\\%', $: '\\$', '#': '\\#', _: '\\_',
  '{': '\\{', '}': '\\}', '~': '\\textasciitilde{}', '^': '\\textasciicircum{}',
}

/** Escapes the ten LaTeX special characters of plain text; other characters are kept as they are. */
export function escapeLatex(text: string): string {
  return text.replace(/[\\&%$#_{}~^]/g, (c) => ESCAPES[c]!)
}

function cellTex(c: Cell): string {
  return typeof c === 'string' ? escapeLatex(c) : c.tex
}

export interface TabularOptions {
  /** Column alignment, e.g. 'lrr' (default: first column left, others centred). */
  align?: string
  header: Cell[]
  rows: Cell[][]
}

/** A `tabular` environment with one \hline under the header and around the table. */
export function tabular(opts: TabularOptions): string {
  const n = opts.header.length
  if (n === 0) throw new RangeError('header must have at least one column')
  const align = opts.align ?? 'l' + 'c'.repeat(n - 1)
  if (align.replace(/[^lcr]/g, '').length !== n) throw new RangeError(`align must give ${n} columns, got "${align}"`)
  opts.rows.forEach((r, i) => { if (r.length !== n) throw new RangeError(`rows[${i}] must have ${n} cells, got ${r.length}`) })
  const line = (cells: Cell[]) => `  ${cells.map(cellTex).join(' & ')} \\\\`
  return [`\\begin{tabular}{${align}}`, '  \\hline', line(opts.header), '  \\hline', ...opts.rows.map(line), '  \\hline', '\\end{tabular}'].join('\n')
}

/** `$v \pm e$` rounded by the PDG rule; a missing or zero error prints the value alone (zero: "(fixed)"). */
export function texValue(value: number | null | undefined, err: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '---'
  if (err === 0) return `$${formatPlain(value)}$ (fixed)`
  if (err === null || err === undefined || !Number.isFinite(err) || err < 0) return `$${formatPlain(value)}$`
  const r = roundByUncertainty(value, err)
  return `$${r.value} \\pm ${r.error}$`
}

/** `$v^{+a}_{-b}$` for a credible interval, rounded at the smaller side's place; `$v \pm a$` when both sides print alike. */
export function texInterval(value: number, plus: number, minus: number): string {
  if (!(plus > 0) || !(minus > 0)) return `$${formatPlain(value)}$`
  const r = roundAsymmetric(value, plus, minus)
  if (r.plus === r.minus) return `$${r.value} \\pm ${r.plus}$`
  return `$${r.value}^{+${r.plus}}_{-${r.minus}}$`
}

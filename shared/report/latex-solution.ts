/**
 * The LaTeX export of a frozen solution: two floating tables ready to paste into a journal
 * manuscript. The orbit table has the quantities as rows and the planets as columns (units in their
 * own column, times against a reduced epoch named in the unit); the instrument table has one row per
 * instrument. Each is a `table` float with a caption and a label; with more than one planet the orbit
 * table becomes `table*` (page-wide in two-column journals). Only the LaTeX kernel is needed (no
 * siunitx, no booktabs), so it compiles in any journal class.
 */
import type { ReportSnapshot } from '../api/reports.ts'
import { escapeLatex, texInterval, texValue } from './latex.ts'
import { formatPlain } from './round.ts'
import { instrumentRows } from './table.ts'
import { solutionGrid, type GridCell } from './solution-grid.ts'

function slug(text: string): string {
  return text.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '') || 'star'
}

/** One value: the posterior interval when sampled, else the fit ± 1σ; `shift` is subtracted first. */
export function texCell(c: GridCell | null, sampled: boolean, shift = 0): string {
  if (!c) return ''
  if (sampled && c.median !== null && c.plus !== null && c.minus !== null) return texInterval(c.median - shift, c.plus, c.minus)
  return texValue(c.value === null ? null : c.value - shift, c.error)
}

function oneLine(text: string): string {
  return text.replace(/[\r\n]+/g, ' ')
}

/** Plain words with a few symbols (σ, Γ, ², ×, −) as LaTeX the kernel compiles without extra packages. */
function texNote(text: string): string {
  const map: Record<string, string> = { 'σ': '$\\sigma$', 'Γ': '$\\Gamma$', '²': '$^2$', '×': '$\\times$', '−': '$-$', '–': '--', 'τ': '$\\tau$', 'λ': '$\\lambda$' }
  return escapeLatex(oneLine(text)).replace(/[σΓ²×−–τλ]/g, (c) => map[c]!)
}

/** The orbit table (`table` or `table*`) of a snapshot. */
export function orbitTableTex(s: ReportSnapshot): string {
  const g = solutionGrid(s)
  const n = g.columns.length
  const env = n > 1 ? 'table*' : 'table'
  const span = 2 + Math.max(n, 1)
  const lines: string[] = []
  const what = g.sampled ? 'posterior medians with 16th--84th percentile intervals' : 'maximum-likelihood values with 1$\\sigma$ errors'
  lines.push(`\\begin{${env}}`, '\\centering', '\\small', '\\setlength{\\tabcolsep}{4pt}')
  lines.push(`\\caption{Orbital solution for ${escapeLatex(oneLine(s.star.name))} (model \\textit{${escapeLatex(oneLine(s.model.name))}}, version ${s.model.version}). ` +
    `Values are ${what}, rounded by their uncertainty.}`)
  lines.push(`\\label{tab:orbit-${slug(s.star.name)}}`)
  lines.push(`\\begin{tabular}{ll${'c'.repeat(Math.max(n, 1))}}`, '\\hline')
  lines.push(`Parameter & Unit & ${n ? g.columns.map((c) => escapeLatex(c)).join(' & ') : 'Value'} \\\\`, '\\hline')
  for (const sec of g.sections) {
    lines.push(`\\multicolumn{${span}}{l}{\\emph{${escapeLatex(sec.title.replace(/ \(.*$/, ''))}}} \\\\`)
    for (const r of sec.rows) {
      const cells = r.cells.length === n
        ? r.cells.map((c) => texCell(c, g.sampled, r.shift))
        : [`\\multicolumn{${Math.max(n, 1)}}{c}{${texCell(r.cells[0] ?? null, false, r.shift)}}`]
      lines.push(`${r.texLabel} & ${r.texUnit}${r.isTime ? '$^\\dagger$' : ''} & ${cells.join(' & ')} \\\\`)
    }
  }
  lines.push('\\hline', '\\end{tabular}')
  const notes: string[] = [`$^\\dagger$ ${g.timeUnitTex}`, `stellar mass $M_{\\ast} = ${formatPlain(s.star.massMsun)} \\pm ${formatPlain(s.star.massErrMsun)}\\,M_\\odot$ for the derived quantities`]
  if (g.sections.some((x) => x.title.startsWith('Long-term'))) notes.push(`drift terms about the reference epoch ${formatPlain(s.result.epoch, 10)}`)
  for (const sec of g.sections) if (sec.note) notes.push(texNote(sec.note.replace(/\.$/, '')))
  lines.push('\\par\\smallskip', `{\\footnotesize ${notes.join('; ')}.}`)
  lines.push(`\\end{${env}}`)
  return lines.join('\n')
}

/** The instrument table: points, zero point, jitter and residual rms per instrument. */
export function instrumentTableTex(s: ReportSnapshot): string {
  const sampled = !!s.sampling
  const iv = (post: { median: number; plus: number; minus: number } | null, value: number | null, err: number | null) =>
    sampled && post ? texInterval(post.median, post.plus, post.minus) : texValue(value, err)
  const rows = instrumentRows(s).map((i) => `${escapeLatex(i.name)} & ${i.n} & ${iv(i.offsetPost, i.offset, i.offsetErr)} & ${iv(i.jitterPost, i.jitter, i.jitterErr)} & ${i.rms === null ? '---' : `$${formatPlain(i.rms, 3)}$`} \\\\`)
  return [
    '\\begin{table}', '\\centering', '\\small', '\\setlength{\\tabcolsep}{4pt}',
    `\\caption{Instruments in the solution for ${escapeLatex(oneLine(s.star.name))}: number of points, velocity zero point, jitter added in quadrature to the errors, and residual rms (all in m\\,s$^{-1}$).}`,
    `\\label{tab:instruments-${slug(s.star.name)}}`,
    '\\begin{tabular}{lrccc}', '\\hline',
    'Instrument & $N$ & Zero point & Jitter & rms \\\\', '\\hline',
    ...rows,
    '\\hline', '\\end{tabular}', '\\end{table}',
  ].join('\n')
}

/** The whole LaTeX export: a comment naming the version, the orbit table and the instrument table. */
export function latexTables(s: ReportSnapshot): string {
  return [
    `% ${oneLine(`${s.star.name}: ${s.model.name}`)}, model version ${s.model.version}; frozen ${s.frozenAt} (data ${s.data.hash.slice(0, 12)}).`,
    '% Needs only the LaTeX kernel. With more than one planet the orbit table is page-wide (table*).',
    orbitTableTex(s),
    '',
    instrumentTableTex(s),
  ].join('\n') + '\n'
}

/// <reference path="../../types/vendor.d.ts" />
// The PDF of one frozen report version: pdfkit with DejaVu Sans (a Unicode font shipped with the app
// through npm, so Greek letters, Δ, χ², ω, M☉, M⊕ and accented names print as written), the plots drawn
// from ECharts SSR SVGs by svg-to-pdfkit (vector paths and text).
import { createRequire } from 'node:module'
import { readFileSync } from 'node:fs'
import PDFDocument from 'pdfkit'
import SVGtoPDF from 'svg-to-pdfkit'
import type { Approval, ReportSnapshot } from '../../shared/api/reports.ts'
import { formatPlain } from '../../shared/report/round.ts'
import { instrumentRows, plainInterval, plainValue } from '../../shared/report/table.ts'
import { solutionGrid, type GridCell } from '../../shared/report/solution-grid.ts'
import { snapshotTimeSystem } from '../../shared/report/time-label.ts'
import { cornerInputOf } from '../../shared/report/corner-option.ts'
import { cornerOption, periodogramOption, phaseOption, renderSvg, residualsOption, timeSeriesOption } from './charts.ts'
import { limitsPage } from './limits-page.ts'

const require = createRequire(import.meta.url)
let fonts: { regular: Buffer; bold: Buffer } | undefined
function loadFonts() {
  fonts ??= {
    regular: readFileSync(require.resolve('dejavu-fonts-ttf/ttf/DejaVuSans.ttf')),
    bold: readFileSync(require.resolve('dejavu-fonts-ttf/ttf/DejaVuSans-Bold.ttf')),
  }
  return fonts
}

/** One cell of the solution grid as plain text: posterior interval when sampled, else the fit ± 1σ. */
function gridText(c: GridCell | null, sampled: boolean, shift: number): string {
  if (!c) return ''
  if (sampled && c.median !== null) return plainInterval(c.median - shift, c.plus, c.minus)
  return plainValue(c.value === null ? null : c.value - shift, c.error)
}

const PAGE = { width: 595.28, height: 841.89, margin: 40 }
const CONTENT_W = PAGE.width - 2 * PAGE.margin

export interface PdfInput { reportId: number; version: number; snapshot: ReportSnapshot; approvals: Approval[]; link: string }

/** Builds the PDF in memory. Pages: summary and tables; data and residuals; phase-folded orbits; periodograms; posterior (when sampled); methods and provenance. */
export async function reportPdf(input: PdfInput): Promise<Buffer> {
  const s = input.snapshot
  const f = loadFonts()
  const doc = new PDFDocument({ size: 'A4', margin: PAGE.margin, info: { Title: `${s.title} (version ${input.version})`, Author: s.frozenBy.name, Creator: `Starsway ${s.product.version}` } })
  doc.registerFont('Body', f.regular)
  doc.registerFont('Body-Bold', f.bold)
  const chunks: Buffer[] = []
  doc.on('data', (c: Buffer) => chunks.push(c))
  const done = new Promise<void>((resolve, reject) => { doc.on('end', () => resolve()); doc.on('error', reject) })

  const h1 = (t: string) => { doc.font('Body-Bold').fontSize(16).text(t); doc.moveDown(0.3) }
  const h2 = (t: string) => { doc.moveDown(0.5); doc.font('Body-Bold').fontSize(11.5).text(t); doc.moveDown(0.2) }
  /** A section heading, on a new page unless `room` points are left below it. */
  const h1Room = (t: string, room: number) => { if (doc.y + room + 30 > PAGE.height - PAGE.margin) doc.addPage(); else doc.moveDown(0.8); h1(t) }
  const para = (t: string, size = 9.5) => { doc.font('Body').fontSize(size).text(t, { width: CONTENT_W }) }
  const table = (header: string[], rows: string[][], widths: number[]) => {
    const x0 = PAGE.margin
    const rowH = 13
    const line = (cells: string[], bold: boolean) => {
      if (doc.y + rowH > PAGE.height - PAGE.margin) doc.addPage()
      const y = doc.y
      let x = x0
      doc.font(bold ? 'Body-Bold' : 'Body').fontSize(8)
      cells.forEach((c, i) => { doc.text(c, x + 2, y, { width: widths[i]! - 4, lineBreak: false, ellipsis: true }); x += widths[i]! })
      doc.x = x0
      doc.y = y + rowH
    }
    line(header, true)
    doc.moveTo(x0, doc.y - 2).lineTo(x0 + widths.reduce((a, b) => a + b, 0), doc.y - 2).lineWidth(0.5).stroke()
    for (const r of rows) line(r, false)
    doc.moveDown(0.3)
  }
  const plot = (svg: string, height: number) => {
    if (doc.y + height > PAGE.height - PAGE.margin) doc.addPage()
    SVGtoPDF(doc, svg, PAGE.margin, doc.y, { width: CONTENT_W, height, fontCallback: (_family: string, bold: boolean) => (bold ? 'Body-Bold' : 'Body') })
    doc.y += height + 8
    doc.x = PAGE.margin
  }

  // ---- page 1: summary and tables
  h1(s.title)
  para(`Report ${input.reportId}, version ${input.version}. Frozen ${s.frozenAt} by ${s.frozenBy.name}. Model "${s.model.name}" version ${s.model.version}. ` +
    `Starsway ${s.product.version}${s.product.commit ? ` (${s.product.commit.slice(0, 12)})` : ''}.`)
  para(`Data hash (SHA-256 of the included measurements and the exclusions): ${s.data.hash}`, 8)
  if (s.data.changedSinceFit) para('Note: the star\'s data changed after this fit (points excluded or restored); the values below are those of the fit as frozen.', 8.5)
  const ts = snapshotTimeSystem(s)
  h2('Star')
  table(['Name', 'Mass (M☉)', 'Radius (R☉)', 'Teff (K)', 'Luminosity (L☉)'], [[
    s.star.name, plainValue(s.star.massMsun, s.star.massErrMsun), s.star.radiusRsun === null ? '—' : formatPlain(s.star.radiusRsun, 4),
    s.star.teffK === null ? '—' : formatPlain(s.star.teffK, 5), s.star.luminosityLsun === null ? '—' : formatPlain(s.star.luminosityLsun, 4),
  ]], [135, 95, 95, 85, 105])
  const g = solutionGrid(s)
  h2(g.sampled ? 'Solution (posterior medians, 16th–84th percentiles)' : 'Solution (maximum likelihood, ±1σ)')
  if (!g.columns.length) para('No planets in this model.', 9)
  {
    const valueW = Math.max(70, Math.min(150, (CONTENT_W - 250) / Math.max(1, g.columns.length)))
    for (const sec of g.sections) {
      if (!g.columns.length && !sec.title.startsWith('Noise')) continue
      const star = sec.title.startsWith('Noise') // the GP's hyperparameters: the star's, from the fit
      const cols = !star && sec.rows[0]?.cells.length === g.columns.length ? g.columns : [star ? 'value (fit)' : 'all planets']
      table([sec.title, 'Unit', ...cols], sec.rows.map((r) => [r.label, r.unit, ...r.cells.map((c) => gridText(c, g.sampled && !star && !sec.title.startsWith('Long-term'), r.shift))]),
        [140, 110, ...cols.map(() => valueW)])
      if (sec.note) para(sec.note, 8)
    }
    if (g.columns.length) para(`Derived quantities use M★ = ${plainValue(s.star.massMsun, s.star.massErrMsun)} M☉. Times are ${ts.label} (full Julian dates minus ${formatPlain(ts.offset, 10)}).${g.sections.some((x) => x.title.startsWith('Long-term')) ? ` Drifts are per year about the reference epoch ${formatPlain(s.result.epoch, 10)}.` : ''}`, 8)
  }
  h2('Instruments')
  table(['Instrument', 'n', 'Zero point (m/s)', 'Jitter (m/s)', 'rms (m/s)'],
    instrumentRows(s).map((i) => [i.name, String(i.n),
      g.sampled && i.offsetPost ? plainInterval(i.offsetPost.median, i.offsetPost.plus, i.offsetPost.minus) : plainValue(i.offset, i.offsetErr),
      g.sampled && i.jitterPost ? plainInterval(i.jitterPost.median, i.jitterPost.plus, i.jitterPost.minus) : plainValue(i.jitter, i.jitterErr),
      i.rms === null ? '—' : formatPlain(i.rms, 3)]),
    [135, 45, 120, 120, 95])
  h2('Statistics')
  const st = s.result.stats
  table(['N', 'Free', 'χ²', 'Reduced χ²', 'ln L', 'BIC', 'AIC', 'rms (m/s)', 'Status'],
    [[String(st.nPoints), String(st.nParams), st.chi2 === null ? '—' : formatPlain(st.chi2, 5), st.reducedChi2 === null ? '—' : formatPlain(st.reducedChi2, 4),
      st.lnL === null ? '—' : formatPlain(st.lnL, 6), st.bic === null ? '—' : formatPlain(st.bic, 6), st.aic === null ? '—' : formatPlain(st.aic, 6),
      st.rms === null ? '—' : formatPlain(st.rms, 3), st.status]], [35, 40, 55, 70, 60, 65, 65, 60, 65])
  if (s.comparison) {
    h2('Model comparison')
    table(['Model', 'Version', 'Planets', 'Trend', 'BIC', 'ΔBIC', 'Evidence', 'Preferred'],
      s.comparison.rows.map((r) => [r.name, String(r.version), String(r.planets), r.trend, formatPlain(r.bic, 6), r.deltaBic === null ? '—' : formatPlain(r.deltaBic, 3), r.evidence ?? '—', r.preferred ? 'yes' : '']),
      [130, 45, 45, 55, 70, 60, 60, 50])
    para(s.comparison.reading, 8.5)
  }
  if (s.result.warnings.length) { h2('Warnings'); for (const w of s.result.warnings) para(`• ${w.message}`, 8.5) }

  // ---- plots: velocities and residuals share one page and one time axis; the rest packed
  doc.addPage()
  h1('Data, model and residuals')
  plot(renderSvg(timeSeriesOption(s), 640, 330), 300)
  plot(renderSvg(residualsOption(s), 640, 300), 270)
  if (s.result.planets.length) {
    h1Room('Phase-folded orbits', 250)
    s.result.planets.forEach((_, k) => plot(renderSvg(phaseOption(s, k), 640, 300), 250))
  }
  if (s.periodogram || s.residualPeriodogram) {
    h1Room('Periodograms', 240)
    if (s.periodogram) plot(renderSvg(periodogramOption(s.periodogram, 'Periodogram of the velocities (generalised Lomb–Scargle) with false-alarm levels'), 640, 290), 240)
    if (s.residualPeriodogram) plot(renderSvg(periodogramOption(s.residualPeriodogram, 'Periodogram of the residuals with false-alarm levels'), 640, 290), 240)
  }
  const corner = cornerOption(cornerInputOf(s.sampling), { fontFamily: 'Body' })
  if (corner && s.sampling) {
    doc.addPage()
    h1('Posterior')
    para(`Ensemble sampler: ${s.sampling.settings.walkers} walkers, ${s.sampling.settings.steps} steps, burn-in ${s.sampling.settings.burn}, thinning ${s.sampling.settings.thin}, seed ${s.sampling.settings.seed}; ` +
      `acceptance ${formatPlain(s.sampling.diagnostics.acceptance, 2)}; ${s.sampling.diagnostics.converged ? 'converged' : 'NOT converged'}. ` +
      'Contours enclose 39.3 % and 86.5 % of the draws (1σ and 2σ in two dimensions); dashed lines mark the 16th, 50th and 84th percentiles.')
    const all = cornerInputOf(s.sampling)?.names ?? []
    if (all.length > 8) para(`The corner plot shows the first 8 of the ${all.length} sampled parameters (${all.slice(0, 8).join(', ')}); every parameter's draws are in the JSON export.`, 8.5)
    for (const w of s.sampling.diagnostics.warnings) para(`• ${w}`, 8.5)
    doc.moveDown(0.5)
    plot(renderSvg(corner, 620, 620), CONTENT_W)
  }

  limitsPage(s, { newPage: () => doc.addPage(), h1, para, plot, table }) // detection limits when frozen with them (limits-page.ts)

  // ---- methods and provenance
  doc.addPage()
  h1('Methods')
  para(s.methods.text, 10)
  h2('References')
  for (const r of s.methods.references) para(r.citation, 9)
  h2('Provenance')
  para(`Included measurements: ${s.data.nIncluded} (${s.data.instruments.join(', ')}); excluded: ${s.data.nExcluded}. Fit: ${s.settings.fit.status}, ${s.settings.fit.iterations} iterations, trend ${s.settings.fit.trend}.`, 9)
  if (s.data.exclusions.length) {
    table(['Measurement', 'Instrument', `Time (${ts.scale})`, 'Reason', 'By'],
      s.data.exclusions.map((x) => [String(x.id), x.instrument, formatPlain(x.time, 12), x.reason ?? '', x.by?.name ?? '']), [70, 80, 90, 200, 75])
  }
  h2('Review')
  para(input.approvals.length
    ? input.approvals.map((a) => `${a.user.name}: ${a.decision === 'approve' ? 'approved' : 'requested changes'} (${a.at})`).join('; ')
    : `No approvals of version ${input.version} yet.`, 9)
  para(`Online: ${input.link}`, 9)

  doc.end()
  await done
  return Buffer.concat(chunks)
}

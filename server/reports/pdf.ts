/// <reference path="../../types/vendor.d.ts" />
// The PDF of one frozen report version: pdfkit with the app's Roboto font, the plots drawn from
// ECharts SSR SVGs by svg-to-pdfkit (vector paths and text).
import { createRequire } from 'node:module'
import { readFileSync } from 'node:fs'
import PDFDocument from 'pdfkit'
import SVGtoPDF from 'svg-to-pdfkit'
import type { Approval, ReportSnapshot } from '../../shared/api/reports.ts'
import { formatPlain } from '../../shared/report/round.ts'
import { instrumentRows, parameterRows, plainInterval, plainValue } from '../../shared/report/table.ts'
import { cornerOption, periodogramOption, phaseOption, renderSvg, residualsOption, timeSeriesOption } from './charts.ts'

const require = createRequire(import.meta.url)
let fonts: { regular: Buffer; bold: Buffer } | undefined
function loadFonts() {
  fonts ??= {
    regular: readFileSync(require.resolve('@fontsource/roboto/files/roboto-latin-400-normal.woff')),
    bold: readFileSync(require.resolve('@fontsource/roboto/files/roboto-latin-700-normal.woff')),
  }
  return fonts
}

/** The Latin subset of Roboto has no Greek or math glyphs: spell them out. */
function latin(text: string): string {
  return text.replace(/ω/g, 'omega').replace(/−/g, '-').replace(/γ̇/g, 'dgamma/dt').replace(/[–—]/g, '-').replace(/²/g, '^2').replace(/⊕/g, 'Earth')
    .replace(/[^\x20-\x7e\xa0-\xff\n]/g, '?')
}

const PAGE = { width: 595.28, height: 841.89, margin: 40 }
const CONTENT_W = PAGE.width - 2 * PAGE.margin

export interface PdfInput { reportId: number; version: number; snapshot: ReportSnapshot; approvals: Approval[]; link: string }

/** Builds the PDF in memory. Pages: summary and tables; data and residuals; phase-folded orbits; periodograms; posterior (when sampled); methods and provenance. */
export async function reportPdf(input: PdfInput): Promise<Buffer> {
  const s = input.snapshot
  const f = loadFonts()
  const doc = new PDFDocument({ size: 'A4', margin: PAGE.margin, info: { Title: latin(`${s.title} (version ${input.version})`), Author: latin(s.frozenBy.name), Creator: `Starsway ${s.product.version}` } })
  doc.registerFont('Roboto', f.regular)
  doc.registerFont('Roboto-Bold', f.bold)
  const chunks: Buffer[] = []
  doc.on('data', (c: Buffer) => chunks.push(c))
  const done = new Promise<void>((resolve, reject) => { doc.on('end', () => resolve()); doc.on('error', reject) })

  const h1 = (t: string) => { doc.font('Roboto-Bold').fontSize(16).text(latin(t)); doc.moveDown(0.3) }
  const h2 = (t: string) => { doc.moveDown(0.5); doc.font('Roboto-Bold').fontSize(11.5).text(latin(t)); doc.moveDown(0.2) }
  const para = (t: string, size = 9.5) => { doc.font('Roboto').fontSize(size).text(latin(t), { width: CONTENT_W }) }
  const table = (header: string[], rows: string[][], widths: number[]) => {
    const x0 = PAGE.margin
    const rowH = 13
    const line = (cells: string[], bold: boolean) => {
      if (doc.y + rowH > PAGE.height - PAGE.margin) doc.addPage()
      const y = doc.y
      let x = x0
      doc.font(bold ? 'Roboto-Bold' : 'Roboto').fontSize(8.5)
      cells.forEach((c, i) => { doc.text(latin(c), x + 2, y, { width: widths[i]! - 4, lineBreak: false, ellipsis: true }); x += widths[i]! })
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
    SVGtoPDF(doc, svg, PAGE.margin, doc.y, { width: CONTENT_W, height, fontCallback: () => 'Roboto' })
    doc.y += height + 8
    doc.x = PAGE.margin
  }

  // ---- page 1: summary and tables
  h1(s.title)
  para(`Report ${input.reportId}, version ${input.version}. Frozen ${s.frozenAt} by ${s.frozenBy.name}. Model "${s.model.name}" version ${s.model.version}. ` +
    `Starsway ${s.product.version}${s.product.commit ? ` (${s.product.commit.slice(0, 12)})` : ''}.`)
  para(`Data hash (SHA-256 of the included measurements and the exclusions): ${s.data.hash}`, 8)
  if (s.data.changedSinceFit) para('Note: the star\'s data changed after this fit (points excluded or restored); the values below are those of the fit as frozen.', 8.5)
  h2('Star')
  table(['Name', 'Mass (M_Sun)', 'Radius (R_Sun)', 'Teff (K)', 'Luminosity (L_Sun)'], [[
    s.star.name, plainValue(s.star.massMsun, s.star.massErrMsun), s.star.radiusRsun === null ? '—' : formatPlain(s.star.radiusRsun, 4),
    s.star.teffK === null ? '—' : formatPlain(s.star.teffK, 5), s.star.luminosityLsun === null ? '—' : formatPlain(s.star.luminosityLsun, 4),
  ]], [135, 95, 95, 85, 105])
  h2('Parameters')
  const sampled = !!s.sampling
  const prow = parameterRows(s)
  table(['Planet', 'Parameter', 'Unit', 'Fit (1 sigma)', ...(sampled ? ['Posterior median (16-84 %)'] : []), 'Kind'],
    prow.map((r) => [r.planet ?? '', r.label, r.unit, plainValue(r.value, r.error), ...(sampled ? [plainInterval(r.median, r.plus, r.minus)] : []), r.kind]),
    sampled ? [40, 150, 45, 105, 115, 60] : [45, 190, 55, 150, 75])
  h2('Instruments')
  table(['Instrument', 'n', 'Offset (m/s)', 'Jitter (m/s)', 'rms (m/s)'],
    instrumentRows(s).map((i) => [i.name, String(i.n), plainValue(i.offset, i.offsetErr), plainValue(i.jitter, i.jitterErr), i.rms === null ? '—' : formatPlain(i.rms, 3)]),
    [135, 45, 120, 120, 95])
  h2('Statistics')
  const st = s.result.stats
  table(['N', 'Parameters', 'chi2', 'Reduced chi2', 'ln L', 'BIC', 'AIC', 'rms (m/s)', 'Status'],
    [[String(st.nPoints), String(st.nParams), st.chi2 === null ? '—' : formatPlain(st.chi2, 5), st.reducedChi2 === null ? '—' : formatPlain(st.reducedChi2, 4),
      st.lnL === null ? '—' : formatPlain(st.lnL, 6), st.bic === null ? '—' : formatPlain(st.bic, 6), st.aic === null ? '—' : formatPlain(st.aic, 6),
      st.rms === null ? '—' : formatPlain(st.rms, 3), st.status]], [35, 55, 55, 60, 60, 65, 65, 55, 65])
  if (s.comparison) {
    h2('Model comparison')
    table(['Model', 'Version', 'Planets', 'Trend', 'BIC', 'Delta BIC', 'Evidence', 'Preferred'],
      s.comparison.rows.map((r) => [r.name, String(r.version), String(r.planets), r.trend, formatPlain(r.bic, 6), r.deltaBic === null ? '—' : formatPlain(r.deltaBic, 3), r.evidence ?? '—', r.preferred ? 'yes' : '']),
      [130, 45, 45, 55, 70, 60, 60, 50])
    para(s.comparison.reading, 8.5)
  }
  if (s.result.warnings.length) { h2('Warnings'); for (const w of s.result.warnings) para(`• ${w.message}`, 8.5) }

  // ---- plots
  doc.addPage()
  h1('Data, model and residuals')
  plot(renderSvg(timeSeriesOption(s), 640, 330), 290)
  plot(renderSvg(residualsOption(s), 640, 300), 260)
  if (s.result.planets.length) {
    doc.addPage()
    h1('Phase-folded orbits')
    s.result.planets.forEach((_, k) => plot(renderSvg(phaseOption(s, k), 640, 300), 260))
  }
  if (s.periodogram || s.residualPeriodogram) {
    doc.addPage()
    h1('Periodograms')
    if (s.periodogram) plot(renderSvg(periodogramOption(s.periodogram, 'Periodogram of the velocities (generalised Lomb-Scargle) with FAP levels'), 640, 300), 260)
    if (s.residualPeriodogram) plot(renderSvg(periodogramOption(s.residualPeriodogram, 'Periodogram of the residuals with FAP levels'), 640, 300), 260)
  }
  const corner = cornerOption(s)
  if (corner && s.sampling) {
    doc.addPage()
    h1('Posterior')
    para(`Ensemble sampler: ${s.sampling.settings.walkers} walkers, ${s.sampling.settings.steps} steps, burn-in ${s.sampling.settings.burn}, thinning ${s.sampling.settings.thin}, seed ${s.sampling.settings.seed}; ` +
      `acceptance ${formatPlain(s.sampling.diagnostics.acceptance, 2)}; ${s.sampling.diagnostics.converged ? 'converged' : 'NOT converged'}.`)
    for (const w of s.sampling.diagnostics.warnings) para(`• ${w}`, 8.5)
    doc.moveDown(0.5)
    plot(renderSvg(corner, 600, 600), CONTENT_W)
  }

  // ---- methods and provenance
  doc.addPage()
  h1('Methods')
  para(s.methods.text, 10)
  h2('References')
  for (const r of s.methods.references) para(r.citation, 9)
  h2('Provenance')
  para(`Included measurements: ${s.data.nIncluded} (${s.data.instruments.join(', ')}); excluded: ${s.data.nExcluded}. Fit: ${s.settings.fit.status}, ${s.settings.fit.iterations} iterations, trend ${s.settings.fit.trend}.`, 9)
  if (s.data.exclusions.length) {
    table(['Measurement', 'Instrument', 'Time (JD)', 'Reason', 'By'],
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

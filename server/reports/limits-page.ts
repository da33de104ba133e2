// Detection limits in a report: the finished run chosen at freezing, frozen into the snapshot (map,
// contours, table, settings, seed and the non-detection sentence), and its PDF page (the map with
// the 50 % and 90 % contours, the sentence and the table).
import type { Services } from '../services.ts'
import type { Star } from '../db/models.ts'
import { ValidationError } from '../errors.ts'
import { loadRun } from '../limits/service.ts'
import type { ReportSnapshot, SnapshotLimits } from '../../shared/api/reports.ts'
import { limitsChartOption, nonDetectionSentence } from '../../shared/report/limits.ts'
import { renderSvg } from './charts.ts'
import type { Option } from '../../shared/report/chart-options.ts'

/** A succeeded detection-limit run of this star (400 naming limitsRunId otherwise). */
export async function limitsSnapshot(s: Services, star: Star, runId: number): Promise<SnapshotLimits> {
  const run = await loadRun(s, runId)
  if (!run || run.starId !== star.id) throw new ValidationError('limitsRunId: this star has no detection-limit run with that id.', 'limitsRunId')
  if (run.state !== 'succeeded' || !run.result) throw new ValidationError(`limitsRunId: that run has not succeeded (it is ${run.state}); wait for it or freeze without it.`, 'limitsRunId')
  return {
    runId: run.id, seed: run.seed, settings: run.settings, modelId: run.modelId, modelVersion: run.modelVersion, finishedAt: run.finishedAt,
    result: run.result, sentence: nonDetectionSentence(run.result, run.settings, run.seed),
  }
}

/** What the limits page needs of the PDF's layout helpers (server/reports/pdf.ts). */
export interface PageTools {
  newPage(): void
  h1(t: string): void
  para(t: string, size?: number): void
  plot(svg: string, height: number): void
  table(header: string[], rows: string[][], widths: number[]): void
}

const m = (v: number | null) => (v === null ? 'not reached' : v >= 100 ? v.toFixed(0) : v.toPrecision(3))

/** The PDF page of the frozen limits, when the version has them. */
export function limitsPage(s: ReportSnapshot, t: PageTools): void {
  const l = s.limits
  if (!l) return
  t.newPage()
  t.h1('Detection limits')
  t.para(`${l.sentence} Computed on the residuals of model ${l.modelId ?? '—'} version ${l.modelVersion ?? '—'} (detection-limit run ${l.runId}).`, 9.5)
  t.plot(renderSvg(limitsChartOption(l.result, { still: true, fontFamily: 'Body' }) as Option, 640, 420), 360)
  t.para('Cells are coloured by the recovered fraction (white 0 %, blue 100 %); solid line 50 %, dashed line 90 % completeness; the model\'s planets and the Solar System\'s giants (at this star\'s mass) are marked.', 8.5)
  t.table(['Periods (d)', 'M sin i, 50 % (M⊕)', 'M sin i, 90 % (M⊕)', 'Mean completeness'],
    l.result.table.map((r) => [`${r.from}–${r.to}`, m(r.mass50Earth), m(r.mass90Earth), `${(100 * r.meanCompleteness).toFixed(0)} %`]), [110, 120, 120, 110])
}

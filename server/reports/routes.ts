import type { Request, Response } from 'express'
import type { Services } from '../services.ts'
import { routeId, scope, signedInUser } from '../guards.ts'
import { analysisScope } from '../analyses/guards.ts'
import { freezeRequestSchema, reviewRequestSchema, shareRequestSchema } from '../../shared/api/reports.ts'
import { latexTables } from '../../shared/report/latex-solution.ts'
import { reportScope } from './guards.ts'
import * as reports from './service.ts'
import { reportCsv, reportEcsv } from './csv.ts'
import { reportJson } from './json.ts'
import { pdfOffLoop } from './pdf-off-loop.ts'

export async function freeze(req: Request, res: Response, s: Services): Promise<void> {
  const input = freezeRequestSchema.parse(req.body ?? {})
  const out = await reports.freeze(s, signedInUser(res), scope(res).star!, analysisScope(res).model!, input)
  res.status(out.created ? 201 : 200).json(out)
}

export async function list(_req: Request, res: Response, s: Services): Promise<void> {
  res.json(await reports.listReports(s, scope(res).star!))
}

export async function show(_req: Request, res: Response, s: Services): Promise<void> {
  res.json(await reports.reportDetail(s, reportScope(res).id, signedInUser(res), scope(res).membership.role))
}

const versionOf = (req: Request): number => routeId(req, 'version', 'Report version')

export async function showVersion(req: Request, res: Response, s: Services): Promise<void> {
  res.json(await reports.loadVersion(s, reportScope(res), versionOf(req)))
}

const fileName = (title: string, version: number, ext: string) =>
  `${title.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 80) || 'report'}-v${version}.${ext}`

export async function pdf(req: Request, res: Response, s: Services): Promise<void> {
  const report = reportScope(res)
  const v = await reports.loadVersion(s, report, versionOf(req))
  const detail = await reports.reportDetail(s, report.id, signedInUser(res), scope(res).membership.role)
  const approvals = detail.versions.find((x) => x.version === v.version)?.approvals ?? []
  const bytes = await pdfOffLoop({ reportId: report.id, version: v.version, snapshot: v.snapshot, approvals, link: reports.reportLink(s, report.id) })
  res.type('application/pdf').set('Content-Disposition', `inline; filename="${fileName(report.title, v.version, 'pdf')}"`).send(bytes)
}

export async function latex(req: Request, res: Response, s: Services): Promise<void> {
  const v = await reports.loadVersion(s, reportScope(res), versionOf(req))
  res.type('text/plain; charset=utf-8').send(latexTables(v.snapshot))
}

export async function csv(req: Request, res: Response, s: Services): Promise<void> {
  const report = reportScope(res)
  const v = await reports.loadVersion(s, report, versionOf(req))
  res.type('text/csv; charset=utf-8').set('Content-Disposition', `attachment; filename="${fileName(report.title, v.version, 'csv')}"`).send(reportCsv(v.snapshot))
}

export async function ecsv(req: Request, res: Response, s: Services): Promise<void> {
  const report = reportScope(res)
  const v = await reports.loadVersion(s, report, versionOf(req))
  res.type('text/plain; charset=utf-8').set('Content-Disposition', `attachment; filename="${fileName(report.title, v.version, 'ecsv')}"`).send(reportEcsv(v.snapshot))
}

export async function json(req: Request, res: Response, s: Services): Promise<void> {
  const report = reportScope(res)
  const v = await reports.loadVersion(s, report, versionOf(req))
  res.set('Content-Disposition', `attachment; filename="${fileName(report.title, v.version, 'json')}"`).json(reportJson(v.snapshot, report.id, v.version))
}

export async function share(req: Request, res: Response, s: Services): Promise<void> {
  const input = shareRequestSchema.parse(req.body)
  const team = await s.models.Team.findByPk(scope(res).membership.teamId)
  res.status(201).json(await reports.share(s, signedInUser(res), team!, reportScope(res), input))
}

export async function reviewReport(req: Request, res: Response, s: Services): Promise<void> {
  const input = reviewRequestSchema.parse(req.body)
  res.status(201).json(await reports.review(s, signedInUser(res), scope(res).membership, reportScope(res), input))
}

import type { Request, Response } from 'express'
import type { Services } from './services.ts'
import { dataset, devOnly, files, loginAddressLimit, loginLimit, measurement, resetLimit, shareLimit, signedIn, star, team, type Guard } from './guards.ts'
import * as auth from './auth/routes.ts'
import * as teams from './teams/routes.ts'
import * as stars from './stars/routes.ts'
import * as uploads from './uploads/routes.ts'
import * as measurements from './measurements/routes.ts'
import * as audit from './audit/routes.ts'
import * as dev from './dev/routes.ts'
import * as sampling from './sampling/routes.ts'
import * as analyses from './analyses/routes.ts'
import { fitModel, periodogramRun } from './analyses/guards.ts'
import * as reports from './reports/routes.ts'
import { report } from './reports/guards.ts'
import * as openapi from './openapi/routes.ts'
import * as tokens from './tokens/routes.ts'
import * as limits from './limits/routes.ts'
import * as plan from './plan/routes.ts'
import * as triage from './triage/routes.ts'

export type Handler = (req: Request, res: Response, s: Services) => Promise<void> | void
export interface Route { method: 'get' | 'post' | 'patch' | 'delete'; path: string; guards: Guard[]; handler: Handler }

/**
 * Every route of the API, with who may call it. `team(role)`, `star(role)`, `dataset(role)` and
 * `measurement(role)` answer 401 when signed out, 404 outside the user's teams and 403 below `role`.
 */
export const routes: Route[] = [
  { method: 'get', path: '/api/health', guards: [], handler: dev.health },
  { method: 'get', path: '/api/health/ready', guards: [], handler: dev.ready },
  { method: 'get', path: '/api/openapi.json', guards: [], handler: (req, res) => openapi.openApiJson(req, res) },
  { method: 'get', path: '/api/docs', guards: [], handler: (req, res) => openapi.docsPage(req, res) },

  { method: 'post', path: '/api/auth/register', guards: [], handler: auth.register },
  { method: 'post', path: '/api/auth/login', guards: [loginAddressLimit, loginLimit], handler: auth.login },
  { method: 'post', path: '/api/auth/logout', guards: [], handler: auth.logout },
  { method: 'get', path: '/api/auth/me', guards: [signedIn], handler: auth.me },
  { method: 'post', path: '/api/auth/password', guards: [signedIn], handler: auth.changePassword },
  { method: 'post', path: '/api/auth/reset-request', guards: [resetLimit], handler: auth.resetRequest },
  { method: 'post', path: '/api/auth/reset', guards: [resetLimit], handler: auth.reset },

  { method: 'get', path: '/api/teams', guards: [signedIn], handler: teams.list },
  { method: 'post', path: '/api/teams', guards: [signedIn], handler: teams.create },
  { method: 'get', path: '/api/teams/:teamId', guards: [team('reviewer')], handler: teams.show },
  { method: 'patch', path: '/api/teams/:teamId/members/:userId', guards: [team('owner')], handler: teams.updateMember },
  { method: 'delete', path: '/api/teams/:teamId/members/:userId', guards: [team('owner')], handler: teams.removeMember },
  { method: 'get', path: '/api/teams/:teamId/invitations', guards: [team('owner')], handler: teams.listInvitations },
  { method: 'post', path: '/api/teams/:teamId/invitations', guards: [team('owner')], handler: teams.invite },
  { method: 'post', path: '/api/teams/:teamId/invitations/:invitationId/approve', guards: [team('owner')], handler: teams.approveInvitation },
  { method: 'delete', path: '/api/teams/:teamId/invitations/:invitationId', guards: [team('owner')], handler: teams.revokeInvitation },
  { method: 'get', path: '/api/teams/:teamId/tokens', guards: [team('reviewer')], handler: tokens.list },
  { method: 'post', path: '/api/teams/:teamId/tokens', guards: [team('reviewer')], handler: tokens.create },
  { method: 'delete', path: '/api/teams/:teamId/tokens/:tokenId', guards: [team('reviewer')], handler: tokens.revoke },
  { method: 'get', path: '/api/invitations/:token', guards: [], handler: teams.showInvitation },
  { method: 'post', path: '/api/invitations/:token/accept', guards: [signedIn], handler: teams.acceptInvitation },

  { method: 'get', path: '/api/teams/:teamId/stars', guards: [team('reviewer')], handler: stars.list },
  { method: 'post', path: '/api/teams/:teamId/stars', guards: [team('analyst')], handler: stars.create },
  { method: 'get', path: '/api/stars/:starId', guards: [star('reviewer')], handler: stars.show },
  { method: 'patch', path: '/api/stars/:starId', guards: [star('analyst')], handler: stars.update },
  { method: 'delete', path: '/api/stars/:starId', guards: [star('owner')], handler: stars.archive },
  { method: 'get', path: '/api/teams/:teamId/stars/archived', guards: [team('reviewer')], handler: stars.listArchived },
  { method: 'post', path: '/api/teams/:teamId/stars/:starId/restore', guards: [team('owner')], handler: stars.restore },

  { method: 'post', path: '/api/stars/:starId/uploads/preview', guards: [star('analyst'), files], handler: uploads.preview },
  { method: 'post', path: '/api/stars/:starId/uploads/commit', guards: [star('analyst'), files], handler: uploads.commit },
  { method: 'get', path: '/api/stars/:starId/datasets', guards: [star('reviewer')], handler: uploads.listDatasets },
  { method: 'get', path: '/api/datasets/:datasetId/raw', guards: [dataset('reviewer')], handler: uploads.raw },

  { method: 'get', path: '/api/stars/:starId/measurements', guards: [star('reviewer')], handler: measurements.list },
  { method: 'patch', path: '/api/measurements/:measurementId', guards: [measurement('analyst')], handler: measurements.update },
  { method: 'get', path: '/api/datasets/:datasetId/usage', guards: [dataset('reviewer')], handler: measurements.datasetUsage },
  { method: 'delete', path: '/api/datasets/:datasetId', guards: [dataset('analyst')], handler: measurements.deleteDataset },

  { method: 'get', path: '/api/teams/:teamId/audit', guards: [team('reviewer')], handler: audit.list },

  { method: 'post', path: '/api/stars/:starId/periodograms', guards: [star('analyst')], handler: analyses.runPeriodogram },
  { method: 'get', path: '/api/stars/:starId/periodograms', guards: [star('reviewer')], handler: analyses.listPeriodograms },
  { method: 'get', path: '/api/periodograms/:periodogramId', guards: [periodogramRun('reviewer')], handler: analyses.showPeriodogram },
  { method: 'get', path: '/api/stars/:starId/models/compare', guards: [star('reviewer')], handler: analyses.compare },
  { method: 'get', path: '/api/stars/:starId/models', guards: [star('reviewer')], handler: analyses.listModels },
  { method: 'post', path: '/api/stars/:starId/models', guards: [star('analyst')], handler: analyses.createModel },
  { method: 'get', path: '/api/models/:modelId', guards: [fitModel('reviewer')], handler: analyses.showModel },
  { method: 'get', path: '/api/models/:modelId/versions/:version', guards: [fitModel('reviewer')], handler: analyses.showVersion },
  { method: 'patch', path: '/api/models/:modelId', guards: [fitModel('analyst')], handler: analyses.updateModel },
  { method: 'post', path: '/api/models/:modelId/fit', guards: [fitModel('analyst')], handler: analyses.fitModel },
  { method: 'post', path: '/api/models/:modelId/duplicate', guards: [fitModel('analyst')], handler: analyses.duplicateModel },
  { method: 'delete', path: '/api/models/:modelId', guards: [fitModel('analyst')], handler: analyses.archiveModel },
  { method: 'post', path: '/api/models/:modelId/overrule', guards: [fitModel('analyst')], handler: analyses.overrule },
  { method: 'post', path: '/api/models/:modelId/gp-variant', guards: [fitModel('analyst')], handler: analyses.gpVariant },
  { method: 'post', path: '/api/stars/:starId/search', guards: [star('analyst')], handler: analyses.search },

  { method: 'post', path: '/api/models/:modelId/sampling', guards: [fitModel('analyst')], handler: sampling.start },
  { method: 'get', path: '/api/models/:modelId/sampling/estimate', guards: [fitModel('reviewer')], handler: sampling.estimate },
  { method: 'get', path: '/api/stars/:starId/sampling', guards: [star('reviewer')], handler: sampling.list },
  { method: 'get', path: '/api/sampling/:runId', guards: [sampling.samplingRunGuard('reviewer')], handler: sampling.show },
  { method: 'get', path: '/api/sampling/:runId/events', guards: [sampling.samplingRunGuard('reviewer')], handler: sampling.events },
  { method: 'post', path: '/api/sampling/:runId/cancel', guards: [sampling.samplingRunGuard('analyst')], handler: sampling.cancel },
  { method: 'get', path: '/api/sampling/:runId/chain.csv', guards: [sampling.samplingRunGuard('reviewer')], handler: sampling.chain },

  { method: 'post', path: '/api/models/:modelId/limits', guards: [fitModel('analyst')], handler: limits.start },
  { method: 'get', path: '/api/stars/:starId/limits', guards: [star('reviewer')], handler: limits.list },
  { method: 'get', path: '/api/limits/:runId', guards: [limits.limitsRunGuard('reviewer')], handler: limits.show },
  { method: 'post', path: '/api/limits/:runId/cancel', guards: [limits.limitsRunGuard('analyst')], handler: limits.cancel },
  { method: 'post', path: '/api/limits/:runId/resume', guards: [limits.limitsRunGuard('analyst')], handler: limits.resume },
  { method: 'post', path: '/api/stars/:starId/plan', guards: [star('reviewer')], handler: plan.plan },

  { method: 'post', path: '/api/teams/:teamId/survey/upload', guards: [team('analyst'), triage.surveyFiles], handler: triage.upload },
  { method: 'post', path: '/api/teams/:teamId/survey/runs', guards: [team('analyst')], handler: triage.start },
  { method: 'get', path: '/api/teams/:teamId/survey', guards: [team('reviewer')], handler: triage.table },
  { method: 'get', path: '/api/teams/:teamId/survey/queue', guards: [team('owner')], handler: triage.queue },

  { method: 'post', path: '/api/models/:modelId/report', guards: [fitModel('analyst')], handler: reports.freeze },
  { method: 'get', path: '/api/stars/:starId/reports', guards: [star('reviewer')], handler: reports.list },
  { method: 'get', path: '/api/reports/:reportId', guards: [report('reviewer')], handler: reports.show },
  { method: 'get', path: '/api/reports/:reportId/versions/:version', guards: [report('reviewer')], handler: reports.showVersion },
  { method: 'get', path: '/api/reports/:reportId/versions/:version/pdf', guards: [report('reviewer')], handler: reports.pdf },
  { method: 'get', path: '/api/reports/:reportId/versions/:version/latex', guards: [report('reviewer')], handler: reports.latex },
  { method: 'get', path: '/api/reports/:reportId/versions/:version/csv', guards: [report('reviewer')], handler: reports.csv },
  { method: 'get', path: '/api/reports/:reportId/versions/:version/ecsv', guards: [report('reviewer')], handler: reports.ecsv },
  { method: 'get', path: '/api/reports/:reportId/versions/:version/json', guards: [report('reviewer')], handler: reports.json },
  { method: 'post', path: '/api/reports/:reportId/shares', guards: [report('analyst'), shareLimit], handler: reports.share },
  { method: 'post', path: '/api/reports/:reportId/reviews', guards: [report('reviewer')], handler: reports.reviewReport },

  { method: 'get', path: '/api/dev/mail', guards: [devOnly, signedIn], handler: dev.mailJson },
  { method: 'get', path: '/dev/mail', guards: [devOnly, signedIn], handler: dev.mailPage },
]

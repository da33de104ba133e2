// Reports: freezing a fitted model version into an immutable report version, reading versions,
// sharing with co-authors by e-mail, comments, change requests and approvals (all audited).
import { QueryTypes } from 'sequelize'
import type { Services } from '../services.ts'
import type { Membership, Star, Team, User } from '../db/models.ts'
import type { FitModel } from '../db/models-analysis.ts'
import { reportModels, type Report, type ReportReview, type ReportVersion as ReportVersionRow } from '../db/models-reports.ts'
import { ConflictError, ForbiddenError, NotFoundError, ValidationError } from '../errors.ts'
import { record } from '../audit/service.ts'
import { inviteOrRequest } from '../teams/service.ts'
import { ROLE_RANK, type Role } from '../../shared/api/common.ts'
import { diffSnapshots, snapshotFingerprint } from '../../shared/report/diff.ts'
import { parameterRows } from '../../shared/report/table.ts'
import { buildSnapshot } from './snapshot.ts'
import { limitsSnapshot } from './limits-page.ts'
import type {
  Approval, FreezeRequest, ReportDetail, ReportSummary, ReportVersion, ReportVersionItem, Review, ReviewRequest, Share, ShareRequest,
} from '../../shared/api/reports.ts'
import { reviewRequestSchema } from '../../shared/api/reports.ts'

const R = (s: Services) => reportModels(s.sequelize, s.models)
const ref = (u: User | null | undefined) => (u ? { id: u.id, name: u.name } : null)
const iso = (d: Date) => new Date(d).toISOString()
const userAttrs = ['id', 'name', 'email']

export function reportLink(s: Services, reportId: number): string {
  return `${s.config.appUrl}/reports/${reportId}`
}

/**
 * Freezes the model's current (fitted) version, with a sampling run of it when given, into the
 * model's report: version 1 the first time, version n+1 when the data, the model version, the
 * sampling run or the periodograms differ from version n (with what changed), and the latest
 * version unchanged (created: false) when nothing did.
 */
export async function freeze(s: Services, actor: User, star: Star, model: FitModel, req: FreezeRequest): Promise<ReportDetail & { created: boolean }> {
  const existing = await R(s).Report.findOne({ where: { modelId: model.id } })
  const title = req.title ?? existing?.title ?? `${star.name}: ${model.name}`
  const snapshot = await buildSnapshot(s, actor, star, model, title, req.samplingRunId)
  snapshot.limits = req.limitsRunId !== undefined ? await limitsSnapshot(s, star, req.limitsRunId) : null // server/reports/limits-page.ts
  const fingerprint = snapshotFingerprint(snapshot) + (snapshot.limits ? `|limits ${snapshot.limits.runId}` : '')
  const out = await s.sequelize.transaction(async (transaction) => {
    let report = existing ? await R(s).Report.findByPk(existing.id, { transaction, lock: transaction.LOCK.UPDATE }) : null
    let prev: ReportVersionRow | null = null
    if (report) {
      prev = await R(s).ReportVersion.findOne({ where: { reportId: report.id, version: report.currentVersion }, transaction })
      if (prev && prev.fingerprint === fingerprint) return { report, created: false }
    } else {
      report = await R(s).Report.create({ starId: star.id, modelId: model.id, title, currentVersion: 0, createdBy: actor.id }, { transaction })
    }
    const version = (prev?.version ?? 0) + 1
    const changes = prev ? diffSnapshots(prev.snapshot, snapshot) : []
    await R(s).ReportVersion.create({
      reportId: report.id, version, modelVersionId: snapshot.model.versionId, samplingRunId: snapshot.sampling?.runId ?? null,
      dataHash: snapshot.data.hash, fingerprint, snapshot, changes, frozenBy: actor.id,
    }, { transaction })
    report.currentVersion = version
    report.title = title
    await report.save({ transaction })
    await record(s, {
      teamId: star.teamId, userId: actor.id, action: 'report.freeze', entity: 'report', entityId: report.id,
      detail: { starId: star.id, modelId: model.id, modelVersion: snapshot.model.version, version, dataHash: snapshot.data.hash, samplingRunId: snapshot.sampling?.runId ?? null, changes: changes.map((c) => c.field) },
    }, transaction)
    return { report, created: true }
  })
  const membership = await s.models.Membership.findOne({ where: { userId: actor.id, teamId: star.teamId } })
  return { ...(await reportDetail(s, out.report.id, actor, membership!.role)), created: out.created }
}

function approvalsOf(reviews: ReportReview[], version: number): Approval[] {
  const latest = new Map<number, ReportReview>()
  for (const r of reviews) {
    if (r.version !== version || r.kind === 'comment' || r.userId === null) continue
    const had = latest.get(r.userId)
    if (!had || had.createdAt <= r.createdAt) latest.set(r.userId, r)
  }
  return [...latest.values()].map((r) => ({ version, user: ref(r.user)!, decision: r.kind as Approval['decision'], at: iso(r.createdAt) }))
}

export async function reportDetail(s: Services, id: number, viewer: User, role: Role): Promise<ReportDetail> {
  const report = await R(s).Report.findByPk(id, { include: [{ model: s.models.User, as: 'creator', attributes: userAttrs }] })
  if (!report) throw new NotFoundError('Report')
  const star = await s.models.Star.findByPk(report.starId)
  const versions = await R(s).ReportVersion.findAll({
    where: { reportId: id }, order: [['version', 'ASC']], attributes: { exclude: ['snapshot'] },
    include: [{ model: s.models.User, as: 'frozenByUser', attributes: userAttrs }],
  })
  const shares = await R(s).ReportShare.findAll({
    where: { reportId: id }, order: [['createdAt', 'ASC'], ['id', 'ASC']],
    include: [{ model: s.models.User, as: 'user', attributes: userAttrs }, { model: s.models.User, as: 'sharer', attributes: userAttrs }],
  })
  const reviews = await R(s).ReportReview.findAll({ where: { reportId: id }, order: [['createdAt', 'ASC'], ['id', 'ASC']], include: [{ model: s.models.User, as: 'user', attributes: userAttrs }] })
  const items: ReportVersionItem[] = versions.map((v) => ({
    id: v.id, version: v.version, modelVersion: 0, dataHash: v.dataHash, samplingRunId: v.samplingRunId,
    frozenBy: ref(v.frozenByUser), createdAt: iso(v.createdAt), changes: v.changes, approvals: approvalsOf(reviews, v.version),
  }))
  // model version numbers live in the snapshot; read just that field
  const mv = await s.sequelize.query<{ version: number; mv: number }>(
    `SELECT version, (snapshot->'model'->>'version')::int AS mv FROM report_versions WHERE report_id = :id`, { replacements: { id }, type: QueryTypes.SELECT },
  )
  for (const it of items) it.modelVersion = mv.find((x) => x.version === it.version)?.mv ?? 0
  const analyst = ROLE_RANK[role] >= ROLE_RANK.analyst
  const current = versions.find((v) => v.version === report.currentVersion)
  return {
    id: report.id, teamId: star?.teamId ?? 0, starId: report.starId, starName: star?.name ?? '', modelId: report.modelId, title: report.title, currentVersion: report.currentVersion,
    createdBy: ref(report.creator), createdAt: iso(report.createdAt),
    versions: items,
    shares: shares.map((sh): Share => ({ id: sh.id, user: ref(sh.user), email: sh.email, invited: sh.invitationId !== null, sharedBy: ref(sh.sharer), version: sh.version, createdAt: iso(sh.createdAt) })),
    reviews: reviews.map(reviewJson),
    can: { freeze: analyst, share: analyst, review: true, approve: current ? current.frozenBy !== viewer.id : false },
  }
}

function reviewJson(r: ReportReview): Review {
  return { id: r.id, version: r.version, kind: r.kind, parameter: r.parameter, body: r.body, user: ref(r.user), createdAt: iso(r.createdAt) }
}

export async function listReports(s: Services, star: Star): Promise<ReportSummary[]> {
  const reports = await R(s).Report.findAll({ where: { starId: star.id }, order: [['updatedAt', 'DESC'], ['id', 'DESC']], include: [{ model: s.models.User, as: 'creator', attributes: userAttrs }] })
  if (!reports.length) return []
  const reviews = await R(s).ReportReview.findAll({ where: { reportId: reports.map((r) => r.id) }, include: [{ model: s.models.User, as: 'user', attributes: userAttrs }] })
  return reports.map((r) => {
    const mine = reviews.filter((x) => x.reportId === r.id)
    const approved = [...new Set(mine.map((x) => x.version))].filter((v) => approvalsOf(mine, v).some((a) => a.decision === 'approve')).sort((a, b) => a - b)
    return { id: r.id, modelId: r.modelId, title: r.title, currentVersion: r.currentVersion, createdBy: ref(r.creator), updatedAt: iso(r.updatedAt), approvedVersions: approved }
  })
}

export async function loadVersion(s: Services, report: Report, version: number): Promise<ReportVersion> {
  const v = await R(s).ReportVersion.findOne({ where: { reportId: report.id, version } })
  if (!v) throw new NotFoundError('Report version')
  return { reportId: report.id, version: v.version, snapshot: v.snapshot, changes: v.changes, createdAt: iso(v.createdAt) }
}

/**
 * Shares the report's current version with a team member (by id or e-mail) or with an outside
 * address, which is invited to the team as a reviewer through the invitations service (its own
 * e-mail). Every recipient gets an e-mail with the report's link.
 */
export async function share(s: Services, actor: User, team: Team, report: Report, req: ShareRequest): Promise<Share> {
  let user: User | null = null
  let invitationId: number | null = null
  /** The invitation waits for an owner's approval (an analyst shared): no invitation e-mail yet. */
  let awaitingOwner = false
  if (req.userId !== undefined) {
    user = await s.models.User.findByPk(req.userId)
    const m = user ? await s.models.Membership.findOne({ where: { userId: user.id, teamId: team.id } }) : null
    if (!user || !m) throw new ValidationError('userId: that person is not a member of the team; share by e-mail address to invite them as a reviewer.', 'userId')
  } else {
    const email = req.email!
    user = await s.models.User.findOne({ where: { email } })
    const m = user ? await s.models.Membership.findOne({ where: { userId: user.id, teamId: team.id } }) : null
    if (!m) {
      user = null
      const open = await s.models.Invitation.findOne({ where: { teamId: team.id, email, acceptedAt: null } })
      const inv = open && open.expiresAt > new Date() ? { id: open.id, pendingApproval: !!open.pendingApproval } : await inviteOrRequest(s, actor, team, email, 'reviewer')
      invitationId = inv.id
      awaitingOwner = inv.pendingApproval
    }
  }
  if (user && user.id === actor.id) throw new ValidationError('userId: you cannot share a report with yourself.', 'userId')
  const email = user ? user.email : req.email!
  const created = await s.sequelize.transaction(async (transaction) => {
    const sh = await R(s).ReportShare.create({ reportId: report.id, userId: user?.id ?? null, email, invitationId, version: report.currentVersion, sharedBy: actor.id }, { transaction })
    await record(s, {
      teamId: team.id, userId: actor.id, action: 'report.share', entity: 'report', entityId: report.id,
      detail: { version: report.currentVersion, userId: user?.id ?? null, email, invited: invitationId !== null },
    }, transaction)
    return sh
  })
  const link = reportLink(s, report.id)
  await s.mailer.send({
    to: email,
    subject: `${actor.name} shares the report "${report.title}" (version ${report.currentVersion}) with you`,
    text: `Hello${user ? ` ${user.name}` : ''},\n\n${actor.name} asks you to review the report "${report.title}", version ${report.currentVersion}, on Starsway.\n` +
      (req.message ? `\n${req.message}\n` : '') +
      (invitationId === null ? ''
        : awaitingOwner
          ? `\nTo open it you need to join the team "${team.name}" as a reviewer. An owner of the team has been asked to approve that; when they do, you will get an invitation in a separate e-mail: accept it, then open the report.\n`
          : `\nYou are invited to the team "${team.name}" as a reviewer in a separate e-mail: accept that invitation first, then open the report.\n`) +
      `\nOpen the report to read it, download the PDF, comment and approve or request changes:\n\n${link}\n`,
  })
  return { id: created.id, user: ref(user), email, invited: invitationId !== null, sharedBy: ref(actor), version: created.version, createdAt: iso(created.createdAt) }
}

/**
 * A comment (on the report or on one parameter), a change request or an approval of one version.
 * The person who froze a version does not approve it; the report's author is e-mailed.
 */
export async function review(s: Services, actor: User, membership: Membership, report: Report, input: ReviewRequest): Promise<Review> {
  const req = reviewRequestSchema.parse(input)
  const v = await R(s).ReportVersion.findOne({ where: { reportId: report.id, version: req.version } })
  if (!v) throw new ValidationError(`version: the report has versions 1 to ${report.currentVersion}.`, 'version')
  if (req.kind !== 'comment' && v.frozenBy === actor.id) {
    throw new ForbiddenError('You froze this version: another co-author approves it or requests changes.')
  }
  if (req.kind !== 'comment' && req.version !== report.currentVersion) {
    throw new ConflictError(`version: only the current version (${report.currentVersion}) can be approved or sent back; an approval does not carry over between versions.`, 'version')
  }
  if (req.parameter) {
    const keys = [...parameterRows(v.snapshot).map((r) => r.key), ...v.snapshot.result.instruments.flatMap((i) => [`${i.name}.offset`, `${i.name}.jitter`])]
    if (!keys.includes(req.parameter)) throw new ValidationError(`parameter: no parameter "${req.parameter}" in version ${v.version} (e.g. ${keys.slice(0, 4).join(', ')}).`, 'parameter')
  }
  const row = await s.sequelize.transaction(async (transaction) => {
    const r = await R(s).ReportReview.create({ reportId: report.id, version: req.version, userId: actor.id, kind: req.kind, parameter: req.parameter ?? null, body: req.body }, { transaction })
    await record(s, {
      teamId: membership.teamId, userId: actor.id, action: `report.${req.kind === 'request_changes' ? 'request_changes' : req.kind}`, entity: 'report', entityId: report.id,
      detail: { version: req.version, parameter: req.parameter ?? null, reviewId: r.id },
    }, transaction)
    return r
  })
  const authors = new Set([report.createdBy, v.frozenBy].filter((x): x is number => x !== null && x !== actor.id))
  const what = req.kind === 'approve' ? 'approved' : req.kind === 'request_changes' ? 'requested changes to' : 'commented on'
  for (const id of authors) {
    const author = await s.models.User.findByPk(id)
    if (!author) continue
    await s.mailer.send({
      to: author.email,
      subject: `${actor.name} ${what} "${report.title}" (version ${req.version})`,
      text: `Hello ${author.name},\n\n${actor.name} ${what} version ${req.version} of the report "${report.title}"` +
        `${req.parameter ? ` (about ${req.parameter})` : ''}.\n${req.body ? `\n${req.body}\n` : ''}\n${reportLink(s, report.id)}\n`,
    })
  }
  row.user = actor
  return reviewJson(row)
}

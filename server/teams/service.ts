import { Op, UniqueConstraintError, type Transaction } from 'sequelize'
import type { Services } from '../services.ts'
import type { Invitation, Membership, Team, User } from '../db/models.ts'
import { ConflictError, ForbiddenError, NotFoundError, ValidationError } from '../errors.ts'
import type { Role } from '../../shared/api/common.ts'
import type {
  AcceptInvitationResponse, Invitation as InvitationJson, Member, PublicInvitation, TeamDetail, TeamSummary,
} from '../../shared/api/teams.ts'
import { hashToken, newToken } from '../auth/tokens.ts'
import { record } from '../audit/service.ts'

const INVITE_DAYS = 7

export async function listTeams(s: Services, user: User): Promise<TeamSummary[]> {
  const ms = await s.models.Membership.findAll({
    where: { userId: user.id }, include: [{ model: s.models.Team, as: 'team' }], order: [['teamId', 'ASC']],
  })
  return ms.map((m) => ({ id: m.teamId, name: m.team!.name, role: m.role }))
}

export async function createTeam(s: Services, user: User, name: string): Promise<TeamSummary> {
  return s.sequelize.transaction(async (transaction) => {
    const team = await s.models.Team.create({ name }, { transaction })
    await s.models.Membership.create({ userId: user.id, teamId: team.id, role: 'owner' }, { transaction })
    await record(s, { teamId: team.id, userId: user.id, action: 'team.create', entity: 'team', entityId: team.id, detail: { name } }, transaction)
    return { id: team.id, name: team.name, role: 'owner' as const }
  })
}

function memberJson(m: Membership): Member {
  return { userId: m.userId, name: m.user!.name, email: m.user!.email, role: m.role, joinedAt: m.createdAt.toISOString() }
}

export async function teamDetail(s: Services, team: Team, role: Role): Promise<TeamDetail> {
  const ms = await s.models.Membership.findAll({
    where: { teamId: team.id }, include: [{ model: s.models.User, as: 'user' }], order: [['createdAt', 'ASC'], ['id', 'ASC']],
  })
  return { id: team.id, name: team.name, role, members: ms.map(memberJson) }
}

async function memberOf(s: Services, teamId: number, userId: number, transaction: Transaction): Promise<Membership> {
  const m = await s.models.Membership.findOne({
    where: { teamId, userId }, include: [{ model: s.models.User, as: 'user' }], transaction, lock: { level: transaction.LOCK.UPDATE, of: s.models.Membership },
  })
  if (!m) throw new NotFoundError('Member')
  return m
}

async function otherOwners(s: Services, teamId: number, userId: number, transaction: Transaction): Promise<number> {
  return s.models.Membership.count({ where: { teamId, role: 'owner', userId: { [Op.ne]: userId } }, transaction })
}

/**
 * Serialises changes of one team's members and invitations: the team row is locked (FOR UPDATE)
 * until the transaction ends, so two owners demoting each other at the same moment run one after
 * the other and the second sees the first's result. Then re-checks that the actor is still an
 * owner (the route's guard ran before the lock).
 */
async function lockTeamAsOwner(s: Services, actor: User, teamId: number, transaction: Transaction): Promise<void> {
  const team = await s.models.Team.findByPk(teamId, { transaction, lock: transaction.LOCK.UPDATE })
  if (!team) throw new NotFoundError('Team')
  const mine = await s.models.Membership.findOne({ where: { teamId, userId: actor.id }, transaction })
  if (!mine || mine.role !== 'owner') throw new ForbiddenError('You are no longer an owner of this team: reload the page.')
}

export async function changeRole(s: Services, actor: User, teamId: number, userId: number, role: Role): Promise<Member> {
  return s.sequelize.transaction(async (transaction) => {
    await lockTeamAsOwner(s, actor, teamId, transaction)
    const m = await memberOf(s, teamId, userId, transaction)
    if (m.role === 'owner' && role !== 'owner' && (await otherOwners(s, teamId, userId, transaction)) === 0) {
      throw new ConflictError('A team needs at least one owner: make someone else owner first.', 'role')
    }
    const from = m.role
    m.role = role
    await m.save({ transaction })
    await record(s, { teamId, userId: actor.id, action: 'member.role', entity: 'user', entityId: userId, detail: { from, to: role } }, transaction)
    return memberJson(m)
  })
}

export async function removeMember(s: Services, actor: User, teamId: number, userId: number): Promise<void> {
  await s.sequelize.transaction(async (transaction) => {
    await lockTeamAsOwner(s, actor, teamId, transaction)
    const m = await memberOf(s, teamId, userId, transaction)
    if (m.role === 'owner' && (await otherOwners(s, teamId, userId, transaction)) === 0) {
      throw new ConflictError('A team needs at least one owner: make someone else owner first.')
    }
    await m.destroy({ transaction })
    await record(s, { teamId, userId: actor.id, action: 'member.remove', entity: 'user', entityId: userId, detail: { role: m.role, email: m.user!.email } }, transaction)
  })
}

function invitationJson(i: Invitation): InvitationJson {
  return {
    id: i.id, email: i.email, role: i.role, expiresAt: i.expiresAt.toISOString(), acceptedAt: i.acceptedAt?.toISOString() ?? null,
    pendingApproval: i.pendingApproval ?? false,
  }
}

export async function listInvitations(s: Services, teamId: number): Promise<InvitationJson[]> {
  const rows = await s.models.Invitation.findAll({ where: { teamId }, order: [['createdAt', 'DESC'], ['id', 'DESC']] })
  return rows.map(invitationJson)
}

const openInvitationConflict = () => new ConflictError('This address already has an open invitation to the team: revoke it to send a new one.', 'email')

/**
 * Creates an invitation (or, with `pending`, a request that waits for an owner) in one transaction
 * under the team lock: one open invitation per address and team (also a unique index), none for
 * a member. Expired open invitations to the address are removed first.
 */
async function createInvitation(s: Services, actor: User, team: Team, email: string, role: Role, pending: boolean): Promise<Invitation> {
  try {
    return await s.sequelize.transaction(async (transaction) => {
      await s.models.Team.findByPk(team.id, { transaction, lock: transaction.LOCK.UPDATE })
      const existingUser = await s.models.User.findOne({ where: { email }, transaction })
      if (existingUser && (await s.models.Membership.findOne({ where: { teamId: team.id, userId: existingUser.id }, transaction }))) {
        throw new ConflictError('This person is already a member of the team.', 'email')
      }
      await s.models.Invitation.destroy({ where: { teamId: team.id, email, acceptedAt: null, expiresAt: { [Op.lte]: new Date() } }, transaction })
      if (await s.models.Invitation.findOne({ where: { teamId: team.id, email, acceptedAt: null }, transaction })) throw openInvitationConflict()
      const created = await s.models.Invitation.create({
        teamId: team.id, email, role, tokenHash: newToken().hash, expiresAt: new Date(Date.now() + INVITE_DAYS * 86400_000),
        acceptedAt: null, invitedBy: actor.id, pendingApproval: pending,
      }, { transaction })
      await record(s, {
        teamId: team.id, userId: actor.id, action: pending ? 'invitation.request' : 'invitation.create', entity: 'invitation', entityId: created.id, detail: { email, role },
      }, transaction)
      return created
    })
  } catch (err) {
    if (err instanceof UniqueConstraintError) throw openInvitationConflict()
    throw err
  }
}

/** A fresh link for an approved invitation (the stored hash is replaced) and the e-mail that carries it. */
async function sendInvitation(s: Services, inviter: User, team: Team, inv: Invitation, transaction?: Transaction): Promise<void> {
  const { token, hash } = newToken()
  inv.tokenHash = hash
  await inv.save({ transaction })
  const link = `${s.config.appUrl}/invite?token=${token}`
  await s.mailer.send({
    to: inv.email,
    subject: `${inviter.name} invites you to ${team.name} on Starsway`,
    text: `Hello,\n\n${inviter.name} invites you to join the team "${team.name}" on Starsway as ${inv.role}.\n` +
      `Open this link within ${INVITE_DAYS} days to create your account or join with your existing one:\n\n${link}\n`,
  })
}

/** An owner invites someone: the invitation and its e-mail. */
export async function invite(s: Services, actor: User, team: Team, email: string, role: Role): Promise<InvitationJson> {
  const inv = await createInvitation(s, actor, team, email, role, false)
  await sendInvitation(s, actor, team, inv)
  return invitationJson(inv)
}

/**
 * Someone outside the team should read a report: an owner's share invites them at once; anyone
 * else's becomes a request the owners approve (they are e-mailed). Only owners let people in.
 */
export async function inviteOrRequest(s: Services, actor: User, team: Team, email: string, role: Role): Promise<InvitationJson> {
  const mine = await s.models.Membership.findOne({ where: { teamId: team.id, userId: actor.id } })
  if (mine?.role === 'owner') return invite(s, actor, team, email, role)
  const inv = await createInvitation(s, actor, team, email, role, true)
  const owners = await s.models.Membership.findAll({ where: { teamId: team.id, role: 'owner' }, include: [{ model: s.models.User, as: 'user' }] })
  const link = `${s.config.appUrl}/teams/${team.id}`
  for (const o of owners) {
    await s.mailer.send({
      to: o.user!.email,
      subject: `${actor.name} asks to invite ${email} to ${team.name}`,
      text: `Hello ${o.user!.name},\n\n${actor.name} shared a report with ${email}, who is not in the team "${team.name}".\n` +
        `They can read the team's data only after an owner approves the invitation (as ${role}). Approve or revoke it on the team page:\n\n${link}\n`,
    })
  }
  return invitationJson(inv)
}

/** An owner approves an analyst's request: it becomes an invitation with a fresh link, e-mailed now. */
export async function approveInvitation(s: Services, actor: User, team: Team, id: number): Promise<InvitationJson> {
  const inv = await s.sequelize.transaction(async (transaction) => {
    await lockTeamAsOwner(s, actor, team.id, transaction)
    const found = await s.models.Invitation.findOne({ where: { id, teamId: team.id, acceptedAt: null }, transaction })
    if (!found) throw new NotFoundError('Invitation')
    if (!found.pendingApproval) throw new ConflictError('This invitation is already approved.')
    found.pendingApproval = false
    found.invitedBy = actor.id
    found.expiresAt = new Date(Date.now() + INVITE_DAYS * 86400_000)
    await found.save({ transaction })
    await record(s, { teamId: team.id, userId: actor.id, action: 'invitation.approve', entity: 'invitation', entityId: found.id, detail: { email: found.email, role: found.role } }, transaction)
    return found
  })
  await sendInvitation(s, actor, team, inv)
  return invitationJson(inv)
}

export async function revokeInvitation(s: Services, actor: User, teamId: number, id: number): Promise<void> {
  await s.sequelize.transaction(async (transaction) => {
    const inv = await s.models.Invitation.findOne({ where: { id, teamId }, transaction })
    if (!inv) throw new NotFoundError('Invitation')
    await inv.destroy({ transaction })
    await record(s, { teamId, userId: actor.id, action: 'invitation.revoke', entity: 'invitation', entityId: id, detail: { email: inv.email, role: inv.role } }, transaction)
  })
}

/** An invitation that is neither used nor expired, or null. */
export async function findOpenInvitation(s: Services, token: string): Promise<Invitation | null> {
  return s.models.Invitation.findOne({
    where: { tokenHash: hashToken(token), acceptedAt: null, pendingApproval: false, expiresAt: { [Op.gt]: new Date() } },
    include: [{ model: s.models.Team, as: 'team' }],
  })
}

export async function publicInvitation(s: Services, token: string): Promise<PublicInvitation> {
  const inv = await findOpenInvitation(s, token)
  if (!inv) throw new NotFoundError('Invitation')
  return { teamId: inv.teamId, teamName: inv.team!.name, role: inv.role, email: inv.email, expiresAt: inv.expiresAt.toISOString() }
}

export async function acceptInvitationInTx(s: Services, inv: Invitation, user: User, transaction: Transaction): Promise<AcceptInvitationResponse> {
  const fresh = await s.models.Invitation.findByPk(inv.id, { transaction, lock: transaction.LOCK.UPDATE })
  if (!fresh || fresh.acceptedAt || fresh.pendingApproval) throw new NotFoundError('Invitation')
  const existing = await s.models.Membership.findOne({ where: { teamId: inv.teamId, userId: user.id }, transaction })
  if (existing) throw new ConflictError('You are already a member of this team.')
  await s.models.Membership.create({ teamId: inv.teamId, userId: user.id, role: inv.role }, { transaction })
  fresh.acceptedAt = new Date()
  await fresh.save({ transaction })
  await record(s, { teamId: inv.teamId, userId: user.id, action: 'invitation.accept', entity: 'invitation', entityId: inv.id, detail: { email: inv.email, role: inv.role } }, transaction)
  return { teamId: inv.teamId, role: inv.role }
}

export async function acceptInvitation(s: Services, user: User, token: string): Promise<AcceptInvitationResponse> {
  const inv = await findOpenInvitation(s, token)
  if (!inv) throw new NotFoundError('Invitation')
  if (inv.email !== user.email) {
    throw new ValidationError(`This invitation was sent to ${inv.email}: sign in with that address to accept it.`, 'email')
  }
  return s.sequelize.transaction((transaction) => acceptInvitationInTx(s, inv, user, transaction))
}

import { Op, type Transaction } from 'sequelize'
import type { Services } from '../services.ts'
import type { Invitation, Membership, Team, User } from '../db/models.ts'
import { ConflictError, NotFoundError, ValidationError } from '../errors.ts'
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

export async function changeRole(s: Services, actor: User, teamId: number, userId: number, role: Role): Promise<Member> {
  return s.sequelize.transaction(async (transaction) => {
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
    const m = await memberOf(s, teamId, userId, transaction)
    if (m.role === 'owner' && (await otherOwners(s, teamId, userId, transaction)) === 0) {
      throw new ConflictError('A team needs at least one owner: make someone else owner first.')
    }
    await m.destroy({ transaction })
    await record(s, { teamId, userId: actor.id, action: 'member.remove', entity: 'user', entityId: userId, detail: { role: m.role, email: m.user!.email } }, transaction)
  })
}

function invitationJson(i: Invitation): InvitationJson {
  return { id: i.id, email: i.email, role: i.role, expiresAt: i.expiresAt.toISOString(), acceptedAt: i.acceptedAt?.toISOString() ?? null }
}

export async function listInvitations(s: Services, teamId: number): Promise<InvitationJson[]> {
  const rows = await s.models.Invitation.findAll({ where: { teamId }, order: [['createdAt', 'DESC'], ['id', 'DESC']] })
  return rows.map(invitationJson)
}

export async function invite(s: Services, actor: User, team: Team, email: string, role: Role): Promise<InvitationJson> {
  const existingUser = await s.models.User.findOne({ where: { email } })
  if (existingUser && (await s.models.Membership.findOne({ where: { teamId: team.id, userId: existingUser.id } }))) {
    throw new ConflictError('This person is already a member of the team.', 'email')
  }
  const { token, hash } = newToken()
  const inv = await s.sequelize.transaction(async (transaction) => {
    const created = await s.models.Invitation.create({
      teamId: team.id, email, role, tokenHash: hash, expiresAt: new Date(Date.now() + INVITE_DAYS * 86400_000),
      acceptedAt: null, invitedBy: actor.id,
    }, { transaction })
    await record(s, { teamId: team.id, userId: actor.id, action: 'invitation.create', entity: 'invitation', entityId: created.id, detail: { email, role } }, transaction)
    return created
  })
  const link = `${s.config.appUrl}/invite?token=${token}`
  await s.mailer.send({
    to: email,
    subject: `${actor.name} invites you to ${team.name} on Starsway`,
    text: `Hello,\n\n${actor.name} invites you to join the team "${team.name}" on Starsway as ${role}.\n` +
      `Open this link within ${INVITE_DAYS} days to create your account or join with your existing one:\n\n${link}\n`,
  })
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
    where: { tokenHash: hashToken(token), acceptedAt: null, expiresAt: { [Op.gt]: new Date() } },
    include: [{ model: s.models.Team, as: 'team' }],
  })
}

export async function publicInvitation(s: Services, token: string): Promise<PublicInvitation> {
  const inv = await findOpenInvitation(s, token)
  if (!inv) throw new NotFoundError('Invitation')
  return { teamName: inv.team!.name, role: inv.role, email: inv.email, expiresAt: inv.expiresAt.toISOString() }
}

export async function acceptInvitationInTx(s: Services, inv: Invitation, user: User, transaction: Transaction): Promise<AcceptInvitationResponse> {
  const fresh = await s.models.Invitation.findByPk(inv.id, { transaction, lock: transaction.LOCK.UPDATE })
  if (!fresh || fresh.acceptedAt) throw new NotFoundError('Invitation')
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

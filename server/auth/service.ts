import { Op, UniqueConstraintError } from 'sequelize'
import type { Services } from '../services.ts'
import type { User } from '../db/models.ts'
import { ConflictError, UnauthorizedError, ValidationError } from '../errors.ts'
import type { MeResponse, RegisterRequest, User as UserJson } from '../../shared/api/auth.ts'
import { hashToken, newToken } from './tokens.ts'
import { deleteUserSessions } from './sessions.ts'
import { comparePassword, hashPassword } from './hasher.ts'
import { acceptInvitationInTx, findOpenInvitation } from '../teams/service.ts'

const RESET_HOURS = 1
/** Hashes compared against when the e-mail is unknown (per cost), so both failures take the same time. */
const dummyHashes = new Map<number, Promise<string>>()
function dummyHash(cost: number): Promise<string> {
  if (!dummyHashes.has(cost)) dummyHashes.set(cost, hashPassword('starsway-no-such-user', cost).catch((err: unknown) => { dummyHashes.delete(cost); throw err }))
  return dummyHashes.get(cost)!
}

export function userJson(u: User): UserJson {
  return { id: u.id, email: u.email, name: u.name }
}

export async function register(s: Services, input: RegisterRequest): Promise<User> {
  const invitation = input.inviteToken ? await findOpenInvitation(s, input.inviteToken) : null
  if (invitation && invitation.email !== input.email) {
    throw new ValidationError('This invitation was sent to another e-mail address: register with that address.', 'email')
  }
  if (await s.models.User.findOne({ where: { email: input.email } })) {
    throw new ConflictError('An account with this e-mail already exists: sign in instead.', 'email')
  }
  const passwordHash = await hashPassword(input.password, s.config.bcryptCost)
  try {
    return await s.sequelize.transaction(async (transaction) => {
      const user = await s.models.User.create({ email: input.email, name: input.name, passwordHash }, { transaction })
      if (invitation) await acceptInvitationInTx(s, invitation, user, transaction)
      return user
    })
  } catch (err) {
    // two registrations of one address at the same moment: the unique index decides, the loser hears 409
    if (err instanceof UniqueConstraintError) throw new ConflictError('An account with this e-mail already exists: sign in instead.', 'email')
    throw err
  }
}

/** Same message for an unknown e-mail and a wrong password (no user enumeration). */
export async function login(s: Services, email: string, password: string): Promise<User> {
  const user = await s.models.User.findOne({ where: { email } })
  const ok = await comparePassword(password, user ? user.passwordHash : await dummyHash(s.config.bcryptCost))
  if (!user || !ok) throw new UnauthorizedError('Wrong e-mail or password.')
  return user
}

export async function me(s: Services, user: User): Promise<MeResponse> {
  const memberships = await s.models.Membership.findAll({
    where: { userId: user.id }, include: [{ model: s.models.Team, as: 'team' }], order: [['teamId', 'ASC']],
  })
  return {
    user: userJson(user),
    memberships: memberships.map((m) => ({ teamId: m.teamId, teamName: m.team!.name, role: m.role })),
  }
}

/** Changes the password and ends every other session (token version bump); returns the updated user. */
export async function changePassword(s: Services, user: User, currentPassword: string, newPassword: string): Promise<User> {
  if (!(await comparePassword(currentPassword, user.passwordHash))) {
    throw new ValidationError('The current password is wrong.', 'currentPassword')
  }
  user.passwordHash = await hashPassword(newPassword, s.config.bcryptCost)
  user.tokenVersion = user.tokenVersion + 1
  await user.save()
  return user
}

/** E-mails a one-time reset link when the address is known; silent otherwise. */
export async function requestReset(s: Services, email: string): Promise<void> {
  const user = await s.models.User.findOne({ where: { email } })
  if (!user) return
  const { token, hash } = newToken()
  await s.sequelize.transaction(async (transaction) => {
    // only the newest link works: older unused ones are spent now
    await s.models.PasswordReset.update({ usedAt: new Date() }, { where: { userId: user.id, usedAt: null }, transaction })
    await s.models.PasswordReset.create({
      userId: user.id, tokenHash: hash, expiresAt: new Date(Date.now() + RESET_HOURS * 3600_000), usedAt: null,
    }, { transaction })
  })
  const link = `${s.config.appUrl}/reset?token=${token}`
  await s.mailer.send({
    to: user.email,
    subject: 'Reset your Starsway password',
    text: `Hello ${user.name},\n\nSomeone (hopefully you) asked to reset your Starsway password.\n` +
      `Open this link within ${RESET_HOURS} hour to choose a new one:\n\n${link}\n\n` +
      'If you did not ask for this, ignore this message: your password stays as it is.\n',
  })
}

export async function resetPassword(s: Services, token: string, newPassword: string): Promise<void> {
  const passwordHash = await hashPassword(newPassword, s.config.bcryptCost)
  await s.sequelize.transaction(async (transaction) => {
    const reset = await s.models.PasswordReset.findOne({
      where: { tokenHash: hashToken(token), usedAt: null, expiresAt: { [Op.gt]: new Date() } },
      transaction, lock: transaction.LOCK.UPDATE,
    })
    if (!reset) throw new ValidationError('This reset link is unknown, used or expired: ask for a new one.', 'token')
    const user = await s.models.User.findByPk(reset.userId, { transaction })
    if (!user) throw new ValidationError('This reset link is unknown, used or expired: ask for a new one.', 'token')
    // this link and every other open one of the user are spent; every session ends
    await s.models.PasswordReset.update({ usedAt: new Date() }, { where: { userId: user.id, usedAt: null }, transaction })
    user.passwordHash = passwordHash
    user.tokenVersion = user.tokenVersion + 1
    await user.save({ transaction })
    await deleteUserSessions(s, user.id, undefined, transaction)
  })
}

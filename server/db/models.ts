import {
  DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes,
  type NonAttribute, type Sequelize,
} from 'sequelize'
import type { Role } from '../../shared/api/common.ts'

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>
  declare email: string
  declare name: string
  declare passwordHash: string
  /** Bumped on every password change: older session tokens stop working. */
  declare tokenVersion: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

export class Team extends Model<InferAttributes<Team>, InferCreationAttributes<Team>> {
  declare id: CreationOptional<number>
  declare name: string
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

export class Membership extends Model<InferAttributes<Membership>, InferCreationAttributes<Membership>> {
  declare id: CreationOptional<number>
  declare userId: ForeignKey<User['id']>
  declare teamId: ForeignKey<Team['id']>
  declare role: Role
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare user?: NonAttribute<User>
  declare team?: NonAttribute<Team>
}

export class Invitation extends Model<InferAttributes<Invitation>, InferCreationAttributes<Invitation>> {
  declare id: CreationOptional<number>
  declare teamId: ForeignKey<Team['id']>
  declare email: string
  declare role: Role
  declare tokenHash: string
  declare expiresAt: Date
  declare acceptedAt: Date | null
  declare invitedBy: number | null
  /** An analyst's request (via a report share) that waits for an owner's approval; no usable token yet. */
  declare pendingApproval: CreationOptional<boolean>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare team?: NonAttribute<Team>
}

export class PasswordReset extends Model<InferAttributes<PasswordReset>, InferCreationAttributes<PasswordReset>> {
  declare id: CreationOptional<number>
  declare userId: ForeignKey<User['id']>
  declare tokenHash: string
  declare expiresAt: Date
  declare usedAt: Date | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

export class Star extends Model<InferAttributes<Star>, InferCreationAttributes<Star>> {
  declare id: CreationOptional<number>
  declare teamId: ForeignKey<Team['id']>
  declare name: string
  declare massMsun: number
  declare massErrMsun: number
  declare radiusRsun: number | null
  declare teffK: number | null
  declare luminosityLsun: number | null
  declare raDeg: number | null
  declare decDeg: number | null
  /** Proper motion μα* = μα cos δ and μδ, mas/yr, at `coordEpochJd` (TDB JD; null: J2000.0). */
  declare pmRaMasYr: CreationOptional<number | null>
  declare pmDecMasYr: CreationOptional<number | null>
  declare coordEpochJd: CreationOptional<number | null>
  /** The observatory offered when this star's times are converted to BJD_TDB (shared/api/stars.ts `siteSchema`). */
  declare defaultSite: CreationOptional<{ id?: string; name: string; lonDeg: number; latDeg: number; heightM: number } | null>
  declare notes: string | null
  declare archivedAt: Date | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  /** The signed-in user's membership of the star's team, when loaded with it (server/guards.ts starForUser); null: none. */
  declare viewer?: NonAttribute<Membership | null>
}

export class RawFile extends Model<InferAttributes<RawFile>, InferCreationAttributes<RawFile>> {
  declare id: CreationOptional<number>
  declare teamId: ForeignKey<Team['id']>
  declare fileName: string
  declare size: number
  declare sha256: string
  declare bytes: Buffer
  declare uploadedBy: number | null
  declare createdAt: CreationOptional<Date>
}

export class Dataset extends Model<InferAttributes<Dataset>, InferCreationAttributes<Dataset>> {
  declare id: CreationOptional<number>
  declare starId: ForeignKey<Star['id']>
  declare rawFileId: ForeignKey<RawFile['id']>
  declare instrument: string
  declare fileName: string
  declare fileSha256: string
  declare detectedMapping: unknown
  declare confirmedMapping: unknown
  declare unit: string
  declare timeFormat: string
  /** Time scale of the stored times (shared/ingest TimeScale; 'bjd_tdb' after a conversion at upload). */
  declare timeScale: CreationOptional<string>
  /** The N of 'JD − N' the file was written in (0 for full JD); stored times are full JD. */
  declare timeOffset: CreationOptional<number>
  /** Units as written per column: { rv, error, indicators: { key: unit } }. */
  declare units: CreationOptional<Record<string, unknown>>
  /** The conversion to BJD_TDB done at upload ({ from, site, target }), or null. */
  declare timeConversion: CreationOptional<Record<string, unknown> | null>
  /** Rows left out at commit ("skip problem rows"): [{ line, column?, message }]. */
  declare skippedRows: CreationOptional<Array<{ line: number; column?: string; message: string }>>
  /** Overlap with earlier measurements of the star and the choice made ({ count, choice, examples }), or null. */
  declare overlap: CreationOptional<Record<string, unknown> | null>
  declare warnings: CreationOptional<string[]>
  declare uploadedBy: number | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare uploader?: NonAttribute<User | null>
}

export class Measurement extends Model<InferAttributes<Measurement>, InferCreationAttributes<Measurement>> {
  declare id: CreationOptional<number>
  declare datasetId: ForeignKey<Dataset['id']>
  declare starId: ForeignKey<Star['id']>
  declare line: number | null
  declare time: number
  declare rv: number
  declare error: number
  declare indicators: CreationOptional<Record<string, number>>
  declare excluded: CreationOptional<boolean>
  declare excludedReason: CreationOptional<string | null>
  declare excludedBy: CreationOptional<number | null>
  declare excludedAt: CreationOptional<Date | null>
  declare dataset?: NonAttribute<Dataset>
  declare excluder?: NonAttribute<User | null>
}

export class AuditEntry extends Model<InferAttributes<AuditEntry>, InferCreationAttributes<AuditEntry>> {
  declare id: CreationOptional<number>
  declare teamId: number
  declare userId: number | null
  declare action: string
  declare entity: string
  declare entityId: number | null
  declare detail: CreationOptional<unknown>
  declare at: CreationOptional<Date>
  declare user?: NonAttribute<User | null>
}

const UserModel = User, TeamModel = Team, MembershipModel = Membership, InvitationModel = Invitation
const PasswordResetModel = PasswordReset, StarModel = Star, RawFileModel = RawFile, DatasetModel = Dataset
const MeasurementModel = Measurement, AuditEntryModel = AuditEntry

export interface Models {
  User: typeof User; Team: typeof Team; Membership: typeof Membership; Invitation: typeof Invitation
  PasswordReset: typeof PasswordReset; Star: typeof Star; RawFile: typeof RawFile; Dataset: typeof Dataset
  Measurement: typeof Measurement; AuditEntry: typeof AuditEntry
}

const pk = { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true }
const roleType = DataTypes.ENUM('owner', 'analyst', 'reviewer')

/**
 * Binds the model classes to one Sequelize instance (one database per process; tests give each
 * file its own process). The schema itself comes from the migrations, never from sync().
 */
export function initModels(sequelize: Sequelize): Models {
  // Fresh subclasses per Sequelize instance, so two apps (two databases) can live in one process.
  const User = class extends UserModel {}
  const Team = class extends TeamModel {}
  const Membership = class extends MembershipModel {}
  const Invitation = class extends InvitationModel {}
  const PasswordReset = class extends PasswordResetModel {}
  const Star = class extends StarModel {}
  const RawFile = class extends RawFileModel {}
  const Dataset = class extends DatasetModel {}
  const Measurement = class extends MeasurementModel {}
  const AuditEntry = class extends AuditEntryModel {}
  const base = { sequelize, underscored: true }
  User.init({
    id: pk, email: { type: DataTypes.STRING, allowNull: false }, name: { type: DataTypes.STRING, allowNull: false },
    passwordHash: { type: DataTypes.STRING, allowNull: false }, tokenVersion: { type: DataTypes.INTEGER, defaultValue: 0 },
    createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE,
  }, { ...base, modelName: 'User', tableName: 'users' })
  Team.init({ id: pk, name: { type: DataTypes.STRING, allowNull: false }, createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE },
    { ...base, modelName: 'Team', tableName: 'teams' })
  Membership.init({ id: pk, role: { type: roleType, allowNull: false }, createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE },
    { ...base, modelName: 'Membership', tableName: 'memberships' })
  Invitation.init({
    id: pk, email: { type: DataTypes.STRING, allowNull: false }, role: { type: roleType, allowNull: false },
    tokenHash: { type: DataTypes.STRING, allowNull: false }, expiresAt: { type: DataTypes.DATE, allowNull: false },
    acceptedAt: DataTypes.DATE, invitedBy: DataTypes.INTEGER, pendingApproval: { type: DataTypes.BOOLEAN, defaultValue: false }, createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE,
  }, { ...base, modelName: 'Invitation', tableName: 'invitations' })
  PasswordReset.init({
    id: pk, tokenHash: { type: DataTypes.STRING, allowNull: false }, expiresAt: { type: DataTypes.DATE, allowNull: false },
    usedAt: DataTypes.DATE, createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE,
  }, { ...base, modelName: 'PasswordReset', tableName: 'password_resets' })
  Star.init({
    id: pk, name: { type: DataTypes.STRING, allowNull: false },
    massMsun: { type: DataTypes.DOUBLE, allowNull: false }, massErrMsun: { type: DataTypes.DOUBLE, allowNull: false },
    radiusRsun: DataTypes.DOUBLE, teffK: DataTypes.DOUBLE, luminosityLsun: DataTypes.DOUBLE,
    raDeg: DataTypes.DOUBLE, decDeg: DataTypes.DOUBLE, notes: DataTypes.TEXT, archivedAt: DataTypes.DATE,
    pmRaMasYr: DataTypes.DOUBLE, pmDecMasYr: DataTypes.DOUBLE, coordEpochJd: DataTypes.DOUBLE, defaultSite: DataTypes.JSONB,
    createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE,
  }, { ...base, modelName: 'Star', tableName: 'stars' })
  RawFile.init({
    id: pk, fileName: { type: DataTypes.STRING, allowNull: false }, size: { type: DataTypes.INTEGER, allowNull: false },
    sha256: { type: DataTypes.STRING, allowNull: false }, bytes: { type: DataTypes.BLOB, allowNull: false },
    uploadedBy: DataTypes.INTEGER, createdAt: DataTypes.DATE,
  }, { ...base, modelName: 'RawFile', tableName: 'raw_files', updatedAt: false })
  Dataset.init({
    id: pk, instrument: { type: DataTypes.STRING, allowNull: false }, fileName: { type: DataTypes.STRING, allowNull: false },
    fileSha256: { type: DataTypes.STRING, allowNull: false }, detectedMapping: DataTypes.JSONB,
    confirmedMapping: { type: DataTypes.JSONB, allowNull: false }, unit: { type: DataTypes.STRING, allowNull: false },
    timeFormat: { type: DataTypes.STRING, allowNull: false }, uploadedBy: DataTypes.INTEGER,
    timeScale: { type: DataTypes.STRING, allowNull: false, defaultValue: 'unknown' }, timeOffset: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
    units: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} }, timeConversion: DataTypes.JSONB,
    skippedRows: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] }, overlap: DataTypes.JSONB,
    warnings: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
    createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE,
  }, { ...base, modelName: 'Dataset', tableName: 'datasets' })
  Measurement.init({
    id: pk, line: DataTypes.INTEGER, time: { type: DataTypes.DOUBLE, allowNull: false },
    rv: { type: DataTypes.DOUBLE, allowNull: false }, error: { type: DataTypes.DOUBLE, allowNull: false },
    indicators: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
    excluded: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    excludedReason: DataTypes.TEXT, excludedBy: DataTypes.INTEGER, excludedAt: DataTypes.DATE,
  }, { ...base, modelName: 'Measurement', tableName: 'measurements', timestamps: false })
  AuditEntry.init({
    id: pk, teamId: { type: DataTypes.INTEGER, allowNull: false }, userId: DataTypes.INTEGER,
    action: { type: DataTypes.STRING, allowNull: false }, entity: { type: DataTypes.STRING, allowNull: false },
    entityId: DataTypes.INTEGER, detail: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
    at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
  }, { ...base, modelName: 'AuditEntry', tableName: 'audit_log', timestamps: false })

  Membership.belongsTo(User, { foreignKey: 'userId', as: 'user' })
  Membership.belongsTo(Team, { foreignKey: 'teamId', as: 'team' })
  User.hasMany(Membership, { foreignKey: 'userId', as: 'memberships' })
  Team.hasMany(Membership, { foreignKey: 'teamId', as: 'memberships' })
  Invitation.belongsTo(Team, { foreignKey: 'teamId', as: 'team' })
  PasswordReset.belongsTo(User, { foreignKey: 'userId', as: 'user' })
  Star.belongsTo(Team, { foreignKey: 'teamId', as: 'team' })
  RawFile.belongsTo(Team, { foreignKey: 'teamId', as: 'team' })
  Dataset.belongsTo(Star, { foreignKey: 'starId', as: 'star' })
  Dataset.belongsTo(RawFile, { foreignKey: 'rawFileId', as: 'rawFile' })
  Dataset.belongsTo(User, { foreignKey: 'uploadedBy', as: 'uploader' })
  Measurement.belongsTo(Dataset, { foreignKey: 'datasetId', as: 'dataset' })
  Measurement.belongsTo(Star, { foreignKey: 'starId', as: 'star' })
  Measurement.belongsTo(User, { foreignKey: 'excludedBy', as: 'excluder' })
  AuditEntry.belongsTo(User, { foreignKey: 'userId', as: 'user' })

  return { User, Team, Membership, Invitation, PasswordReset, Star, RawFile, Dataset, Measurement, AuditEntry }
}

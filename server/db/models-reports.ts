import {
  DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize,
} from 'sequelize'
import type { Models, User } from './models.ts'
import type { ReportSnapshot, ReviewKind, SnapshotChange } from '../../shared/api/reports.ts'

export class Report extends Model<InferAttributes<Report>, InferCreationAttributes<Report>> {
  declare id: CreationOptional<number>
  declare starId: number
  declare modelId: number
  declare title: string
  declare currentVersion: number
  declare createdBy: number | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare creator?: NonAttribute<User | null>
}

/** One frozen version: the snapshot is written once (a database trigger refuses updates). */
export class ReportVersion extends Model<InferAttributes<ReportVersion>, InferCreationAttributes<ReportVersion>> {
  declare id: CreationOptional<number>
  declare reportId: number
  declare version: number
  declare modelVersionId: number
  declare samplingRunId: number | null
  declare dataHash: string
  declare fingerprint: string
  declare snapshot: ReportSnapshot
  declare changes: SnapshotChange[]
  declare frozenBy: number | null
  declare createdAt: CreationOptional<Date>
  declare frozenByUser?: NonAttribute<User | null>
}

export class ReportShare extends Model<InferAttributes<ReportShare>, InferCreationAttributes<ReportShare>> {
  declare id: CreationOptional<number>
  declare reportId: number
  declare userId: number | null
  declare email: string
  declare invitationId: number | null
  declare version: number
  declare sharedBy: number | null
  declare createdAt: CreationOptional<Date>
  declare user?: NonAttribute<User | null>
  declare sharer?: NonAttribute<User | null>
}

export class ReportReview extends Model<InferAttributes<ReportReview>, InferCreationAttributes<ReportReview>> {
  declare id: CreationOptional<number>
  declare reportId: number
  declare version: number
  declare userId: number | null
  declare kind: ReviewKind
  declare parameter: string | null
  declare body: string
  declare createdAt: CreationOptional<Date>
  declare user?: NonAttribute<User | null>
}

export interface ReportModels {
  Report: typeof Report; ReportVersion: typeof ReportVersion; ReportShare: typeof ReportShare; ReportReview: typeof ReportReview
}

const pk = { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true }
const bound = new WeakMap<Sequelize, ReportModels>()

/** The report models bound to this Sequelize instance (made once per instance). Schema: migration 0004. */
export function reportModels(sequelize: Sequelize, models: Models): ReportModels {
  const known = bound.get(sequelize)
  if (known) return known
  const R = class extends Report {}
  const RV = class extends ReportVersion {}
  const RS = class extends ReportShare {}
  const RR = class extends ReportReview {}
  const base = { sequelize, underscored: true }
  R.init({
    id: pk, starId: { type: DataTypes.INTEGER, allowNull: false }, modelId: { type: DataTypes.INTEGER, allowNull: false },
    title: { type: DataTypes.STRING, allowNull: false }, currentVersion: { type: DataTypes.INTEGER, allowNull: false },
    createdBy: DataTypes.INTEGER, createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE,
  }, { ...base, modelName: 'Report', tableName: 'reports' })
  RV.init({
    id: pk, reportId: { type: DataTypes.INTEGER, allowNull: false }, version: { type: DataTypes.INTEGER, allowNull: false },
    modelVersionId: { type: DataTypes.INTEGER, allowNull: false }, samplingRunId: DataTypes.INTEGER,
    dataHash: { type: DataTypes.STRING, allowNull: false }, fingerprint: { type: DataTypes.STRING, allowNull: false },
    snapshot: { type: DataTypes.JSONB, allowNull: false }, changes: { type: DataTypes.JSONB, allowNull: false },
    frozenBy: DataTypes.INTEGER, createdAt: DataTypes.DATE,
  }, { ...base, modelName: 'ReportVersion', tableName: 'report_versions', updatedAt: false })
  RS.init({
    id: pk, reportId: { type: DataTypes.INTEGER, allowNull: false }, userId: DataTypes.INTEGER,
    email: { type: DataTypes.STRING, allowNull: false }, invitationId: DataTypes.INTEGER,
    version: { type: DataTypes.INTEGER, allowNull: false }, sharedBy: DataTypes.INTEGER, createdAt: DataTypes.DATE,
  }, { ...base, modelName: 'ReportShare', tableName: 'report_shares', updatedAt: false })
  RR.init({
    id: pk, reportId: { type: DataTypes.INTEGER, allowNull: false }, version: { type: DataTypes.INTEGER, allowNull: false },
    userId: DataTypes.INTEGER, kind: { type: DataTypes.STRING, allowNull: false }, parameter: DataTypes.STRING,
    body: { type: DataTypes.TEXT, allowNull: false }, createdAt: DataTypes.DATE,
  }, { ...base, modelName: 'ReportReview', tableName: 'report_reviews', updatedAt: false })
  R.belongsTo(models.User, { foreignKey: 'createdBy', as: 'creator' })
  RV.belongsTo(models.User, { foreignKey: 'frozenBy', as: 'frozenByUser' })
  RS.belongsTo(models.User, { foreignKey: 'userId', as: 'user' })
  RS.belongsTo(models.User, { foreignKey: 'sharedBy', as: 'sharer' })
  RR.belongsTo(models.User, { foreignKey: 'userId', as: 'user' })
  const out = { Report: R, ReportVersion: RV, ReportShare: RS, ReportReview: RR }
  bound.set(sequelize, out)
  return out
}

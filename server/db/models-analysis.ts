import {
  DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize,
} from 'sequelize'
import type { Models, User } from './models.ts'
import type { DataSelection, FitResultJson, ModelSpec, ModelStatus, PeriodogramKind, PeriodogramResult } from '../../shared/api/analyses.ts'

export class FitModel extends Model<InferAttributes<FitModel>, InferCreationAttributes<FitModel>> {
  declare id: CreationOptional<number>
  declare starId: number
  declare name: string
  declare currentVersion: number
  declare createdBy: number | null
  declare archivedAt: CreationOptional<Date | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare creator?: NonAttribute<User | null>
}

/** One immutable version of a fit model (a change or a fit makes the next one). */
export class FitModelVersion extends Model<InferAttributes<FitModelVersion>, InferCreationAttributes<FitModelVersion>> {
  declare id: CreationOptional<number>
  declare modelId: number
  declare version: number
  declare name: string
  declare spec: ModelSpec
  declare status: ModelStatus
  declare result: FitResultJson | null
  declare note: string
  declare author: number | null
  declare createdAt: CreationOptional<Date>
  declare authorUser?: NonAttribute<User | null>
}

export class PeriodogramRun extends Model<InferAttributes<PeriodogramRun>, InferCreationAttributes<PeriodogramRun>> {
  declare id: CreationOptional<number>
  declare starId: number
  declare kind: PeriodogramKind
  declare indicator: string | null
  declare modelVersionId: number | null
  declare settings: { minPeriod: number; maxPeriod: number; oversample: number; instruments: string[] | null }
  declare data: DataSelection
  declare result: PeriodogramResult
  declare topPeak: { period: number; frequency: number; power: number; fap: number } | null
  declare createdBy: number | null
  declare createdAt: CreationOptional<Date>
  declare creator?: NonAttribute<User | null>
}

export interface AnalysisModels {
  FitModel: typeof FitModel
  FitModelVersion: typeof FitModelVersion
  PeriodogramRun: typeof PeriodogramRun
}

const pk = { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true }
const bound = new WeakMap<Sequelize, AnalysisModels>()

/**
 * The analysis models bound to the Sequelize instance of `models` (made once per instance, like
 * `initModels`, so two apps on two databases can share a process). Schema: migration 0002.
 */
export function analysisModels(sequelize: Sequelize, models: Models): AnalysisModels {
  const known = bound.get(sequelize)
  if (known) return known
  const FM = class extends FitModel {}
  const FMV = class extends FitModelVersion {}
  const PR = class extends PeriodogramRun {}
  const base = { sequelize, underscored: true }
  FM.init({
    id: pk, starId: { type: DataTypes.INTEGER, allowNull: false }, name: { type: DataTypes.STRING, allowNull: false },
    currentVersion: { type: DataTypes.INTEGER, allowNull: false }, createdBy: DataTypes.INTEGER, archivedAt: DataTypes.DATE,
    createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE,
  }, { ...base, modelName: 'FitModel', tableName: 'fit_models' })
  FMV.init({
    id: pk, modelId: { type: DataTypes.INTEGER, allowNull: false }, version: { type: DataTypes.INTEGER, allowNull: false },
    name: { type: DataTypes.STRING, allowNull: false }, spec: { type: DataTypes.JSONB, allowNull: false },
    status: { type: DataTypes.STRING, allowNull: false }, result: DataTypes.JSONB,
    note: { type: DataTypes.STRING, allowNull: false }, author: DataTypes.INTEGER, createdAt: DataTypes.DATE,
  }, { ...base, modelName: 'FitModelVersion', tableName: 'fit_model_versions', updatedAt: false })
  PR.init({
    id: pk, starId: { type: DataTypes.INTEGER, allowNull: false }, kind: { type: DataTypes.STRING, allowNull: false },
    indicator: DataTypes.STRING, modelVersionId: DataTypes.INTEGER,
    settings: { type: DataTypes.JSONB, allowNull: false }, data: { type: DataTypes.JSONB, allowNull: false },
    result: { type: DataTypes.JSONB, allowNull: false }, topPeak: DataTypes.JSONB, createdBy: DataTypes.INTEGER,
    createdAt: DataTypes.DATE,
  }, { ...base, modelName: 'PeriodogramRun', tableName: 'periodogram_runs', updatedAt: false })
  FM.belongsTo(models.User, { foreignKey: 'createdBy', as: 'creator' })
  FMV.belongsTo(models.User, { foreignKey: 'author', as: 'authorUser' })
  PR.belongsTo(models.User, { foreignKey: 'createdBy', as: 'creator' })
  const out = { FitModel: FM, FitModelVersion: FMV, PeriodogramRun: PR }
  bound.set(sequelize, out)
  return out
}

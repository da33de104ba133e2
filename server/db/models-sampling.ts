import {
  DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize,
} from 'sequelize'
import type { Models, User } from './models.ts'
import type { SamplingProgress, SamplingResult, SamplingSettings, SamplingState } from '../../shared/api/sampling.ts'

/** What a run samples, frozen when it was requested (plain JSON; see server/sampling/input.ts). */
import type { GpHyperSpec } from '../../shared/rv/gp-fit.ts'

export interface SamplingInput {
  data: { measurementIds: number[]; t: number[]; y: number[]; dy: number[]; instrument: number[]; instrumentNames: string[] }
  model: {
    planets: Array<{ period: number; K: number; e?: number; omegaDeg?: number; tc?: number; tp?: number; fix?: string[] }>
    trend: 'none' | 'linear' | 'quadratic'
    epoch?: number
    priors: Array<{ planet: number; param: string; gaussian?: { mu: number; sigma: number }; uniform?: { min: number; max: number } }>
    /** GP noise model (the spec's `noise` of kind 'gp' as the core's GpHyperSpec); absent: white noise. */
    noise?: GpHyperSpec | null
    /** Every instrument's jitter pinned by the spec (m/s, in `data.instrumentNames` order); absent: sampled. */
    jitter?: number[] | null
  }
  starMass: { value: number; err: number } | null
}

/** Sampler state and kept-chain size at a checkpoint (the chain itself is in the BYTEA columns). */
export interface SamplingCheckpoint { state: Record<string, unknown>; nKept: number; savedAt: string }

export class SamplingRun extends Model<InferAttributes<SamplingRun>, InferCreationAttributes<SamplingRun>> {
  declare id: CreationOptional<number>
  declare starId: number
  declare modelId: number | null
  declare modelVersionId: number | null
  declare modelVersion: number | null
  declare settings: SamplingSettings
  declare input: SamplingInput
  declare state: CreationOptional<SamplingState>
  declare progress: CreationOptional<SamplingProgress | null>
  declare estimateSeconds: number | null
  declare attempts: CreationOptional<number>
  declare checkpoint: CreationOptional<SamplingCheckpoint | null>
  declare checkpointChain: CreationOptional<Buffer | null>
  declare checkpointLnprob: CreationOptional<Buffer | null>
  declare checkpointStep: CreationOptional<number>
  declare resumedFromStep: CreationOptional<number | null>
  declare result: CreationOptional<SamplingResult | null>
  declare jobId: CreationOptional<string | null>
  declare workerId: CreationOptional<string | null>
  declare heartbeatAt: CreationOptional<Date | null>
  declare requestedBy: number | null
  declare error: CreationOptional<string | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare startedAt: CreationOptional<Date | null>
  declare finishedAt: CreationOptional<Date | null>
  declare requester?: NonAttribute<User | null>
}

export interface SamplingModels { SamplingRun: typeof SamplingRun }

const bound = new WeakMap<Sequelize, SamplingModels>()

/** The sampling model bound to this Sequelize instance (made once per instance). Schema: migration 0003. */
export function samplingModels(sequelize: Sequelize, models: Models): SamplingModels {
  const known = bound.get(sequelize)
  if (known) return known
  const SR = class extends SamplingRun {}
  SR.init({
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    starId: { type: DataTypes.INTEGER, allowNull: false }, modelId: DataTypes.INTEGER, modelVersionId: DataTypes.INTEGER,
    modelVersion: DataTypes.INTEGER, settings: { type: DataTypes.JSONB, allowNull: false }, input: { type: DataTypes.JSONB, allowNull: false },
    state: { type: DataTypes.STRING, allowNull: false, defaultValue: 'queued' }, progress: DataTypes.JSONB,
    estimateSeconds: DataTypes.DOUBLE, attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    checkpoint: DataTypes.JSONB, checkpointChain: DataTypes.BLOB, checkpointLnprob: DataTypes.BLOB,
    checkpointStep: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 }, resumedFromStep: DataTypes.INTEGER,
    result: DataTypes.JSONB, jobId: DataTypes.STRING, workerId: DataTypes.STRING, heartbeatAt: DataTypes.DATE,
    requestedBy: DataTypes.INTEGER, error: DataTypes.TEXT,
    createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE, startedAt: DataTypes.DATE, finishedAt: DataTypes.DATE,
  }, { sequelize, underscored: true, modelName: 'SamplingRun', tableName: 'sampling_runs' })
  SR.belongsTo(models.User, { foreignKey: 'requestedBy', as: 'requester' })
  const out = { SamplingRun: SR }
  bound.set(sequelize, out)
  return out
}

import { DataTypes, type QueryInterface } from 'sequelize'
import { installJobSchema } from '../../jobs/boss.ts'

/**
 * Posterior sampling runs (server/sampling) and the job queue's schema (pg-boss, schema `pgboss`).
 * model_id / model_version_id reference the saved fit models when their tables exist.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  const [tables] = await qi.sequelize.query(`SELECT table_name FROM information_schema.tables WHERE table_schema = 'public' AND table_name IN ('fit_models', 'fit_model_versions')`)
  const has = new Set((tables as Array<{ table_name: string }>).map((t) => t.table_name))
  const optionalRef = (table: string) => ({
    type: DataTypes.INTEGER, allowNull: true,
    ...(has.has(table) ? { references: { model: table, key: 'id' }, onDelete: 'SET NULL' } : {}),
  })
  await qi.createTable('sampling_runs', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    star_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'stars', key: 'id' }, onDelete: 'CASCADE' },
    model_id: optionalRef('fit_models'),
    model_version_id: optionalRef('fit_model_versions'),
    model_version: { type: DataTypes.INTEGER, allowNull: true },
    settings: { type: DataTypes.JSONB, allowNull: false },
    // what the run samples, frozen when it was requested: data rows, model, stellar mass
    input: { type: DataTypes.JSONB, allowNull: false },
    state: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'queued' },
    progress: { type: DataTypes.JSONB, allowNull: true },
    estimate_seconds: { type: DataTypes.DOUBLE, allowNull: true },
    attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    // sampler state (walkers, ln p, generator, acceptance) and the chain kept so far, for resuming
    checkpoint: { type: DataTypes.JSONB, allowNull: true },
    checkpoint_chain: { type: DataTypes.BLOB, allowNull: true },
    checkpoint_lnprob: { type: DataTypes.BLOB, allowNull: true },
    checkpoint_step: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    // step the latest attempt resumed from (null: started from the beginning)
    resumed_from_step: { type: DataTypes.INTEGER, allowNull: true },
    result: { type: DataTypes.JSONB, allowNull: true },
    job_id: { type: DataTypes.STRING(64), allowNull: true },
    worker_id: { type: DataTypes.STRING(200), allowNull: true },
    heartbeat_at: { type: DataTypes.DATE, allowNull: true },
    requested_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    error: { type: DataTypes.TEXT, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
    updated_at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
    started_at: { type: DataTypes.DATE, allowNull: true },
    finished_at: { type: DataTypes.DATE, allowNull: true },
  })
  await qi.sequelize.query(`ALTER TABLE sampling_runs ADD CONSTRAINT sampling_runs_state_check CHECK (state IN ('queued', 'running', 'succeeded', 'failed', 'cancelled'))`)
  await qi.addIndex('sampling_runs', ['star_id', 'created_at'])
  await qi.addIndex('sampling_runs', ['state', 'heartbeat_at'])
  await installJobSchema(qi.sequelize)
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('sampling_runs')
  await qi.sequelize.query('DROP SCHEMA IF EXISTS pgboss CASCADE')
}

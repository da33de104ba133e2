import { DataTypes, type QueryInterface } from 'sequelize'
import { createJobSender } from '../../jobs/boss.ts'

/**
 * Detection-limit runs (server/limits): one row per run with its frozen input (times, residuals,
 * jitter-inflated errors, stellar mass), grid settings and seed; one row per chunk (a slice of the
 * grid's trials) with its state, worker, heartbeat and outcomes; the pg-boss queue `limits`.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('limit_runs', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    star_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'stars', key: 'id' }, onDelete: 'CASCADE' },
    model_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'fit_models', key: 'id' }, onDelete: 'SET NULL' },
    model_version_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'fit_model_versions', key: 'id' }, onDelete: 'SET NULL' },
    model_version: { type: DataTypes.INTEGER, allowNull: true },
    settings: { type: DataTypes.JSONB, allowNull: false },
    seed: { type: DataTypes.BIGINT, allowNull: false },
    input: { type: DataTypes.JSONB, allowNull: false },
    trials: { type: DataTypes.INTEGER, allowNull: false },
    chunk_count: { type: DataTypes.INTEGER, allowNull: false },
    state: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'queued' },
    result: { type: DataTypes.JSONB, allowNull: true },
    error: { type: DataTypes.TEXT, allowNull: true },
    requested_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: qi.sequelize.fn('now') },
    updated_at: { type: DataTypes.DATE, allowNull: false, defaultValue: qi.sequelize.fn('now') },
    started_at: { type: DataTypes.DATE, allowNull: true },
    finished_at: { type: DataTypes.DATE, allowNull: true },
  })
  await qi.sequelize.query(`ALTER TABLE limit_runs ADD CONSTRAINT limit_runs_state_check CHECK (state IN ('queued', 'running', 'succeeded', 'failed', 'cancelled'))`)
  await qi.addIndex('limit_runs', ['star_id', 'created_at'])
  await qi.createTable('limit_chunks', {
    run_id: { type: DataTypes.INTEGER, allowNull: false, primaryKey: true, references: { model: 'limit_runs', key: 'id' }, onDelete: 'CASCADE' },
    index: { type: DataTypes.INTEGER, allowNull: false, primaryKey: true },
    start: { type: DataTypes.INTEGER, allowNull: false },
    end: { type: DataTypes.INTEGER, allowNull: false },
    state: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'queued' },
    // outcomes of the chunk's trials, one byte (0/1) each
    recovered: { type: DataTypes.BLOB, allowNull: true },
    worker_id: { type: DataTypes.STRING(200), allowNull: true },
    heartbeat_at: { type: DataTypes.DATE, allowNull: true },
    attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    finished_at: { type: DataTypes.DATE, allowNull: true },
  })
  await qi.sequelize.query(`ALTER TABLE limit_chunks ADD CONSTRAINT limit_chunks_state_check CHECK (state IN ('queued', 'running', 'done'))`)
  await qi.addIndex('limit_chunks', ['state', 'heartbeat_at'])
  const sender = createJobSender(qi.sequelize)
  if (!(await sender.getQueue('limits'))) await sender.createQueue('limits')
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('limit_chunks')
  await qi.dropTable('limit_runs')
  await qi.sequelize.query(`DELETE FROM pgboss.queue WHERE name = 'limits'`).catch(() => undefined)
}

import { DataTypes, type QueryInterface } from 'sequelize'
import { createJobSender } from '../../jobs/boss.ts'

/**
 * Survey triage (server/triage): one row per triage run (a batch of stars queued together) and one
 * row per star of the run with its state, worker, heartbeat and the search's summary; the pg-boss
 * queue `triage` (one job per star).
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('triage_runs', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    team_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'teams', key: 'id' }, onDelete: 'CASCADE' },
    requested_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    star_count: { type: DataTypes.INTEGER, allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: qi.sequelize.fn('now') },
  })
  await qi.addIndex('triage_runs', ['team_id', 'created_at'])
  await qi.createTable('triage_results', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    run_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'triage_runs', key: 'id' }, onDelete: 'CASCADE' },
    team_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'teams', key: 'id' }, onDelete: 'CASCADE' },
    star_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'stars', key: 'id' }, onDelete: 'CASCADE' },
    state: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'queued' },
    worker_id: { type: DataTypes.STRING(200), allowNull: true },
    heartbeat_at: { type: DataTypes.DATE, allowNull: true },
    attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    result: { type: DataTypes.JSONB, allowNull: true },
    error: { type: DataTypes.TEXT, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: qi.sequelize.fn('now') },
    started_at: { type: DataTypes.DATE, allowNull: true },
    finished_at: { type: DataTypes.DATE, allowNull: true },
  })
  await qi.sequelize.query(`ALTER TABLE triage_results ADD CONSTRAINT triage_results_state_check CHECK (state IN ('queued', 'running', 'done', 'failed'))`)
  await qi.addIndex('triage_results', ['team_id', 'star_id', 'id'])
  await qi.addIndex('triage_results', ['state', 'heartbeat_at'])
  await qi.addIndex('triage_results', ['finished_at'])
  const sender = createJobSender(qi.sequelize)
  if (!(await sender.getQueue('triage'))) await sender.createQueue('triage')
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('triage_results')
  await qi.dropTable('triage_runs')
  await qi.sequelize.query(`DELETE FROM pgboss.queue WHERE name = 'triage'`).catch(() => undefined)
}

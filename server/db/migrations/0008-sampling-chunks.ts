import { DataTypes, type QueryInterface } from 'sequelize'

/**
 * Append-only checkpoints of sampling runs: each checkpoint adds one chunk holding the rows of the
 * kept, thinned chain (shared/rv/chain-store.ts) since the previous one, instead of rewriting the
 * whole chain into sampling_runs. A resumed run replays the chunks up to the run's
 * checkpoint_step; a finished run keeps them (its chain, downloadable as CSV). The walkers' state
 * at the checkpoint stays in sampling_runs.checkpoint; the old BYTEA columns there are no longer
 * written.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('sampling_chunks', {
    id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
    run_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'sampling_runs', key: 'id' }, onDelete: 'CASCADE' },
    seq: { type: DataTypes.INTEGER, allowNull: false },
    first_step: { type: DataTypes.INTEGER, allowNull: false },
    last_step: { type: DataTypes.INTEGER, allowNull: false },
    n_rows: { type: DataTypes.INTEGER, allowNull: false },
    // rows' step numbers (int32), positions (rows × walkers × dims float64) and ln p (rows × walkers float64), little-endian
    steps: { type: DataTypes.BLOB, allowNull: false },
    chain: { type: DataTypes.BLOB, allowNull: false },
    lnprob: { type: DataTypes.BLOB, allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
  })
  await qi.addIndex('sampling_chunks', ['run_id', 'seq'], { unique: true })
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('sampling_chunks')
}

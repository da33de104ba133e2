import { DataTypes, type QueryInterface } from 'sequelize'

// Saved analyses of a star: fit models with their immutable versions, and periodogram runs.
const id = { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true }
const ref = (table: string, allowNull = false, onDelete = 'RESTRICT') => ({
  type: DataTypes.INTEGER, allowNull, references: { model: table, key: 'id' }, onDelete,
})
const createdAt = { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW }

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('fit_models', {
    id, star_id: ref('stars'),
    name: { type: DataTypes.STRING(120), allowNull: false },
    current_version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    created_by: ref('users', true, 'SET NULL'),
    archived_at: { type: DataTypes.DATE, allowNull: true },
    created_at: createdAt,
    updated_at: createdAt,
  })
  await qi.addIndex('fit_models', ['star_id'])
  await qi.createTable('fit_model_versions', {
    id, model_id: ref('fit_models'),
    version: { type: DataTypes.INTEGER, allowNull: false },
    name: { type: DataTypes.STRING(120), allowNull: false },
    spec: { type: DataTypes.JSONB, allowNull: false },
    status: { type: DataTypes.STRING(16), allowNull: false },
    result: { type: DataTypes.JSONB, allowNull: true },
    note: { type: DataTypes.STRING(200), allowNull: false, defaultValue: '' },
    author: ref('users', true, 'SET NULL'),
    created_at: createdAt,
  })
  // versions are numbered 1, 2, … per model and never rewritten
  await qi.addIndex('fit_model_versions', ['model_id', 'version'], { unique: true })
  await qi.sequelize.query(`ALTER TABLE fit_model_versions ADD CONSTRAINT fit_model_versions_status CHECK (status IN ('draft', 'fitted', 'failed'))`)
  await qi.createTable('periodogram_runs', {
    id, star_id: ref('stars'),
    kind: { type: DataTypes.STRING(16), allowNull: false },
    indicator: { type: DataTypes.STRING(120), allowNull: true },
    model_version_id: ref('fit_model_versions', true),
    settings: { type: DataTypes.JSONB, allowNull: false },
    data: { type: DataTypes.JSONB, allowNull: false },
    result: { type: DataTypes.JSONB, allowNull: false },
    top_peak: { type: DataTypes.JSONB, allowNull: true },
    created_by: ref('users', true, 'SET NULL'),
    created_at: createdAt,
  })
  await qi.sequelize.query(`ALTER TABLE periodogram_runs ADD CONSTRAINT periodogram_runs_kind CHECK (kind IN ('rv', 'indicator', 'residuals'))`)
  await qi.addIndex('periodogram_runs', ['star_id', 'created_at'])
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('periodogram_runs')
  await qi.dropTable('fit_model_versions')
  await qi.dropTable('fit_models')
}

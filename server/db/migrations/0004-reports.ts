import { DataTypes, type QueryInterface } from 'sequelize'

// Reports: one per fit model; frozen versions (a JSONB snapshot never rewritten), shares with
// co-authors, and reviews (comments, change requests, approvals) on one version each.
const id = { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true }
const ref = (table: string, allowNull = false, onDelete = 'RESTRICT') => ({
  type: DataTypes.INTEGER, allowNull, references: { model: table, key: 'id' }, onDelete,
})
const createdAt = { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW }

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('reports', {
    id, star_id: ref('stars'), model_id: ref('fit_models'),
    title: { type: DataTypes.STRING(200), allowNull: false },
    current_version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    created_by: ref('users', true, 'SET NULL'),
    created_at: createdAt, updated_at: createdAt,
  })
  await qi.addIndex('reports', ['model_id'], { unique: true })
  await qi.addIndex('reports', ['star_id'])
  await qi.createTable('report_versions', {
    id, report_id: ref('reports'),
    version: { type: DataTypes.INTEGER, allowNull: false },
    model_version_id: ref('fit_model_versions'),
    sampling_run_id: { type: DataTypes.INTEGER, allowNull: true },
    data_hash: { type: DataTypes.STRING(64), allowNull: false },
    fingerprint: { type: DataTypes.STRING(300), allowNull: false },
    snapshot: { type: DataTypes.JSONB, allowNull: false },
    changes: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
    frozen_by: ref('users', true, 'SET NULL'),
    created_at: createdAt,
  })
  await qi.addIndex('report_versions', ['report_id', 'version'], { unique: true })
  // a frozen version is never changed: the database refuses updates of the snapshot
  await qi.sequelize.query(`CREATE FUNCTION report_versions_frozen() RETURNS trigger AS $$
    BEGIN RAISE EXCEPTION 'report versions are frozen'; END $$ LANGUAGE plpgsql`)
  await qi.sequelize.query(`CREATE TRIGGER report_versions_frozen BEFORE UPDATE ON report_versions FOR EACH ROW EXECUTE FUNCTION report_versions_frozen()`)
  await qi.createTable('report_shares', {
    id, report_id: ref('reports', false, 'CASCADE'),
    user_id: ref('users', true, 'SET NULL'),
    email: { type: DataTypes.STRING(320), allowNull: false },
    invitation_id: ref('invitations', true, 'SET NULL'),
    version: { type: DataTypes.INTEGER, allowNull: false },
    shared_by: ref('users', true, 'SET NULL'),
    created_at: createdAt,
  })
  await qi.addIndex('report_shares', ['report_id'])
  await qi.createTable('report_reviews', {
    id, report_id: ref('reports', false, 'CASCADE'),
    version: { type: DataTypes.INTEGER, allowNull: false },
    user_id: ref('users', true, 'SET NULL'),
    kind: { type: DataTypes.STRING(20), allowNull: false },
    parameter: { type: DataTypes.STRING(80), allowNull: true },
    body: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    created_at: createdAt,
  })
  await qi.sequelize.query(`ALTER TABLE report_reviews ADD CONSTRAINT report_reviews_kind CHECK (kind IN ('comment', 'approve', 'request_changes'))`)
  await qi.addIndex('report_reviews', ['report_id', 'version'])
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('report_reviews')
  await qi.dropTable('report_shares')
  await qi.dropTable('report_versions')
  await qi.sequelize.query('DROP FUNCTION IF EXISTS report_versions_frozen() CASCADE')
  await qi.dropTable('reports')
}

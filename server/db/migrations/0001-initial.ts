import { DataTypes, type QueryInterface } from 'sequelize'

const id = { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true }
const ref = (table: string, allowNull = false, onDelete = 'RESTRICT') => ({
  type: DataTypes.INTEGER, allowNull, references: { model: table, key: 'id' }, onDelete,
})
const stamps = {
  created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
  updated_at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
}
const roleEnum = DataTypes.ENUM('owner', 'analyst', 'reviewer')

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('users', {
    id,
    email: { type: DataTypes.STRING(320), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    password_hash: { type: DataTypes.STRING(100), allowNull: false },
    token_version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    ...stamps,
  })
  await qi.createTable('teams', { id, name: { type: DataTypes.STRING(120), allowNull: false }, ...stamps })
  await qi.createTable('memberships', {
    id, user_id: ref('users', false, 'CASCADE'), team_id: ref('teams', false, 'CASCADE'),
    role: { type: roleEnum, allowNull: false }, ...stamps,
  })
  await qi.addIndex('memberships', ['user_id', 'team_id'], { unique: true })
  await qi.addIndex('memberships', ['team_id'])
  await qi.createTable('invitations', {
    id, team_id: ref('teams', false, 'CASCADE'),
    email: { type: DataTypes.STRING(320), allowNull: false },
    role: { type: DataTypes.ENUM('owner', 'analyst', 'reviewer'), allowNull: false },
    token_hash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    expires_at: { type: DataTypes.DATE, allowNull: false },
    accepted_at: { type: DataTypes.DATE, allowNull: true },
    invited_by: ref('users', true, 'SET NULL'),
    ...stamps,
  })
  await qi.addIndex('invitations', ['team_id'])
  await qi.createTable('password_resets', {
    id, user_id: ref('users', false, 'CASCADE'),
    token_hash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    expires_at: { type: DataTypes.DATE, allowNull: false },
    used_at: { type: DataTypes.DATE, allowNull: true },
    ...stamps,
  })
  await qi.createTable('stars', {
    id, team_id: ref('teams'),
    name: { type: DataTypes.STRING(120), allowNull: false },
    mass_msun: { type: DataTypes.DOUBLE, allowNull: false },
    mass_err_msun: { type: DataTypes.DOUBLE, allowNull: false },
    radius_rsun: { type: DataTypes.DOUBLE, allowNull: true },
    teff_k: { type: DataTypes.DOUBLE, allowNull: true },
    luminosity_lsun: { type: DataTypes.DOUBLE, allowNull: true },
    ra_deg: { type: DataTypes.DOUBLE, allowNull: true },
    dec_deg: { type: DataTypes.DOUBLE, allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: true },
    archived_at: { type: DataTypes.DATE, allowNull: true },
    ...stamps,
  })
  // A name is unique within a team among the stars still in use; archived ones free their name.
  await qi.addIndex('stars', ['team_id', 'name'], { unique: true, where: { archived_at: null }, name: 'stars_team_name_active' })
  await qi.createTable('raw_files', {
    id, team_id: ref('teams'),
    file_name: { type: DataTypes.STRING(255), allowNull: false },
    size: { type: DataTypes.INTEGER, allowNull: false },
    sha256: { type: DataTypes.STRING(64), allowNull: false },
    bytes: { type: DataTypes.BLOB, allowNull: false },
    uploaded_by: ref('users', true, 'SET NULL'),
    created_at: stamps.created_at,
  })
  await qi.createTable('datasets', {
    id, star_id: ref('stars'), raw_file_id: ref('raw_files'),
    instrument: { type: DataTypes.STRING(120), allowNull: false },
    file_name: { type: DataTypes.STRING(255), allowNull: false },
    file_sha256: { type: DataTypes.STRING(64), allowNull: false },
    detected_mapping: { type: DataTypes.JSONB, allowNull: true },
    confirmed_mapping: { type: DataTypes.JSONB, allowNull: false },
    unit: { type: DataTypes.STRING(16), allowNull: false },
    time_format: { type: DataTypes.STRING(32), allowNull: false },
    uploaded_by: ref('users', true, 'SET NULL'),
    ...stamps,
  })
  await qi.addIndex('datasets', ['star_id'])
  await qi.createTable('measurements', {
    id,
    dataset_id: ref('datasets'), star_id: ref('stars'),
    line: { type: DataTypes.INTEGER, allowNull: true },
    time: { type: DataTypes.DOUBLE, allowNull: false },
    rv: { type: DataTypes.DOUBLE, allowNull: false },
    error: { type: DataTypes.DOUBLE, allowNull: false },
    indicators: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
    excluded: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    excluded_reason: { type: DataTypes.TEXT, allowNull: true },
    excluded_by: ref('users', true, 'SET NULL'),
    excluded_at: { type: DataTypes.DATE, allowNull: true },
  })
  await qi.addIndex('measurements', ['star_id', 'time'])
  await qi.addIndex('measurements', ['dataset_id'])
  await qi.createTable('audit_log', {
    id, team_id: ref('teams', false, 'CASCADE'), user_id: ref('users', true, 'SET NULL'),
    action: { type: DataTypes.STRING(64), allowNull: false },
    entity: { type: DataTypes.STRING(64), allowNull: false },
    entity_id: { type: DataTypes.INTEGER, allowNull: true },
    detail: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
    at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
  })
  await qi.addIndex('audit_log', ['team_id', 'at'])
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  for (const t of ['audit_log', 'measurements', 'datasets', 'raw_files', 'stars', 'password_resets', 'invitations', 'memberships', 'teams', 'users']) {
    await qi.dropTable(t)
  }
  await qi.sequelize.query('DROP TYPE IF EXISTS "enum_memberships_role"; DROP TYPE IF EXISTS "enum_invitations_role";')
}

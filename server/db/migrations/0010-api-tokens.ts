import { DataTypes, type QueryInterface } from 'sequelize'

// Personal API tokens: a member's key for scripts and notebooks, limited to one team and optionally
// to reading. Only the SHA-256 of a token is stored; it is shown once, when created.
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('api_tokens', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    user_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    team_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'teams', key: 'id' }, onDelete: 'CASCADE' },
    name: { type: DataTypes.STRING(80), allowNull: false },
    token_hash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    read_only: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
    expires_at: { type: DataTypes.DATE, allowNull: true },
    last_used_at: { type: DataTypes.DATE, allowNull: true },
    revoked_at: { type: DataTypes.DATE, allowNull: true },
  })
  await qi.addIndex('api_tokens', ['user_id', 'team_id'])
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.dropTable('api_tokens')
}

import { DataTypes, type QueryInterface } from 'sequelize'

// Security (issue 11): server-side sessions (revoked on sign-out), invitations that wait for an
// owner's approval (an analyst's share with an outsider), and one open invitation per address and team.
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.createTable('sessions', {
    // sha256 of the session id carried in the signed cookie: a copy of this table signs nobody in
    id_hash: { type: DataTypes.STRING(64), primaryKey: true },
    user_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
    expires_at: { type: DataTypes.DATE, allowNull: false },
  })
  await qi.addIndex('sessions', ['user_id'])
  await qi.addColumn('invitations', 'pending_approval', { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false })
  // keep the newest open invitation per team and address before the unique index
  await qi.sequelize.query(`DELETE FROM invitations i USING invitations j
    WHERE i.accepted_at IS NULL AND j.accepted_at IS NULL AND i.team_id = j.team_id AND i.email = j.email AND i.id < j.id`)
  await qi.addIndex('invitations', ['team_id', 'email'], { unique: true, where: { accepted_at: null }, name: 'invitations_open_per_address' })
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.removeIndex('invitations', 'invitations_open_per_address')
  await qi.removeColumn('invitations', 'pending_approval')
  await qi.dropTable('sessions')
}

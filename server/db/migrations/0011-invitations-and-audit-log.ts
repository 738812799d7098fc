import { DataTypes, type QueryInterface } from 'sequelize'

/** Invitations to the team (one-time links, only a SHA-256 of the token is kept) and the audit log. */
export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  const now = q.sequelize.literal('now()')
  const user = (onDelete: string) => ({ type: DataTypes.UUID, allowNull: true, references: { model: 'users', key: 'id' }, onDelete })
  await q.createTable('team_invitations', {
    id: { type: DataTypes.UUID, primaryKey: true, allowNull: false, defaultValue: q.sequelize.literal('gen_random_uuid()') },
    email: { type: DataTypes.STRING(254), allowNull: false },
    name: { type: DataTypes.STRING(120), allowNull: false },
    // The users' role enum of migration 0001, named as a type (QueryInterface would otherwise create a second enum type).
    role: { type: 'enum_users_role' as unknown as typeof DataTypes.STRING, allowNull: false },
    token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    invited_by: user('SET NULL'),
    created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: now },
    expires_at: { type: DataTypes.DATE, allowNull: false },
    accepted_at: { type: DataTypes.DATE, allowNull: true },
    accepted_user_id: user('SET NULL'),
    revoked_at: { type: DataTypes.DATE, allowNull: true },
  })
  await q.addConstraint('team_invitations', {
    type: 'check', name: 'team_invitations_role_check', fields: ['role'],
    where: { role: ['advisor', 'supervisor'] },
  })
  await q.addIndex('team_invitations', { fields: [q.sequelize.fn('lower', q.sequelize.col('email')), { name: 'created_at', order: 'DESC' as const }], name: 'team_invitations_email' })

  await q.createTable('audit_log', {
    id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
    actor_id: user('SET NULL'),
    action: { type: DataTypes.STRING(40), allowNull: false },
    target_user_id: user('SET NULL'),
    target_name: { type: DataTypes.STRING(120), allowNull: true },
    target_email: { type: DataTypes.STRING(254), allowNull: true },
    details: { type: DataTypes.JSONB, allowNull: false, defaultValue: q.sequelize.literal("'{}'") },
    created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: now },
  })
  await q.addIndex('audit_log', { fields: [{ name: 'created_at', order: 'DESC' as const }, { name: 'id', order: 'DESC' as const }], name: 'audit_log_time' })
  await q.addIndex('audit_log', { fields: ['actor_id', { name: 'created_at', order: 'DESC' as const }], name: 'audit_log_actor' })
  await q.addIndex('audit_log', { fields: ['action', { name: 'created_at', order: 'DESC' as const }], name: 'audit_log_action' })
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.dropTable('audit_log')
  await q.dropTable('team_invitations')
}

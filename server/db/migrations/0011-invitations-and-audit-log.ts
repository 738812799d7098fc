import { DataTypes, type QueryInterface } from 'sequelize'
import { desc, emptyLiteral, lower, maybeAt, ref, serialKey, stamp, uuidKey } from '../migration-columns'

/** Invitations to the team (one-time links, only a SHA-256 of the token is kept) and the audit log. */
export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.createTable('team_invitations', {
    id: uuidKey(),
    email: { type: DataTypes.STRING(254), allowNull: false },
    name: { type: DataTypes.STRING(120), allowNull: false },
    // The users' role enum of migration 0001, named as a type (QueryInterface would otherwise create a second enum type).
    role: { type: 'enum_users_role' as unknown as typeof DataTypes.STRING, allowNull: false },
    token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    invited_by: ref('users', 'SET NULL'),
    created_at: stamp(),
    expires_at: { type: DataTypes.DATE, allowNull: false },
    accepted_at: maybeAt(),
    accepted_user_id: ref('users', 'SET NULL'),
    revoked_at: maybeAt(),
  })
  await q.addConstraint('team_invitations', { type: 'check', name: 'team_invitations_role_check', fields: ['role'], where: { role: ['advisor', 'supervisor'] } })
  await q.addIndex('team_invitations', { fields: [lower('email'), desc('created_at')], name: 'team_invitations_email' })

  await q.createTable('audit_log', {
    id: serialKey(),
    actor_id: ref('users', 'SET NULL'),
    action: { type: DataTypes.STRING(40), allowNull: false },
    target_user_id: ref('users', 'SET NULL'),
    target_name: { type: DataTypes.STRING(120), allowNull: true },
    target_email: { type: DataTypes.STRING(254), allowNull: true },
    details: { type: DataTypes.JSONB, allowNull: false, defaultValue: emptyLiteral() },
    created_at: stamp(),
  })
  await q.addIndex('audit_log', { fields: [desc('created_at'), desc('id')], name: 'audit_log_time' })
  await q.addIndex('audit_log', { fields: ['actor_id', desc('created_at')], name: 'audit_log_actor' })
  await q.addIndex('audit_log', { fields: ['action', desc('created_at')], name: 'audit_log_action' })
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.dropTable('audit_log')
  await q.dropTable('team_invitations')
}

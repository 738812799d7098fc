import { DataTypes, type QueryInterface } from 'sequelize'
import { desc, emptyLiteral, lower, maybeAt, optional, ref, required, serialKey, stamp, uuidKey } from '../columns'

/** Invitations to the team (one-time links, only a SHA-256 of the token is kept) and the audit log. */
export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.createTable('team_invitations', {
    id: uuidKey(),
    email: required(DataTypes.STRING(254)),
    name: required(DataTypes.STRING(120)),
    // The users' role enum of migration 0001, named as a type (QueryInterface would otherwise create a second enum type).
    role: { type: 'enum_users_role' as unknown as typeof DataTypes.STRING, allowNull: false },
    token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    invited_by: ref('users', 'SET NULL'),
    created_at: stamp(),
    expires_at: required(DataTypes.DATE),
    accepted_at: maybeAt(),
    accepted_user_id: ref('users', 'SET NULL'),
    revoked_at: maybeAt(),
  })
  await q.addConstraint('team_invitations', { type: 'check', name: 'team_invitations_role_check', fields: ['role'], where: { role: ['advisor', 'supervisor'] } })
  await q.addIndex('team_invitations', { fields: [lower('email'), desc('created_at')], name: 'team_invitations_email' })

  await q.createTable('audit_log', {
    id: serialKey(),
    actor_id: ref('users', 'SET NULL'),
    action: required(DataTypes.STRING(40)),
    target_user_id: ref('users', 'SET NULL'),
    target_name: optional(DataTypes.STRING(120)),
    target_email: optional(DataTypes.STRING(254)),
    details: required(DataTypes.JSONB, emptyLiteral()),
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

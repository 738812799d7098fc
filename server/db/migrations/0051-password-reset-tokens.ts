import { DataTypes, type QueryInterface } from 'sequelize'
import { desc, maybeAt, ref, required, stamp, uuidKey } from '../columns'

/**
 * One-time links for choosing a new password. Only a SHA-256 of the token is kept (a leaked row
 * cannot be turned back into a working link); `spent_at` marks a link used, or replaced by a
 * newer one, or spent by a reset through another link.
 */
export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.createTable('password_reset_tokens', {
    id: uuidKey(),
    user_id: ref('users', 'CASCADE', true),
    token_hash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    created_at: stamp(),
    expires_at: required(DataTypes.DATE),
    spent_at: maybeAt(),
  })
  await q.addIndex('password_reset_tokens', { fields: ['user_id', desc('created_at')], name: 'password_reset_tokens_user' })
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.dropTable('password_reset_tokens')
}

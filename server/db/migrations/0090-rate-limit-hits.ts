import { DataTypes, type QueryInterface } from 'sequelize'
import { required } from '../columns'

/**
 * Rate-limit counters shared by every node (express-rate-limit's store, server/middleware/rate-limit-store.ts):
 * one row per limiter and client key (the key itself is kept only as a SHA-256, as it may be an e-mail
 * address), the hits of the current window and when that window ends. Expired rows are deleted by the store.
 */
export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.createTable('rate_limit_hits', {
    key: { type: DataTypes.STRING(100), primaryKey: true, allowNull: false },
    hits: required(DataTypes.INTEGER, 0),
    reset_at: required(DataTypes.DATE),
  })
  await q.addIndex('rate_limit_hits', { fields: ['reset_at'], name: 'rate_limit_hits_reset_at' })
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.dropTable('rate_limit_hits')
}

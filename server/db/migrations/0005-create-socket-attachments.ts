import { DataTypes, type QueryInterface } from 'sequelize'
import { now, optional } from '../columns'

/** The table @socket.io/postgres-adapter uses for payloads too large for NOTIFY (its README's schema: no primary key, nullable columns). */
export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.createTable('socket_io_attachments', {
    id: { type: DataTypes.BIGINT, autoIncrement: true, unique: true },
    created_at: { type: DataTypes.DATE, allowNull: true, defaultValue: now() },
    payload: optional(DataTypes.BLOB),
  })
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.dropTable('socket_io_attachments')
}

import { DataTypes, type QueryInterface } from 'sequelize'
import { desc, ref, required, stamp, uuidKey } from '../columns'

export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.createTable('rooms', {
    id: uuidKey(),
    owner_id: ref('users', 'CASCADE', true),
    name: required(DataTypes.STRING(120)),
    current_revision: required(DataTypes.INTEGER, 1),
    created_at: stamp(),
    updated_at: stamp(),
  })
  await q.addIndex('rooms', { fields: ['owner_id', desc('updated_at')], name: 'rooms_owner' })
  await q.createTable('room_revisions', {
    room_id: { ...ref('rooms', 'CASCADE', true), primaryKey: true },
    revision: { type: DataTypes.INTEGER, primaryKey: true, allowNull: false },
    body: required(DataTypes.JSONB),
    created_by: ref('users', 'SET NULL'),
    created_at: stamp(),
  })
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.dropTable('room_revisions')
  await q.dropTable('rooms')
}

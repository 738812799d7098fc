import { DataTypes, type QueryInterface } from 'sequelize'

export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  const now = q.sequelize.literal('now()')
  await q.createTable('rooms', {
    id: { type: DataTypes.UUID, primaryKey: true, allowNull: false, defaultValue: q.sequelize.literal('gen_random_uuid()') },
    owner_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    name: { type: DataTypes.STRING(120), allowNull: false },
    current_revision: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: now },
    updated_at: { type: DataTypes.DATE, allowNull: false, defaultValue: now },
  })
  await q.addIndex('rooms', { fields: ['owner_id', { name: 'updated_at', order: 'DESC' as const }], name: 'rooms_owner' })
  await q.createTable('room_revisions', {
    room_id: { type: DataTypes.UUID, primaryKey: true, allowNull: false, references: { model: 'rooms', key: 'id' }, onDelete: 'CASCADE' },
    revision: { type: DataTypes.INTEGER, primaryKey: true, allowNull: false },
    body: { type: DataTypes.JSONB, allowNull: false },
    created_by: { type: DataTypes.UUID, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: now },
  })
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.dropTable('room_revisions')
  await q.dropTable('rooms')
}

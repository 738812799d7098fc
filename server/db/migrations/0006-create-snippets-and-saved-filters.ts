import { DataTypes, type QueryInterface } from 'sequelize'
import { lower, ref, stamp, uuidKey } from '../migration-columns'

export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.createTable('reply_snippets', {
    id: uuidKey(),
    title: { type: DataTypes.STRING(80), allowNull: false },
    body: { type: DataTypes.TEXT, allowNull: false },
    created_by: ref('users', 'SET NULL'),
    created_at: stamp(),
    updated_at: stamp(),
  })
  await q.addIndex('reply_snippets', { fields: [lower('title')], name: 'reply_snippets_title', unique: true })
  await q.createTable('saved_filters', {
    id: uuidKey(),
    user_id: ref('users', 'CASCADE', true),
    name: { type: DataTypes.STRING(60), allowNull: false },
    query: { type: DataTypes.JSONB, allowNull: false },
    created_at: stamp(),
  })
  await q.addIndex('saved_filters', { fields: ['user_id', lower('name')], name: 'saved_filters_user_name', unique: true })
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.dropTable('saved_filters')
  await q.dropTable('reply_snippets')
}

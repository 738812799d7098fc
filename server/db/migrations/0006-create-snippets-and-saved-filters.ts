import { DataTypes, type QueryInterface } from 'sequelize'
import { lower, ref, required, stamp, uuidKey } from '../columns'

export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.createTable('reply_snippets', {
    id: uuidKey(),
    title: required(DataTypes.STRING(80)),
    body: required(DataTypes.TEXT),
    created_by: ref('users', 'SET NULL'),
    created_at: stamp(),
    updated_at: stamp(),
  })
  await q.addIndex('reply_snippets', { fields: [lower('title')], name: 'reply_snippets_title', unique: true })
  await q.createTable('saved_filters', {
    id: uuidKey(),
    user_id: ref('users', 'CASCADE', true),
    name: required(DataTypes.STRING(60)),
    query: required(DataTypes.JSONB),
    created_at: stamp(),
  })
  await q.addIndex('saved_filters', { fields: ['user_id', lower('name')], name: 'saved_filters_user_name', unique: true })
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.dropTable('saved_filters')
  await q.dropTable('reply_snippets')
}

import { DataTypes, type QueryInterface } from 'sequelize'

export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  const now = q.sequelize.literal('now()')
  const uuid = q.sequelize.literal('gen_random_uuid()')
  await q.createTable('reply_snippets', {
    id: { type: DataTypes.UUID, primaryKey: true, allowNull: false, defaultValue: uuid },
    title: { type: DataTypes.STRING(80), allowNull: false },
    body: { type: DataTypes.TEXT, allowNull: false },
    created_by: { type: DataTypes.UUID, allowNull: true, references: { model: 'users', key: 'id' }, onDelete: 'SET NULL' },
    created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: now },
    updated_at: { type: DataTypes.DATE, allowNull: false, defaultValue: now },
  })
  await q.addIndex('reply_snippets', { fields: [q.sequelize.fn('lower', q.sequelize.col('title'))], name: 'reply_snippets_title', unique: true })
  await q.createTable('saved_filters', {
    id: { type: DataTypes.UUID, primaryKey: true, allowNull: false, defaultValue: uuid },
    user_id: { type: DataTypes.UUID, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    name: { type: DataTypes.STRING(60), allowNull: false },
    query: { type: DataTypes.JSONB, allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: now },
  })
  await q.addIndex('saved_filters', { fields: ['user_id', q.sequelize.fn('lower', q.sequelize.col('name'))], name: 'saved_filters_user_name', unique: true })
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.dropTable('saved_filters')
  await q.dropTable('reply_snippets')
}

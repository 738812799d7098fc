import { DataTypes, Op, type QueryInterface } from 'sequelize'

export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  const now = q.sequelize.literal('now()')
  const ref = (model: string) => ({ type: DataTypes.UUID, allowNull: true, references: { model, key: 'id' }, onDelete: 'SET NULL' })
  await q.createTable('email_outbox', {
    id: { type: DataTypes.UUID, primaryKey: true, allowNull: false },
    to_address: { type: DataTypes.STRING(254), allowNull: false },
    to_user_id: ref('users'),
    kind: { type: DataTypes.STRING(40), allowNull: false },
    case_id: ref('cases'),
    subject: { type: DataTypes.STRING(300), allowNull: false },
    html: { type: DataTypes.TEXT, allowNull: false },
    text: { type: DataTypes.TEXT, allowNull: false },
    reply_to: { type: DataTypes.STRING(254), allowNull: true },
    status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'queued' },
    attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    last_error: { type: DataTypes.TEXT, allowNull: true },
    next_attempt_at: { type: DataTypes.DATE, allowNull: false, defaultValue: now },
    sent_at: { type: DataTypes.DATE, allowNull: true },
    message_id: { type: DataTypes.STRING(255), allowNull: false, unique: true },
    job_id: { type: DataTypes.UUID, allowNull: true },
    smtp_response: { type: DataTypes.TEXT, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: now },
    updated_at: { type: DataTypes.DATE, allowNull: false, defaultValue: now },
  })
  await q.addConstraint('email_outbox', { type: 'check', name: 'email_outbox_status_check', fields: ['status'], where: { status: ['queued', 'sent', 'failed'] } })
  await q.addIndex('email_outbox', { fields: ['next_attempt_at'], name: 'email_outbox_queued', where: { status: 'queued' } })
  await q.addIndex('email_outbox', { fields: ['case_id', 'created_at'], name: 'email_outbox_case', where: { case_id: { [Op.ne]: null } } })
  await q.addIndex('email_outbox', { fields: ['to_user_id', 'created_at'], name: 'email_outbox_user', where: { to_user_id: { [Op.ne]: null } } })

  await q.createTable('dev_mailbox', {
    id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
    message_id: { type: DataTypes.STRING(255), allowNull: true },
    envelope_from: { type: DataTypes.STRING(254), allowNull: true },
    envelope_to: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false, defaultValue: q.sequelize.literal("'{}'") },
    subject: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    text: { type: DataTypes.TEXT, allowNull: true },
    html: { type: DataTypes.TEXT, allowNull: true },
    headers: { type: DataTypes.JSONB, allowNull: false, defaultValue: q.sequelize.literal("'{}'") },
    raw_size: { type: DataTypes.INTEGER, allowNull: false },
    received_at: { type: DataTypes.DATE, allowNull: false, defaultValue: now },
  })
  await q.addIndex('dev_mailbox', { fields: [{ name: 'received_at', order: 'DESC' as const }], name: 'dev_mailbox_received' })
  await q.addIndex('dev_mailbox', { fields: ['message_id'], name: 'dev_mailbox_message_id' })

  await q.createTable('inbound_email_log', {
    id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
    via: { type: DataTypes.STRING(10), allowNull: false },
    status: { type: DataTypes.STRING(10), allowNull: false },
    reason: { type: DataTypes.STRING(40), allowNull: true },
    to_address: { type: DataTypes.TEXT, allowNull: true },
    from_address: { type: DataTypes.TEXT, allowNull: true },
    subject: { type: DataTypes.TEXT, allowNull: true },
    case_id: ref('cases'),
    created_at: { type: DataTypes.DATE, allowNull: false, defaultValue: now },
  })
  await q.addConstraint('inbound_email_log', { type: 'check', name: 'inbound_email_log_via_check', fields: ['via'], where: { via: ['smtp', 'webhook'] } })
  await q.addConstraint('inbound_email_log', { type: 'check', name: 'inbound_email_log_status_check', fields: ['status'], where: { status: ['accepted', 'rejected'] } })
  await q.addIndex('inbound_email_log', { fields: [{ name: 'created_at', order: 'DESC' as const }], name: 'inbound_email_log_time' })
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.dropTable('inbound_email_log')
  await q.dropTable('dev_mailbox')
  await q.dropTable('email_outbox')
}

import { DataTypes, Op, type QueryInterface } from 'sequelize'
import { desc, emptyLiteral, maybeAt, ref, serialKey, stamp } from '../migration-columns'

export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.createTable('email_outbox', {
    id: { type: DataTypes.UUID, primaryKey: true, allowNull: false },
    to_address: { type: DataTypes.STRING(254), allowNull: false },
    to_user_id: ref('users', 'SET NULL'),
    kind: { type: DataTypes.STRING(40), allowNull: false },
    case_id: ref('cases', 'SET NULL'),
    subject: { type: DataTypes.STRING(300), allowNull: false },
    html: { type: DataTypes.TEXT, allowNull: false },
    text: { type: DataTypes.TEXT, allowNull: false },
    reply_to: { type: DataTypes.STRING(254), allowNull: true },
    status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'queued' },
    attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    last_error: { type: DataTypes.TEXT, allowNull: true },
    next_attempt_at: stamp(),
    sent_at: maybeAt(),
    message_id: { type: DataTypes.STRING(255), allowNull: false, unique: true },
    job_id: { type: DataTypes.UUID, allowNull: true },
    smtp_response: { type: DataTypes.TEXT, allowNull: true },
    created_at: stamp(),
    updated_at: stamp(),
  })
  await q.addConstraint('email_outbox', { type: 'check', name: 'email_outbox_status_check', fields: ['status'], where: { status: ['queued', 'sent', 'failed'] } })
  await q.addIndex('email_outbox', { fields: ['next_attempt_at'], name: 'email_outbox_queued', where: { status: 'queued' } })
  await q.addIndex('email_outbox', { fields: ['case_id', 'created_at'], name: 'email_outbox_case', where: { case_id: { [Op.ne]: null } } })
  await q.addIndex('email_outbox', { fields: ['to_user_id', 'created_at'], name: 'email_outbox_user', where: { to_user_id: { [Op.ne]: null } } })

  await q.createTable('dev_mailbox', {
    id: serialKey(),
    message_id: { type: DataTypes.STRING(255), allowNull: true },
    envelope_from: { type: DataTypes.STRING(254), allowNull: true },
    envelope_to: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false, defaultValue: emptyLiteral() },
    subject: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    text: { type: DataTypes.TEXT, allowNull: true },
    html: { type: DataTypes.TEXT, allowNull: true },
    headers: { type: DataTypes.JSONB, allowNull: false, defaultValue: emptyLiteral() },
    raw_size: { type: DataTypes.INTEGER, allowNull: false },
    received_at: stamp(),
  })
  await q.addIndex('dev_mailbox', { fields: [desc('received_at')], name: 'dev_mailbox_received' })
  await q.addIndex('dev_mailbox', { fields: ['message_id'], name: 'dev_mailbox_message_id' })

  await q.createTable('inbound_email_log', {
    id: serialKey(),
    via: { type: DataTypes.STRING(10), allowNull: false },
    status: { type: DataTypes.STRING(10), allowNull: false },
    reason: { type: DataTypes.STRING(40), allowNull: true },
    to_address: { type: DataTypes.TEXT, allowNull: true },
    from_address: { type: DataTypes.TEXT, allowNull: true },
    subject: { type: DataTypes.TEXT, allowNull: true },
    case_id: ref('cases', 'SET NULL'),
    created_at: stamp(),
  })
  await q.addConstraint('inbound_email_log', { type: 'check', name: 'inbound_email_log_via_check', fields: ['via'], where: { via: ['smtp', 'webhook'] } })
  await q.addConstraint('inbound_email_log', { type: 'check', name: 'inbound_email_log_status_check', fields: ['status'], where: { status: ['accepted', 'rejected'] } })
  await q.addIndex('inbound_email_log', { fields: [desc('created_at')], name: 'inbound_email_log_time' })
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  for (const table of ['inbound_email_log', 'dev_mailbox', 'email_outbox']) await q.dropTable(table)
}

import { DataTypes, Op, type QueryInterface } from 'sequelize'
import { desc, emptyLiteral, maybeAt, optional, ref, required, serialKey, stamp } from '../columns'

export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.createTable('email_outbox', {
    id: { type: DataTypes.UUID, primaryKey: true, allowNull: false },
    to_address: required(DataTypes.STRING(254)),
    to_user_id: ref('users', 'SET NULL'),
    kind: required(DataTypes.STRING(40)),
    case_id: ref('cases', 'SET NULL'),
    subject: required(DataTypes.STRING(300)),
    html: required(DataTypes.TEXT),
    text: required(DataTypes.TEXT),
    reply_to: optional(DataTypes.STRING(254)),
    status: required(DataTypes.STRING(10), 'queued'),
    attempts: required(DataTypes.INTEGER, 0),
    last_error: optional(DataTypes.TEXT),
    next_attempt_at: stamp(),
    sent_at: maybeAt(),
    message_id: { type: DataTypes.STRING(255), allowNull: false, unique: true },
    job_id: optional(DataTypes.UUID),
    smtp_response: optional(DataTypes.TEXT),
    created_at: stamp(),
    updated_at: stamp(),
  })
  await q.addConstraint('email_outbox', { type: 'check', name: 'email_outbox_status_check', fields: ['status'], where: { status: ['queued', 'sent', 'failed'] } })
  await q.addIndex('email_outbox', { fields: ['next_attempt_at'], name: 'email_outbox_queued', where: { status: 'queued' } })
  await q.addIndex('email_outbox', { fields: ['case_id', 'created_at'], name: 'email_outbox_case', where: { case_id: { [Op.ne]: null } } })
  await q.addIndex('email_outbox', { fields: ['to_user_id', 'created_at'], name: 'email_outbox_user', where: { to_user_id: { [Op.ne]: null } } })

  await q.createTable('dev_mailbox', {
    id: serialKey(),
    message_id: optional(DataTypes.STRING(255)),
    envelope_from: optional(DataTypes.STRING(254)),
    envelope_to: required(DataTypes.ARRAY(DataTypes.TEXT), emptyLiteral()),
    subject: required(DataTypes.TEXT, ''),
    text: optional(DataTypes.TEXT),
    html: optional(DataTypes.TEXT),
    headers: required(DataTypes.JSONB, emptyLiteral()),
    raw_size: required(DataTypes.INTEGER),
    received_at: stamp(),
  })
  await q.addIndex('dev_mailbox', { fields: [desc('received_at')], name: 'dev_mailbox_received' })
  await q.addIndex('dev_mailbox', { fields: ['message_id'], name: 'dev_mailbox_message_id' })

  await q.createTable('inbound_email_log', {
    id: serialKey(),
    via: required(DataTypes.STRING(10)),
    status: required(DataTypes.STRING(10)),
    reason: optional(DataTypes.STRING(40)),
    to_address: optional(DataTypes.TEXT),
    from_address: optional(DataTypes.TEXT),
    subject: optional(DataTypes.TEXT),
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

import { DataTypes, type QueryInterface } from 'sequelize'
import { ref, required, stamp, uuidKey } from '../columns'

/**
 * One row per e-mail a case has taken in (posted as the listener's message, or held for the team), keyed
 * by the e-mail's identity: a SHA-256 of its Message-ID (RFC 5322 §3.6.4), or, when it has none, of its
 * normalised headers and text (server/mail/inbound-identity.ts). The unique (case_id, message_key) makes a
 * second delivery of the same e-mail — a provider retrying, a replay by whoever holds the webhook secret,
 * the same message through SMTP twice — a no-op answered "already accepted", even when the two arrive at once.
 */
export async function up({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.createTable('inbound_email_receipts', {
    id: uuidKey(),
    case_id: ref('cases', 'CASCADE', true),
    message_key: required(DataTypes.STRING(80)),
    message_id: ref('messages', 'SET NULL'),
    outcome: required(DataTypes.STRING(20)),
    received_at: stamp(),
  })
  await q.addConstraint('inbound_email_receipts', { type: 'unique', name: 'inbound_email_receipts_case_key', fields: ['case_id', 'message_key'] })
  await q.addConstraint('inbound_email_receipts', { type: 'check', name: 'inbound_email_receipts_outcome_check', fields: ['outcome'], where: { outcome: ['posted', 'sender_mismatch', 'sender_unverified'] } })
}

export async function down({ context: q }: { context: QueryInterface }): Promise<void> {
  await q.dropTable('inbound_email_receipts')
}

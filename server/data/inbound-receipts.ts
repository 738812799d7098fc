import type { Transaction } from 'sequelize'
import { models, type InboundEmailReceiptModel } from '../db/models'

export type ReceiptOutcome = InboundEmailReceiptModel['outcome']
export interface Receipt { messageId: string | null; outcome: ReceiptOutcome }

/** Thrown inside the transaction that would take in an e-mail the case already has: it rolls everything back. */
export class AlreadyReceived extends Error {
  constructor(readonly receipt: Receipt) {
    super('this e-mail was already taken in by the case')
  }
}

/** The case's receipt for an e-mail's key (../mail/inbound-identity.ts), if it has one. */
export async function findReceipt(caseId: string, messageKey: string): Promise<Receipt | null> {
  const r = await models().InboundEmailReceipt.findOne({ attributes: ['messageId', 'outcome'], where: { caseId, messageKey } })
  return r ? { messageId: r.messageId, outcome: r.outcome } : null
}

/**
 * Records, in the transaction that adds `messageId`, that the case took in the e-mail `messageKey`. The
 * insert ignores a conflict on the unique (case_id, message_key) — PostgreSQL's ON CONFLICT DO NOTHING,
 * which waits for a concurrent insert of the same key to commit or roll back — and the row then read back
 * tells whose it is: another message's means the e-mail was already taken in, and AlreadyReceived is thrown.
 */
export async function claimReceipt(r: { caseId: string; messageKey: string; messageId: string; outcome: ReceiptOutcome }, t: Transaction): Promise<void> {
  const { InboundEmailReceipt } = models()
  await InboundEmailReceipt.bulkCreate([r], { ignoreDuplicates: true, transaction: t })
  const row = await InboundEmailReceipt.findOne({ attributes: ['messageId', 'outcome'], where: { caseId: r.caseId, messageKey: r.messageKey }, transaction: t })
  if (row && row.messageId !== r.messageId) throw new AlreadyReceived({ messageId: row.messageId, outcome: row.outcome })
}

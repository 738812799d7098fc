import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { UserModel } from './user'
import type { CaseModel } from './case'
import { appUuidKey, maybeAt, optional, required, serialKey, stampNow, timestamps } from '../columns'

/** An e-mail waiting for (or done with) delivery; written in the same transaction as the change it announces. */
export class EmailOutboxModel extends Model<InferAttributes<EmailOutboxModel>, InferCreationAttributes<EmailOutboxModel>> {
  declare id: string
  declare toAddress: string
  declare toUserId: ForeignKey<UserModel['id']> | null
  declare kind: string
  declare caseId: ForeignKey<CaseModel['id']> | null
  declare subject: string
  declare html: string
  declare text: string
  declare replyTo: string | null
  declare status: CreationOptional<'queued' | 'sent' | 'failed'>
  declare attempts: CreationOptional<number>
  declare lastError: CreationOptional<string | null>
  declare nextAttemptAt: CreationOptional<Date>
  declare sentAt: CreationOptional<Date | null>
  declare messageId: string
  declare jobId: CreationOptional<string | null>
  declare smtpResponse: CreationOptional<string | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

/** What the development SMTP server received (npm start / tests; never in production). */
export class DevMailboxModel extends Model<InferAttributes<DevMailboxModel>, InferCreationAttributes<DevMailboxModel>> {
  declare id: CreationOptional<string>
  declare messageId: string | null
  declare envelopeFrom: string | null
  declare envelopeTo: CreationOptional<string[]>
  declare subject: CreationOptional<string>
  declare text: string | null
  declare html: string | null
  declare headers: CreationOptional<Record<string, unknown>>
  declare rawSize: number
  declare receivedAt: CreationOptional<Date>
}

export class InboundEmailLogModel extends Model<InferAttributes<InboundEmailLogModel>, InferCreationAttributes<InboundEmailLogModel>> {
  declare id: CreationOptional<string>
  declare via: 'smtp' | 'webhook'
  declare status: 'accepted' | 'rejected'
  declare reason: string | null
  declare toAddress: string | null
  declare fromAddress: string | null
  declare subject: string | null
  declare caseId: ForeignKey<CaseModel['id']> | null
  declare createdAt: CreationOptional<Date>
}

/**
 * An e-mail a case has taken in (migration 0100), by its identity `messageKey` (../../mail/inbound-identity.ts):
 * unique per case, so the same e-mail delivered again changes nothing.
 */
export class InboundEmailReceiptModel extends Model<InferAttributes<InboundEmailReceiptModel>, InferCreationAttributes<InboundEmailReceiptModel>> {
  declare id: CreationOptional<string>
  declare caseId: ForeignKey<CaseModel['id']>
  declare messageKey: string
  declare messageId: ForeignKey<string> | null
  declare outcome: 'posted' | 'sender_mismatch' | 'sender_unverified'
  declare receivedAt: CreationOptional<Date>
}

export function initMail(sequelize: Sequelize) {
  EmailOutboxModel.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true },
      toAddress: required(DataTypes.STRING(254)),
      kind: required(DataTypes.STRING(40)),
      subject: required(DataTypes.STRING(300)),
      html: required(DataTypes.TEXT),
      text: required(DataTypes.TEXT),
      replyTo: optional(DataTypes.STRING(254)),
      status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'queued', validate: { isIn: [['queued', 'sent', 'failed']] } },
      attempts: required(DataTypes.INTEGER, 0),
      lastError: optional(DataTypes.TEXT),
      nextAttemptAt: stampNow(),
      sentAt: maybeAt(),
      messageId: { type: DataTypes.STRING(255), allowNull: false, unique: true },
      jobId: optional(DataTypes.UUID),
      smtpResponse: optional(DataTypes.TEXT),
      ...timestamps(),
    },
    { sequelize, modelName: 'EmailOutbox', tableName: 'email_outbox', underscored: true, timestamps: false },
  )
  DevMailboxModel.init(
    {
      id: serialKey(),
      messageId: optional(DataTypes.STRING(255)),
      envelopeFrom: optional(DataTypes.STRING(254)),
      envelopeTo: required(DataTypes.ARRAY(DataTypes.TEXT), []),
      subject: required(DataTypes.TEXT, ''),
      text: optional(DataTypes.TEXT),
      html: optional(DataTypes.TEXT),
      headers: required(DataTypes.JSONB, {}),
      rawSize: required(DataTypes.INTEGER),
      receivedAt: stampNow(),
    },
    { sequelize, modelName: 'DevMailbox', tableName: 'dev_mailbox', underscored: true, timestamps: false },
  )
  InboundEmailLogModel.init(
    {
      id: serialKey(),
      via: required(DataTypes.STRING(10)),
      status: required(DataTypes.STRING(10)),
      reason: optional(DataTypes.STRING(40)),
      toAddress: optional(DataTypes.TEXT),
      fromAddress: optional(DataTypes.TEXT),
      subject: optional(DataTypes.TEXT),
      createdAt: stampNow(),
    },
    { sequelize, modelName: 'InboundEmailLog', tableName: 'inbound_email_log', underscored: true, timestamps: false },
  )
  InboundEmailReceiptModel.init(
    {
      id: appUuidKey(),
      messageKey: required(DataTypes.STRING(80)),
      outcome: { ...required(DataTypes.STRING(20)), validate: { isIn: [['posted', 'sender_mismatch', 'sender_unverified']] } },
      receivedAt: stampNow(),
    },
    { sequelize, modelName: 'InboundEmailReceipt', tableName: 'inbound_email_receipts', underscored: true, timestamps: false },
  )
}

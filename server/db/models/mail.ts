import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { UserModel } from './user'
import type { CaseModel } from './case'
import { dbNow } from './now'

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
      toAddress: { type: DataTypes.STRING(254), allowNull: false },
      kind: { type: DataTypes.STRING(40), allowNull: false },
      subject: { type: DataTypes.STRING(300), allowNull: false },
      html: { type: DataTypes.TEXT, allowNull: false },
      text: { type: DataTypes.TEXT, allowNull: false },
      replyTo: { type: DataTypes.STRING(254), allowNull: true },
      status: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'queued', validate: { isIn: [['queued', 'sent', 'failed']] } },
      attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      lastError: { type: DataTypes.TEXT, allowNull: true },
      nextAttemptAt: { type: DataTypes.DATE, allowNull: false, defaultValue: dbNow() },
      sentAt: { type: DataTypes.DATE, allowNull: true },
      messageId: { type: DataTypes.STRING(255), allowNull: false, unique: true },
      jobId: { type: DataTypes.UUID, allowNull: true },
      smtpResponse: { type: DataTypes.TEXT, allowNull: true },
      createdAt: { type: DataTypes.DATE, allowNull: false, defaultValue: dbNow() },
      updatedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: dbNow() },
    },
    { sequelize, modelName: 'EmailOutbox', tableName: 'email_outbox', underscored: true, timestamps: false },
  )
  DevMailboxModel.init(
    {
      id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
      messageId: { type: DataTypes.STRING(255), allowNull: true },
      envelopeFrom: { type: DataTypes.STRING(254), allowNull: true },
      envelopeTo: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false, defaultValue: [] },
      subject: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      text: { type: DataTypes.TEXT, allowNull: true },
      html: { type: DataTypes.TEXT, allowNull: true },
      headers: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
      rawSize: { type: DataTypes.INTEGER, allowNull: false },
      receivedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: dbNow() },
    },
    { sequelize, modelName: 'DevMailbox', tableName: 'dev_mailbox', underscored: true, timestamps: false },
  )
  InboundEmailLogModel.init(
    {
      id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
      via: { type: DataTypes.STRING(10), allowNull: false },
      status: { type: DataTypes.STRING(10), allowNull: false },
      reason: { type: DataTypes.STRING(40), allowNull: true },
      toAddress: { type: DataTypes.TEXT, allowNull: true },
      fromAddress: { type: DataTypes.TEXT, allowNull: true },
      subject: { type: DataTypes.TEXT, allowNull: true },
      createdAt: { type: DataTypes.DATE, allowNull: false, defaultValue: dbNow() },
    },
    { sequelize, modelName: 'InboundEmailLog', tableName: 'inbound_email_log', underscored: true, timestamps: false },
  )
  InboundEmailReceiptModel.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      messageKey: { type: DataTypes.STRING(80), allowNull: false },
      outcome: { type: DataTypes.STRING(20), allowNull: false, validate: { isIn: [['posted', 'sender_mismatch', 'sender_unverified']] } },
      receivedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: dbNow() },
    },
    { sequelize, modelName: 'InboundEmailReceipt', tableName: 'inbound_email_receipts', underscored: true, timestamps: false },
  )
}

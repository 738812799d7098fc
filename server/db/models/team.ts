import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { UserModel } from './user'
import { dbNow } from './now'

/** A one-time invitation to the team; only a SHA-256 of the token is kept. */
export class TeamInvitationModel extends Model<InferAttributes<TeamInvitationModel>, InferCreationAttributes<TeamInvitationModel>> {
  declare id: CreationOptional<string>
  declare email: string
  declare name: string
  declare role: 'advisor' | 'supervisor'
  declare tokenHash: string
  declare invitedBy: ForeignKey<UserModel['id']> | null
  declare createdAt: CreationOptional<Date>
  declare expiresAt: Date
  declare acceptedAt: CreationOptional<Date | null>
  declare acceptedUserId: CreationOptional<ForeignKey<UserModel['id']> | null>
  declare revokedAt: CreationOptional<Date | null>
  declare inviter?: NonAttribute<UserModel | null>
}

export class AuditLogModel extends Model<InferAttributes<AuditLogModel>, InferCreationAttributes<AuditLogModel>> {
  declare id: CreationOptional<string>
  declare actorId: ForeignKey<UserModel['id']> | null
  declare action: string
  declare targetUserId: ForeignKey<UserModel['id']> | null
  declare targetName: string | null
  declare targetEmail: string | null
  declare details: CreationOptional<Record<string, unknown>>
  declare createdAt: CreationOptional<Date>
  declare actor?: NonAttribute<UserModel | null>
  declare targetUser?: NonAttribute<UserModel | null>
}

/** A one-time password-reset link (migration 0051); only a SHA-256 of the token is kept. */
export class PasswordResetTokenModel extends Model<InferAttributes<PasswordResetTokenModel>, InferCreationAttributes<PasswordResetTokenModel>> {
  declare id: CreationOptional<string>
  declare userId: ForeignKey<UserModel['id']>
  declare tokenHash: string
  declare createdAt: CreationOptional<Date>
  declare expiresAt: Date
  declare spentAt: CreationOptional<Date | null>
}

/** connect-pg-simple's table; the model is only for ending a person's sessions (user_id is a generated column). */
export class SessionModel extends Model<InferAttributes<SessionModel>, InferCreationAttributes<SessionModel>> {
  declare sid: string
  declare sess: object
  declare expire: Date
  declare userId: CreationOptional<string | null>
}

export function initTeam(sequelize: Sequelize) {
  TeamInvitationModel.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      email: { type: DataTypes.STRING(254), allowNull: false },
      name: { type: DataTypes.STRING(120), allowNull: false },
      role: { type: DataTypes.ENUM('listener', 'advisor', 'supervisor'), allowNull: false },
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      createdAt: { type: DataTypes.DATE, allowNull: false, defaultValue: dbNow() },
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      acceptedAt: { type: DataTypes.DATE, allowNull: true },
      revokedAt: { type: DataTypes.DATE, allowNull: true },
    },
    { sequelize, modelName: 'TeamInvitation', tableName: 'team_invitations', underscored: true, timestamps: false },
  )
  AuditLogModel.init(
    {
      id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
      action: { type: DataTypes.STRING(40), allowNull: false },
      targetName: { type: DataTypes.STRING(120), allowNull: true },
      targetEmail: { type: DataTypes.STRING(254), allowNull: true },
      details: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
      createdAt: { type: DataTypes.DATE, allowNull: false, defaultValue: dbNow() },
    },
    { sequelize, modelName: 'AuditLog', tableName: 'audit_log', underscored: true, timestamps: false },
  )
  PasswordResetTokenModel.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      createdAt: { type: DataTypes.DATE, allowNull: false, defaultValue: dbNow() },
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      spentAt: { type: DataTypes.DATE, allowNull: true },
    },
    { sequelize, modelName: 'PasswordResetToken', tableName: 'password_reset_tokens', underscored: true, timestamps: false },
  )
  SessionModel.init(
    {
      sid: { type: DataTypes.STRING, primaryKey: true },
      sess: { type: DataTypes.JSON, allowNull: false },
      expire: { type: DataTypes.DATE(6), allowNull: false },
      userId: { type: DataTypes.UUID, allowNull: true },
    },
    { sequelize, modelName: 'Session', tableName: 'session', underscored: true, timestamps: false },
  )
}

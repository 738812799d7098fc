import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { UserModel } from './user'
import { appUuidKey, maybeAt, optional, personColumns, required, serialKey, stampNow } from '../columns'

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
      id: appUuidKey(),
      ...personColumns(),
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      createdAt: stampNow(),
      expiresAt: required(DataTypes.DATE),
      acceptedAt: maybeAt(),
      revokedAt: maybeAt(),
    },
    { sequelize, modelName: 'TeamInvitation', tableName: 'team_invitations', underscored: true, timestamps: false },
  )
  AuditLogModel.init(
    {
      id: serialKey(),
      action: required(DataTypes.STRING(40)),
      targetName: optional(DataTypes.STRING(120)),
      targetEmail: optional(DataTypes.STRING(254)),
      details: required(DataTypes.JSONB, {}),
      createdAt: stampNow(),
    },
    { sequelize, modelName: 'AuditLog', tableName: 'audit_log', underscored: true, timestamps: false },
  )
  PasswordResetTokenModel.init(
    {
      id: appUuidKey(),
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      createdAt: stampNow(),
      expiresAt: required(DataTypes.DATE),
      spentAt: maybeAt(),
    },
    { sequelize, modelName: 'PasswordResetToken', tableName: 'password_reset_tokens', underscored: true, timestamps: false },
  )
  SessionModel.init(
    {
      sid: { type: DataTypes.STRING, primaryKey: true },
      sess: required(DataTypes.JSON),
      expire: required(DataTypes.DATE(6)),
      userId: optional(DataTypes.UUID),
    },
    { sequelize, modelName: 'Session', tableName: 'session', underscored: true, timestamps: false },
  )
}

import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type CreationOptional } from 'sequelize'
import { db } from '../sequelize'
import { appUuidKey, maybeAt, required } from '../columns'

/** A one-time password-reset link (migration 0051); the token itself is never stored, only its SHA-256. */
export class PasswordResetTokenModel extends Model<InferAttributes<PasswordResetTokenModel>, InferCreationAttributes<PasswordResetTokenModel>> {
  declare id: CreationOptional<string>
  declare userId: string
  declare tokenHash: string
  declare createdAt: CreationOptional<Date>
  declare expiresAt: Date
  declare spentAt: Date | null
}

let ready = false
export function passwordResetTokenModel(): typeof PasswordResetTokenModel {
  if (!ready) {
    PasswordResetTokenModel.init(
      {
        id: appUuidKey(),
        userId: required(DataTypes.UUID),
        tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
        createdAt: DataTypes.DATE,
        expiresAt: required(DataTypes.DATE),
        spentAt: maybeAt(),
      },
      { sequelize: db(), tableName: 'password_reset_tokens', underscored: true, updatedAt: false },
    )
    ready = true
  }
  return PasswordResetTokenModel
}

import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type CreationOptional, type Sequelize } from 'sequelize'
import type { Role } from '../../../shared/schemas/auth'
import { models } from './index'
import { appUuidKey, optional, personColumns, required } from '../columns'

export class UserModel extends Model<InferAttributes<UserModel>, InferCreationAttributes<UserModel>> {
  declare id: CreationOptional<string>
  declare email: string
  declare name: string
  declare role: Role
  declare passwordHash: string | null
  declare active: CreationOptional<boolean>
  declare units: CreationOptional<'metric' | 'imperial'>
  declare emailOptional: CreationOptional<boolean>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

export function initUser(sequelize: Sequelize) {
  UserModel.init(
    {
      id: appUuidKey(),
      ...personColumns(),
      passwordHash: optional(DataTypes.STRING(100)),
      active: required(DataTypes.BOOLEAN, true),
      units: required(DataTypes.ENUM('metric', 'imperial'), 'metric'),
      emailOptional: required(DataTypes.BOOLEAN, true),
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, modelName: 'User', tableName: 'users', underscored: true },
  )
}

/** The users model, bound to the current Sequelize instance (kept for existing callers; prefer `models().User`). */
export function userModel(): typeof UserModel {
  return models().User
}

import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type CreationOptional, type Sequelize } from 'sequelize'
import type { Role } from '../../../shared/schemas/auth'
import { models } from './index'

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
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      email: { type: DataTypes.STRING(254), allowNull: false },
      name: { type: DataTypes.STRING(120), allowNull: false },
      role: { type: DataTypes.ENUM('listener', 'advisor', 'supervisor'), allowNull: false },
      passwordHash: { type: DataTypes.STRING(100), allowNull: true },
      active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      units: { type: DataTypes.ENUM('metric', 'imperial'), allowNull: false, defaultValue: 'metric' },
      emailOptional: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
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

import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { UserModel } from './user'
import type { CaseModel } from './case'
import type { FileModel } from './file'
import { dbNow } from './now'

export class MessageModel extends Model<InferAttributes<MessageModel>, InferCreationAttributes<MessageModel>> {
  declare id: CreationOptional<string>
  declare caseId: ForeignKey<CaseModel['id']>
  declare authorId: ForeignKey<UserModel['id']> | null
  declare body: string
  declare internal: CreationOptional<boolean>
  declare source: CreationOptional<'app' | 'email'>
  declare createdAt: CreationOptional<Date>
  declare author?: NonAttribute<UserModel | null>
  declare files?: NonAttribute<FileModel[]>
}

export function initMessages(sequelize: Sequelize) {
  MessageModel.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      body: { type: DataTypes.TEXT, allowNull: false },
      internal: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      source: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'app' },
      createdAt: { type: DataTypes.DATE, allowNull: false, defaultValue: dbNow() },
    },
    // `search` (a generated tsvector) is left out: only the queue's full-text SQL reads it.
    { sequelize, modelName: 'Message', tableName: 'messages', underscored: true, timestamps: false },
  )
}

import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { UserModel } from './user'
import type { CaseModel } from './case'
import type { FileModel } from './file'
import { appUuidKey, required, stampNow } from '../columns'

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
      id: appUuidKey(),
      body: required(DataTypes.TEXT),
      internal: required(DataTypes.BOOLEAN, false),
      source: required(DataTypes.STRING(10), 'app'),
      createdAt: stampNow(),
    },
    // `search` (a generated tsvector) is left out: only the queue's full-text SQL reads it.
    { sequelize, modelName: 'Message', tableName: 'messages', underscored: true, timestamps: false },
  )
}
